import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";

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
  /** What closed the item: a session, an oral check, a ground-log entry, or (closed by hand) the person who closed it. */
  closedById: string | null;
  /** For an item closed by a passing oral check: when that check took place (null otherwise). */
  closedByCheckAt: string | null;
  waivedReason: string | null;
  note: string;
  createdAt: string;
}

export async function listMakeupFor(studentIds: string[]): Promise<MakeupRow[]> {
  if (studentIds.length === 0) return [];
  return sequelize.query<MakeupRow>(
    `SELECT m.id, m.student_id AS "studentId", p.name AS "studentName", i.code AS "itemCode", i.title AS "itemTitle", m.state, m.source_kind AS "sourceKind",
            br.title AS "sourceTitle", s.starts_at AS "sourceStartsAt", m.scheduled_session_id AS "scheduledSessionId", m.closed_by_kind AS "closedByKind",
            m.closed_by_id AS "closedById", oc.occurred_at AS "closedByCheckAt",
            m.waived_reason AS "waivedReason", m.note, m.created_at AS "createdAt"
       FROM makeup_items m JOIN syllabus_items i ON i.id = m.syllabus_item_id JOIN people p ON p.id = m.student_id
       LEFT JOIN training_sessions s ON m.source_kind = 'absence' AND s.id = m.source_id
       LEFT JOIN briefing_revisions br ON br.id = s.briefing_revision_id
       LEFT JOIN oral_checks oc ON m.closed_by_kind = 'oral_check' AND oc.id = m.closed_by_id AND oc.student_id = m.student_id
      WHERE m.student_id = ANY(ARRAY[:ids]::uuid[])
      ORDER BY (m.state IN ('open','scheduled')) DESC, m.created_at DESC, i.code`,
    { replacements: { ids: studentIds }, type: QueryTypes.SELECT },
  );
}
