import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import { runsSession } from "../timetable/lock-session";
import type { CurrentUser } from "@/lib/auth/session";

export interface SessionForRecord {
  id: string;
  schoolId: string;
  instructorId: string;
  cohortLeadId: string | null;
  briefingRevisionId: string;
  courseId: string;
  startsAt: Date;
  endsAt: Date;
  status: string;
  minutes: number;
  itemIds: string[];
}

/** Locks a session for recording; only its instructor, its cohort's lead instructor or a caller with `timetable.manage` records it. */
export async function sessionForRecord(user: CurrentUser, sessionId: string, t: Transaction): Promise<SessionForRecord> {
  const [s] = await sequelize.query<SessionForRecord>(
    `SELECT s.id, s.school_id AS "schoolId", s.instructor_id AS "instructorId", c.lead_instructor_id AS "cohortLeadId",
            s.briefing_revision_id AS "briefingRevisionId", b.course_id AS "courseId", s.starts_at AS "startsAt", s.ends_at AS "endsAt",
            s.status, (extract(epoch FROM s.ends_at - s.starts_at) / 60)::int AS minutes,
            COALESCE((SELECT array_agg(bi.syllabus_item_id ORDER BY bi.syllabus_item_id) FROM briefing_revision_items bi WHERE bi.briefing_revision_id = s.briefing_revision_id), '{}') AS "itemIds"
       FROM training_sessions s JOIN briefings b ON b.id = s.briefing_id LEFT JOIN cohorts c ON c.id = s.cohort_id
      WHERE s.id = :id AND s.school_id = :school FOR UPDATE OF s`,
    { replacements: { id: sessionId, school: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!s) throw new HttpError(404, "sessionId: no such session", "sessionId");
  if (!runsSession(user, s)) {
    throw new HttpError(
      403,
      "sessionId: only the session's instructor, the cohort's lead instructor or the chief instructor records its attendance",
      "sessionId",
    );
  }
  return s;
}
