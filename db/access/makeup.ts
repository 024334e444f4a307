import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import type { z } from "zod";
import { sequelize } from "../index";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import type { CurrentUser } from "@/lib/auth/session";
import { rolesAllow } from "@/lib/auth/permissions";
import type { makeupCloseSchema, makeupScheduleSchema, makeupWaiveSchema } from "@/lib/timetable/schemas";

/** An absence opens one make-up item per syllabus item the session covered, unless one is already outstanding for that item. */
export async function openMakeupForAbsence(
  t: Transaction,
  p: { schoolId: string; studentId: string; sessionId: string; itemIds: string[] },
): Promise<number> {
  if (p.itemIds.length === 0) return 0;
  const [rows] = await sequelize.query(
    `INSERT INTO makeup_items (school_id, student_id, syllabus_item_id, source_kind, source_id)
     SELECT :school, :student, x, 'absence', :session FROM unnest(ARRAY[:items]::uuid[]) AS x
      -- one outstanding item per syllabus item: a second absence on it adds nothing new to make up
      WHERE NOT EXISTS (SELECT 1 FROM makeup_items o WHERE o.student_id = :student AND o.syllabus_item_id = x AND o.state IN ('open','scheduled') AND o.source_id <> :session)
     ON CONFLICT (student_id, syllabus_item_id, source_kind, source_id) DO UPDATE
       SET state = 'open', closed_by_kind = NULL, closed_by_id = NULL, closed_at = NULL
       WHERE makeup_items.closed_by_kind = 'attendance_amended'
     RETURNING id`,
    { replacements: { school: p.schoolId, student: p.studentId, session: p.sessionId, items: p.itemIds }, transaction: t },
  );
  return (rows as unknown[]).length;
}

/** Attending a session closes the student's make-up items for the items it covers, and those planned into it. */
export async function closeMakeupByAttendance(
  t: Transaction,
  p: { studentId: string; sessionId: string; itemIds: string[] },
): Promise<void> {
  await sequelize.query(
    `UPDATE makeup_items SET state = 'done', closed_by_kind = 'session', closed_by_id = :session, closed_at = :now, scheduled_session_id = NULL
      WHERE student_id = :student AND state IN ('open','scheduled') AND source_id <> :session
        AND (syllabus_item_id = ANY(ARRAY[:items]::uuid[]) OR scheduled_session_id = :session)`,
    {
      replacements: {
        session: p.sessionId,
        now: now(),
        student: p.studentId,
        items: p.itemIds.length ? p.itemIds : ["00000000-0000-0000-0000-000000000000"],
      },
      transaction: t,
    },
  );
}

export interface MakeupRow {
  id: string;
  studentId: string;
  studentName: string;
  itemCode: string;
  itemTitle: string;
  state: "open" | "scheduled" | "done" | "waived";
  sourceKind: string;
  sourceTitle: string | null;
  sourceStartsAt: string | null;
  scheduledSessionId: string | null;
  closedByKind: string | null;
  waivedReason: string | null;
  note: string;
  createdAt: string;
}

export async function listMakeupFor(studentIds: string[]): Promise<MakeupRow[]> {
  if (studentIds.length === 0) return [];
  return sequelize.query<MakeupRow>(
    `SELECT m.id, m.student_id AS "studentId", p.name AS "studentName", i.code AS "itemCode", i.title AS "itemTitle", m.state, m.source_kind AS "sourceKind",
            br.title AS "sourceTitle", s.starts_at AS "sourceStartsAt", m.scheduled_session_id AS "scheduledSessionId", m.closed_by_kind AS "closedByKind",
            m.waived_reason AS "waivedReason", m.note, m.created_at AS "createdAt"
       FROM makeup_items m JOIN syllabus_items i ON i.id = m.syllabus_item_id JOIN people p ON p.id = m.student_id
       LEFT JOIN training_sessions s ON m.source_kind = 'absence' AND s.id = m.source_id
       LEFT JOIN briefing_revisions br ON br.id = s.briefing_revision_id
      WHERE m.student_id = ANY(ARRAY[:ids]::uuid[])
      ORDER BY (m.state IN ('open','scheduled')) DESC, m.created_at DESC, i.code`,
    { replacements: { ids: studentIds }, type: QueryTypes.SELECT },
  );
}

async function lockItem(user: CurrentUser, itemId: string, t: Transaction) {
  const [m] = await sequelize.query<{ id: string; studentId: string; state: string; syllabusItemId: string }>(
    `SELECT m.id, m.student_id AS "studentId", m.state, m.syllabus_item_id AS "syllabusItemId" FROM makeup_items m
      WHERE m.id = :id AND m.school_id = :school FOR UPDATE`,
    { replacements: { id: itemId, school: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!m) throw new HttpError(404, "itemId: no such make-up item", "itemId");
  if (!user.roles.includes("chief")) {
    const [ok] = await sequelize.query<{ ok: boolean }>(
      `SELECT EXISTS (SELECT 1 FROM cohort_memberships cm JOIN cohorts c ON c.id = cm.cohort_id WHERE cm.student_id = :s AND c.lead_instructor_id = :uid)
           OR EXISTS (SELECT 1 FROM session_attendees a JOIN training_sessions ts ON ts.id = a.session_id WHERE a.student_id = :s AND ts.instructor_id = :uid) AS ok`,
      { replacements: { s: m.studentId, uid: user.id }, type: QueryTypes.SELECT, transaction: t },
    );
    if (!ok?.ok) throw new HttpError(404, "itemId: no such make-up item", "itemId");
  }
  return m;
}

/** Plans an open make-up item into a later session the student attends. */
export async function scheduleMakeup(user: CurrentUser, input: z.output<typeof makeupScheduleSchema>, t: Transaction) {
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
export async function closeMakeup(user: CurrentUser, input: z.output<typeof makeupCloseSchema>, t: Transaction) {
  const m = await lockItem(user, input.itemId, t);
  if (m.state === "done" || m.state === "waived") throw new HttpError(409, `itemId: the item is already ${m.state}`, "itemId");
  await sequelize.query(
    `UPDATE makeup_items SET state = 'done', closed_by_kind = :how, closed_by_id = :by, closed_at = :now, note = :note, scheduled_session_id = NULL WHERE id = :id`,
    { replacements: { how: input.how, by: user.id, now: now(), note: input.note, id: m.id }, transaction: t },
  );
  return { id: m.id, state: "done" as const };
}

/** The chief instructor waives a make-up item, with a reason. */
export async function waiveMakeup(user: CurrentUser, input: z.output<typeof makeupWaiveSchema>, t: Transaction) {
  if (!rolesAllow(user.roles, "makeup.waive")) throw new HttpError(403, "Only the chief instructor waives make-up items");
  const m = await lockItem(user, input.itemId, t);
  if (m.state === "done" || m.state === "waived") throw new HttpError(409, `itemId: the item is already ${m.state}`, "itemId");
  await sequelize.query(
    `UPDATE makeup_items SET state = 'waived', waived_reason = :r, waived_by = :by, closed_at = :now, scheduled_session_id = NULL WHERE id = :id`,
    { replacements: { r: input.reason, by: user.id, now: now(), id: m.id }, transaction: t },
  );
  return { id: m.id, state: "waived" as const };
}
