import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { StudentRef } from "../shared/enrolment";
import { itemsOfRevision, openMakeupItemIds, type ItemRef } from "./items";
import { currentSignOffs } from "./sign-offs";

// How far each stage of a student's syllabus is: signed items, open make-ups, attempts, and
// whether it is ready for its stage check (and what it waits for).

export interface StageReadiness {
  stageId: string;
  code: string;
  title: string;
  position: number;
  itemCount: number;
  signedCount: number;
  openMakeups: number;
  passed: boolean;
  attempts: { id: string; attempt: number; result: "pass" | "fail"; occurredAt: Date; examinerName: string }[];
  ready: boolean;
  /** when the stage became ready: the newest sign-off of its items */
  readySince: Date | null;
  /** why it is not ready (when not passed) */
  waitingFor: string | null;
}

/**
 * `known`: the student's items and current sign-offs when the caller has read them already (the
 * Progress map), so one page render reads each once.
 */
export async function stageReadiness(
  student: StudentRef,
  t?: Transaction,
  known?: { items: ItemRef[]; signOffs: Awaited<ReturnType<typeof currentSignOffs>> },
): Promise<StageReadiness[]> {
  const items = known?.items ?? (await itemsOfRevision(student.revisionId, t));
  const signed = new Map((known?.signOffs ?? (await currentSignOffs(student.id, t))).map((s) => [s.itemId, s]));
  const makeups = await openMakeupItemIds(student.id, t);
  const attempts = await sequelize.query<{
    id: string;
    stage_id: string;
    attempt: number;
    result: "pass" | "fail";
    occurred_at: Date;
    examiner: string;
  }>(
    `SELECT s.id, s.stage_id, s.attempt, s.result, s.occurred_at, p.name AS examiner FROM stage_checks s JOIN people p ON p.id = s.examiner_id
      WHERE s.student_id = :id AND s.enrolment_id = :e ORDER BY s.attempt`,
    { replacements: { id: student.id, e: student.enrolmentId }, type: QueryTypes.SELECT, transaction: t },
  );
  // a stage is passed once any of its checks in this enrolment passed (what passedStageIds reads, from the rows at hand)
  const passed = new Set(attempts.filter((a) => a.result === "pass").map((a) => a.stage_id));
  const stages = [...new Map(items.map((i) => [i.stageId, i])).values()];
  return stages.map((s) => {
    const its = items.filter((i) => i.stageId === s.stageId);
    const signedCount = its.filter((i) => signed.has(i.id)).length;
    const openMakeups = its.filter((i) => makeups.has(i.id)).length;
    const prev = stages.find((x) => x.stagePosition === s.stagePosition - 1);
    const isPassed = passed.has(s.stageId);
    let waitingFor: string | null = null;
    if (!isPassed) {
      if (prev && !passed.has(prev.stageId)) waitingFor = `the stage check of ${prev.stageCode}`;
      else if (signedCount < its.length)
        waitingFor = `${its.length - signedCount} item${its.length - signedCount === 1 ? "" : "s"} to sign off`;
      else if (openMakeups > 0) waitingFor = `${openMakeups} open make-up item${openMakeups === 1 ? "" : "s"}`;
    }
    const ready = !isPassed && waitingFor === null;
    const times = its.map((i) => signed.get(i.id)?.signedAt).filter((d): d is Date => !!d);
    return {
      stageId: s.stageId,
      code: s.stageCode,
      title: s.stageTitle,
      position: s.stagePosition,
      itemCount: its.length,
      signedCount,
      openMakeups,
      passed: isPassed,
      attempts: attempts
        .filter((a) => a.stage_id === s.stageId)
        .map((a) => ({ id: a.id, attempt: a.attempt, result: a.result, occurredAt: a.occurred_at, examinerName: a.examiner })),
      ready,
      readySince: ready && times.length ? new Date(Math.max(...times.map((d) => new Date(d).getTime()))) : null,
      waitingFor,
    };
  });
}
