import "server-only";
import { createHash } from "node:crypto";
import { QueryTypes, type Transaction } from "sequelize";
import { z } from "zod";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import type { QuestionOutcome } from "@/lib/records/outcome";
import { requireStudentFor } from "../shared/student-scope";
import { getSchool } from "../shared/school";
import { writeAudit } from "./audit-chain";
import { itemsOfRevision } from "./items";
import { RecordRefusal } from "./refusals";
import { refuseUnlessStanding } from "./signer-standing";
import { appendQualificationVersion, openVersions, qualificationFieldsOf } from "../people/qualification-history";
import { stageReadiness } from "./stage-readiness";
import { confirmPassword } from "./sign-offs";
import { dateInZone } from "@/lib/time";
import { choicesFrom, PICKER_LIST_MAX, type PickerChoices, type PickerOption } from "@/lib/directory/picker";
import { stageCheckStatement } from "@/lib/records/statements";

// Stage checks: who may examine, recording a check (a fail opens remedial make-up items),
// and the chief's designation of check instructors.

/** Designated check instructor (check_instructor on any of their qualifications in force). */
export async function isCheckInstructor(personId: string, t?: Transaction): Promise<boolean> {
  const [r] = await sequelize.query<{ ok: boolean }>(
    `SELECT EXISTS (SELECT 1 FROM instructor_qualifications_current WHERE person_id = :p AND check_instructor) AS ok`,
    { replacements: { p: personId }, type: QueryTypes.SELECT, transaction: t },
  );
  return !!r?.ok;
}

/** Whether this person may conduct stage checks: one who may override examiner rules, or a designated check instructor. */
export async function mayExamine(user: CurrentUser, t?: Transaction): Promise<boolean> {
  return can(user, "stagechecks.designate") || (await isCheckInstructor(user.id, t));
}

/** The most designated check instructors Records names with a toggle; the others are found with the picker. */
export const DESIGNATED_SHOWN_MAX = 50;

export interface CheckInstructorsOverview {
  /** designated check instructors by name, the first DESIGNATED_SHOWN_MAX */
  designated: { id: string; name: string }[];
  /** how many are designated in all */
  designatedTotal: number;
  /** the instructors not designated: each with a toggle while few, else the search picker (purpose `designate`) */
  others: PickerChoices;
}

/**
 * Records' Check instructors, in two bounded queries whatever the size of the staff: the designated
 * ones (active instructors with a qualification in force marked check instructor) and the others.
 */
export async function checkInstructorsOverview(schoolId: string): Promise<CheckInstructorsOverview> {
  const base = `FROM people p WHERE p.school_id = :s AND 'instructor' = ANY(p.roles) AND p.active
      AND EXISTS (SELECT 1 FROM instructor_qualifications_current q WHERE q.person_id = p.id)`;
  const designatedSql = `EXISTS (SELECT 1 FROM instructor_qualifications_current q WHERE q.person_id = p.id AND q.check_instructor)`;
  const designated = await sequelize.query<{ id: string; name: string; total: string }>(
    `SELECT p.id, p.name, count(*) OVER () AS total ${base} AND ${designatedSql} ORDER BY p.name, p.id LIMIT :limit`,
    { replacements: { s: schoolId, limit: DESIGNATED_SHOWN_MAX }, type: QueryTypes.SELECT },
  );
  const others = await sequelize.query<PickerOption>(
    `SELECT p.id, p.name ${base} AND NOT ${designatedSql} ORDER BY p.name, p.id LIMIT :limit`,
    { replacements: { s: schoolId, limit: PICKER_LIST_MAX + 1 }, type: QueryTypes.SELECT },
  );
  return {
    designated: designated.map(({ id, name }) => ({ id, name })),
    designatedTotal: Number(designated[0]?.total ?? 0),
    others: choicesFrom(others),
  };
}

/**
 * Every item of the stage has exactly one oral outcome, chosen by the examiner: an item left out
 * (or given twice, or not in the stage) is refused before anything is written, one field per item
 * ("oralOutcomes.<item id>.outcome", its message naming the item's code).
 */
function refuseIncompleteOutcomes(items: { id: string; code: string }[], given: StageCheckInput["oralOutcomes"]) {
  const issues: z.core.$ZodIssue[] = [];
  const issue = (path: (string | number)[], message: string) =>
    issues.push({ code: "custom", path, message, input: undefined } as z.core.$ZodIssue);
  const seen = new Set<string>();
  given.forEach((o, i) => {
    if (!items.some((it) => it.id === o.itemId)) issue(["oralOutcomes", i, "itemId"], "this item is not in the stage");
    else if (seen.has(o.itemId))
      issue(["oralOutcomes", i, "itemId"], `${items.find((it) => it.id === o.itemId)!.code} is given more than one oral outcome`);
    seen.add(o.itemId);
  });
  for (const it of items)
    if (!seen.has(it.id)) issue(["oralOutcomes", it.id, "outcome"], `choose the oral outcome of ${it.code}: Solid, Shaky or Not yet`);
  if (issues.length > 0) throw new z.ZodError(issues);
}

export interface StageCheckInput {
  studentId: string;
  stageId: string;
  result: "pass" | "fail";
  oralOutcomes: { itemId: string; outcome: QuestionOutcome; note?: string | undefined }[];
  writtenScorePercent?: number | null | undefined;
  remarks: string;
  occurredAt: Date;
  overrideReason?: string | undefined;
  /** re-entered by the examiner: the stage check is signed like a sign-off */
  password: string;
}

/**
 * Records a stage check. The examiner is the chief or a designated check instructor, and not
 * the student's lead instructor (the chief may override with a reason, which raises a watch
 * note). A fail opens remedial make-up items; a recheck is possible once they are closed.
 */
export async function conductStageCheck(t: Transaction, user: CurrentUser, input: StageCheckInput) {
  const mayOverride = can(user, "stagechecks.designate");
  if (!(await mayExamine(user, t))) {
    throw new RecordRefusal(
      "examiner_not_allowed",
      "examiner: only the chief instructor or a designated check instructor may conduct stage checks",
      "examiner",
    );
  }
  const { student } = await requireStudentFor(user, input.studentId, "examiner", t);
  const override = input.overrideReason?.trim() || null;
  if (student.leadInstructorId === user.id) {
    if (!mayOverride)
      throw new RecordRefusal(
        "examiner_is_lead",
        "examiner: you are this student's lead instructor; another examiner must conduct the stage check",
        "examiner",
      );
    if (!override)
      throw new RecordRefusal(
        "examiner_is_lead",
        "overrideReason: you are this student's lead instructor; give a reason to examine anyway",
        "overrideReason",
      );
  }
  const stages = await stageReadiness(student, t);
  const stage = stages.find((s) => s.stageId === input.stageId);
  if (!stage) throw new HttpError(400, "stageId: not a stage of the student's syllabus revision", "stageId");
  if (!stage.ready)
    throw new RecordRefusal(
      "not_ready",
      `stageId: ${stage.code} is not ready for its stage check${stage.passed ? " (already passed)" : `: waiting for ${stage.waitingFor}`}`,
      "stageId",
    );
  const items = (await itemsOfRevision(student.revisionId, t)).filter((i) => i.stageId === stage.stageId);
  refuseIncompleteOutcomes(items, input.oralOutcomes);
  const school = await getSchool(user.schoolId, t);
  const passMark = school.settings.stageCheckPassMarkPercent;
  const written = input.writtenScorePercent ?? null;
  if (input.result === "pass") {
    if (written !== null && written < passMark)
      throw new RecordRefusal(
        "written_below_pass_mark",
        `writtenScorePercent: ${written} % is below the pass mark of ${passMark} %`,
        "writtenScorePercent",
      );
    if (input.oralOutcomes.some((o) => o.outcome === "not_yet"))
      throw new HttpError(422, "result: an oral outcome is Not yet; the result cannot be a pass", "result");
  }
  await refuseUnlessStanding(user.id, student, dateInZone(input.occurredAt, school.timeZone), "conduct stage checks", t);
  await confirmPassword(user, input.password, t);
  const statement = stageCheckStatement({
    examinerName: user.name,
    studentName: student.name,
    stageCode: stage.code,
    stageTitle: stage.title,
    occurredOn: dateInZone(input.occurredAt, school.timeZone),
  });
  const at = now();
  const attempt = stage.attempts.length + 1;
  const fields = {
    statement,
    studentId: student.id,
    stageId: stage.stageId,
    attempt,
    examinerId: user.id,
    result: input.result,
    written,
    passMark,
    occurredAt: input.occurredAt.toISOString(),
    recordedAt: at.toISOString(),
  };
  const signatureHash = createHash("sha256")
    .update(JSON.stringify(Object.entries(fields).sort()))
    .digest("hex");
  const [row] = await sequelize.query<{ id: string }>(
    `INSERT INTO stage_checks (school_id, student_id, enrolment_id, stage_id, attempt, examiner_id, lead_instructor_id, override_reason, result,
                               oral_outcomes, written_score_percent, pass_mark_percent, remarks, occurred_at, recorded_at, signature_hash, statement)
     VALUES (:schoolId, :studentId, :enrolmentId, :stageId, :attempt, :examiner, :lead, :override, :result, :oral::jsonb, :written, :passMark, :remarks, :occurredAt, :recordedAt, :hash, :statement)
     ON CONFLICT (student_id, stage_id, attempt) DO NOTHING RETURNING id`,
    {
      transaction: t,
      type: QueryTypes.SELECT,
      replacements: {
        schoolId: user.schoolId,
        studentId: student.id,
        enrolmentId: student.enrolmentId,
        stageId: stage.stageId,
        attempt,
        examiner: user.id,
        lead: student.leadInstructorId,
        override: student.leadInstructorId === user.id ? override : null,
        result: input.result,
        oral: JSON.stringify(input.oralOutcomes.map((o) => ({ ...o, code: items.find((i) => i.id === o.itemId)?.code }))),
        written,
        passMark,
        remarks: input.remarks.trim(),
        occurredAt: input.occurredAt,
        recordedAt: at,
        hash: signatureHash,
        statement,
      },
    },
  );
  if (!row) throw new HttpError(409, "stageId: another stage check of this attempt was just recorded", "stageId");
  let makeups = 0;
  if (input.result === "fail") {
    const weak = input.oralOutcomes.filter((o) => o.outcome !== "solid").map((o) => o.itemId);
    const targets = weak.length > 0 ? weak : items.map((i) => i.id);
    for (const itemId of targets) {
      await sequelize.query(
        `INSERT INTO makeup_items (school_id, student_id, syllabus_item_id, source_kind, source_id, state, note)
         VALUES (:schoolId, :studentId, :itemId, 'stage_check', :source, 'open', :note) ON CONFLICT DO NOTHING`,
        {
          replacements: {
            schoolId: user.schoolId,
            studentId: student.id,
            itemId,
            source: row.id,
            note: `Remedial work after the ${stage.code} stage check`,
          },
          transaction: t,
        },
      );
      makeups++;
    }
  }
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: input.result === "pass" ? "stagecheck.passed" : "stagecheck.failed",
    recordType: "stage_check",
    recordId: row.id,
    after: {
      ...fields,
      stageCode: stage.code,
      oralOutcomes: input.oralOutcomes,
      overrideReason: student.leadInstructorId === user.id ? override : null,
      makeupItemsOpened: makeups,
      signatureHash,
    },
    occurredAt: at,
  });
  return { id: row.id, result: input.result, attempt, makeupItemsOpened: makeups };
}

/** The chief designates (or stops designating) a check instructor. */
export async function designateCheckInstructor(t: Transaction, user: CurrentUser, input: { personId: string; checkInstructor: boolean }) {
  const [p] = await sequelize.query<{ id: string; before: boolean }>(
    `SELECT p.id, bool_or(q.check_instructor) AS before FROM people p JOIN instructor_qualifications_current q ON q.person_id = p.id
      WHERE p.id = :id AND p.school_id = :schoolId AND 'instructor' = ANY(p.roles) GROUP BY p.id`,
    { replacements: { id: input.personId, schoolId: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!p) throw new HttpError(404, "personId: no such instructor", "personId");
  // the instructor file keeps its history: each open version that changes is closed today and followed by the next
  const today = dateInZone(now(), (await getSchool(user.schoolId, t)).timeZone);
  for (const open of await openVersions(p.id, t)) {
    if (open.check_instructor === input.checkInstructor) continue;
    await appendQualificationVersion(t, {
      personId: p.id,
      open,
      fields: { ...qualificationFieldsOf(open), checkInstructor: input.checkInstructor },
      effectiveFrom: today < open.valid_from ? open.valid_from : today,
      recordedBy: user.id,
      changeNote: input.checkInstructor ? "Designated check instructor" : "No longer a designated check instructor",
    });
  }
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "checkinstructor.designated",
    recordType: "person",
    recordId: p.id,
    before: { checkInstructor: p.before },
    after: { checkInstructor: input.checkInstructor },
  });
  return { personId: p.id, checkInstructor: input.checkInstructor };
}
