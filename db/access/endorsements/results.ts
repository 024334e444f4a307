import "server-only";
import { randomUUID } from "node:crypto";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone, formatDay } from "@/lib/time";
import { isPass, resultValidUntil } from "@/lib/endorsements/rules";
import type { CompleteRemedialInput, RecordResultInput } from "@/lib/endorsements/schema";
import { requireStudentFor } from "../shared/student-scope";
import { getSchool } from "../shared/school";
import { writeAudit } from "../records/audit-chain";
import { authoritySettingsFor } from "./settings";
import { openRemedialsOfLastFail } from "./preconditions";

// A knowledge test's result on an endorsement (append-only, audited): passed is decided by the
// pass mark in force; every missed knowledge area opens a remedial item, and a retest needs a new
// endorsement once the remedial training of the last failed result is done.

export async function recordResult(t: Transaction, user: CurrentUser, input: RecordResultInput) {
  if (!can(user, "endorsements.results")) throw new HttpError(403, "You may not record knowledge-test results");
  const [e] = await sequelize.query<{ id: string; student_id: string; course_id: string; endorsed_on: string; has_result: boolean }>(
    `SELECT e.id, e.student_id, e.course_id, e.endorsed_on,
            EXISTS (SELECT 1 FROM knowledge_test_results r WHERE r.endorsement_id = e.id) AS has_result
       FROM knowledge_test_endorsements e WHERE e.id = :id AND e.school_id = :school`,
    { replacements: { id: input.endorsementId, school: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!e) throw new HttpError(404, "endorsementId: no such endorsement", "endorsementId");
  await requireStudentFor(user, e.student_id, "records", t);
  if (e.has_result) throw new HttpError(409, "endorsementId: this endorsement already has its result", "endorsementId");
  const school = await getSchool(user.schoolId, t);
  const today = dateInZone(now(), school.timeZone);
  if (input.takenOn > today) throw new HttpError(400, "takenOn: cannot be in the future", "takenOn");
  if (input.takenOn < e.endorsed_on)
    throw new HttpError(400, `takenOn: cannot be before the endorsement (${formatDay(e.endorsed_on)})`, "takenOn");
  const open = await openRemedialsOfLastFail(e.student_id, e.course_id, t);
  if (open.length)
    throw new HttpError(
      409,
      `endorsementId: remedial training of the last failed test is still open (${open.join(", ")}); a retest needs that training and a new endorsement`,
      "endorsementId",
    );
  const settings = await authoritySettingsFor(user.schoolId, t);
  const passed = isPass(input.scorePercent, settings.passMarkPercent);
  if (!passed && input.areasMissed.length === 0)
    throw new HttpError(400, "areasMissed: name the knowledge areas missed on a test below the pass mark", "areasMissed");
  const validUntil = passed ? resultValidUntil(input.takenOn, settings.resultValidityMonths) : null;
  const id = randomUUID();
  const after = {
    endorsementId: e.id,
    studentId: e.student_id,
    takenOn: input.takenOn,
    scorePercent: input.scorePercent,
    passMarkPercent: settings.passMarkPercent,
    passed,
    validUntil,
    areasMissed: input.areasMissed,
  };
  const audit = await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "endorsement.result",
    recordType: "knowledge_test_result",
    recordId: id,
    after,
  });
  await sequelize.query(
    `INSERT INTO knowledge_test_results (id, school_id, endorsement_id, student_id, course_id, taken_on, score_percent, pass_mark_percent, passed, valid_until, areas_missed, recorded_by, audit_hash)
     VALUES (:id, :school, :e, :student, :course, :takenOn, :score, :mark, :passed, :validUntil, ARRAY(SELECT jsonb_array_elements_text(CAST(:areas AS jsonb))), :by, :hash)`,
    {
      transaction: t,
      replacements: {
        id,
        school: user.schoolId,
        e: e.id,
        student: e.student_id,
        course: e.course_id,
        takenOn: input.takenOn,
        score: input.scorePercent,
        mark: settings.passMarkPercent,
        passed,
        validUntil,
        areas: JSON.stringify(input.areasMissed),
        by: user.id,
        hash: audit.hash,
      },
    },
  );
  for (const area of input.areasMissed)
    await sequelize.query(
      `INSERT INTO knowledge_test_remedials (school_id, student_id, result_id, area) VALUES (:school, :student, :result, :area)`,
      { replacements: { school: user.schoolId, student: e.student_id, result: id, area }, transaction: t },
    );
  return { resultId: id, passed, validUntil, remedialItems: input.areasMissed.length };
}

/** Marks a remedial item done, saying what training was given (audited). */
export async function completeRemedial(t: Transaction, user: CurrentUser, input: CompleteRemedialInput) {
  if (!can(user, "endorsements.results")) throw new HttpError(403, "You may not record remedial training");
  const [m] = await sequelize.query<{ id: string; student_id: string; area: string; state: string }>(
    `SELECT id, student_id, area, state FROM knowledge_test_remedials WHERE id = :id AND school_id = :school FOR UPDATE`,
    { replacements: { id: input.remedialId, school: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!m) throw new HttpError(404, "remedialId: no such remedial item", "remedialId");
  await requireStudentFor(user, m.student_id, "records", t);
  if (m.state !== "open") throw new HttpError(409, "remedialId: this remedial item is already done", "remedialId");
  const at = now();
  await sequelize.query(
    `UPDATE knowledge_test_remedials SET state = 'done', closed_by = :by, closed_at = :at, note = :note WHERE id = :id`,
    { replacements: { id: m.id, by: user.id, at, note: input.note }, transaction: t },
  );
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "endorsement.remedial_done",
    recordType: "knowledge_test_remedial",
    recordId: m.id,
    before: { state: "open", area: m.area },
    after: { state: "done", area: m.area, note: input.note },
    occurredAt: at,
  });
  return { remedialId: m.id, state: "done" as const };
}
