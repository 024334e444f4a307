import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { can } from "@/lib/auth/can";
import { accessTo } from "../shared/student-scope";
import { confirmPassword } from "../records/sign-offs";
import type { CurrentUser } from "@/lib/auth/session";
import type { MakeupCloseOutput, MakeupScheduleOutput, MakeupWaiveOutput } from "@/lib/timetable/schema";

async function lockItem(user: CurrentUser, itemId: string, t: Transaction) {
  const [m] = await sequelize.query<{ id: string; studentId: string; state: string; syllabusItemId: string }>(
    `SELECT m.id, m.student_id AS "studentId", m.state, m.syllabus_item_id AS "syllabusItemId" FROM makeup_items m
      WHERE m.id = :id AND m.school_id = :school FOR UPDATE`,
    { replacements: { id: itemId, school: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!m) throw new HttpError(404, "itemId: no such make-up item", "itemId");
  // only staff who may see the student's Ground log act on their make-up items; others learn nothing
  if ((await accessTo(user, m.studentId, "groundlog", t)) !== "staff") throw new HttpError(404, "itemId: no such make-up item", "itemId");
  return m;
}

/** Plans an open make-up item into a later session the student attends. */
export async function scheduleMakeup(user: CurrentUser, input: MakeupScheduleOutput, t: Transaction) {
  const m = await lockItem(user, input.itemId, t);
  if (m.state !== "open") throw new HttpError(409, `itemId: the item is ${m.state}, not open`, "itemId");
  const [s] = await sequelize.query<{ id: string }>(
    `SELECT s.id FROM training_sessions s JOIN session_attendees a ON a.session_id = s.id AND a.student_id = :student
      WHERE s.id = :sid AND s.school_id = :school AND s.status = 'scheduled' AND s.starts_at > :now`,
    {
      replacements: { student: m.studentId, sid: input.sessionId, school: user.schoolId, now: now() },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  if (!s) throw new HttpError(400, "sessionId: choose an upcoming session the student attends", "sessionId");
  await sequelize.query(`UPDATE makeup_items SET state = 'scheduled', scheduled_session_id = :sid WHERE id = :id`, {
    replacements: { sid: s.id, id: m.id },
    transaction: t,
  });
  return { id: m.id, state: "scheduled" as const };
}

/** Closes a make-up item by a one-to-one briefing, or by self-study closed with an oral check. */
export async function closeMakeup(user: CurrentUser, input: MakeupCloseOutput, t: Transaction) {
  const m = await lockItem(user, input.itemId, t);
  if (m.state === "done" || m.state === "waived") throw new HttpError(409, `itemId: the item is already ${m.state}`, "itemId");
  await sequelize.query(
    `UPDATE makeup_items SET state = 'done', closed_by_kind = :how, closed_by_id = :by, closed_at = :now, note = :note, scheduled_session_id = NULL WHERE id = :id`,
    { replacements: { how: input.how, by: user.id, now: now(), note: input.note, id: m.id }, transaction: t },
  );
  return { id: m.id, state: "done" as const };
}

/** The chief instructor waives a make-up item, with a reason. */
export async function waiveMakeup(user: CurrentUser, input: MakeupWaiveOutput, t: Transaction) {
  if (!can(user, "makeup.waive")) throw new HttpError(403, "Only the chief instructor waives make-up items");
  const m = await lockItem(user, input.itemId, t);
  if (m.state === "done" || m.state === "waived") throw new HttpError(409, `itemId: the item is already ${m.state}`, "itemId");
  // the chief re-enters their password, as for a sign-off: a wrong one writes nothing
  await confirmPassword(user, input.password, t);
  await sequelize.query(
    `UPDATE makeup_items SET state = 'waived', waived_reason = :r, waived_by = :by, closed_at = :now, scheduled_session_id = NULL WHERE id = :id`,
    { replacements: { r: input.reason, by: user.id, now: now(), id: m.id }, transaction: t },
  );
  return { id: m.id, state: "waived" as const };
}
