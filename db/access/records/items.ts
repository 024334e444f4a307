import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { StudentRef } from "../shared/enrolment";
import type { LevelOfLearning } from "@/lib/records/outcome";
import { RecordRefusal } from "./refusals";

// Syllabus items of a student's revision, the stages they passed, their open make-up items,
// and the rule that keeps a stage closed until the previous stage's check is passed.

export interface ItemRef {
  id: string;
  code: string;
  title: string;
  requiredLevel: LevelOfLearning;
  stageId: string;
  stageCode: string;
  stageTitle: string;
  stagePosition: number;
  position: number;
}

export async function itemsOfRevision(revisionId: string, t?: Transaction): Promise<ItemRef[]> {
  return sequelize.query<ItemRef>(
    `SELECT i.id, i.code, i.title, i.required_level AS "requiredLevel", s.id AS "stageId", s.code AS "stageCode", s.title AS "stageTitle",
            s.position AS "stagePosition", i.position
       FROM syllabus_items i JOIN syllabus_stages s ON s.id = i.stage_id
      WHERE i.revision_id = :revisionId ORDER BY s.position, i.position`,
    { replacements: { revisionId }, type: QueryTypes.SELECT, transaction: t },
  );
}

/** Stages whose stage check this student has passed (on this enrolment). */
export async function passedStageIds(studentId: string, enrolmentId: string, t?: Transaction): Promise<Set<string>> {
  const rows = await sequelize.query<{ stage_id: string }>(
    `SELECT DISTINCT stage_id FROM stage_checks WHERE student_id = :studentId AND enrolment_id = :enrolmentId AND result = 'pass'`,
    { replacements: { studentId, enrolmentId }, type: QueryTypes.SELECT, transaction: t },
  );
  return new Set(rows.map((r) => r.stage_id));
}

/** Refuses work on items of a stage whose previous stage's check is not passed. */
export async function assertStageOpen(
  student: StudentRef,
  items: ItemRef[],
  all: ItemRef[],
  field: string,
  t?: Transaction,
): Promise<void> {
  const passed = await passedStageIds(student.id, student.enrolmentId, t);
  for (const item of items) {
    if (item.stagePosition <= 1) continue;
    const prev = all.find((i) => i.stagePosition === item.stagePosition - 1);
    if (prev && !passed.has(prev.stageId)) {
      throw new RecordRefusal(
        "stage_locked",
        `${field}: ${item.code} belongs to stage ${item.stageCode}; the stage check of ${prev.stageCode} is not passed yet`,
        field,
      );
    }
  }
}

/** Open make-up items (open or scheduled) of a student, by syllabus item. */
export async function openMakeupItemIds(studentId: string, t?: Transaction): Promise<Set<string>> {
  const rows = await sequelize.query<{ id: string }>(
    `SELECT DISTINCT syllabus_item_id AS id FROM makeup_items WHERE student_id = :studentId AND state IN ('open','scheduled')`,
    { replacements: { studentId }, type: QueryTypes.SELECT, transaction: t },
  );
  return new Set(rows.map((r) => r.id));
}
