import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { dateInZone } from "@/lib/time";
import type { PackInput } from "@/lib/inspection/content";
import { accessTo } from "../shared/student-scope";
import { trainingRecordFor, type TrainingRecord } from "../records/training-record";

// The student's part of the inspection pack: the training record (enrolment, ground log, checks,
// sign-offs, stage checks, certification), the syllabus revision, the knowledge-test endorsements
// with their results, and who taught, checked or signed for the student. Scoped as Records.

export interface InspectedStudent {
  record: TrainingRecord;
  syllabus: PackInput["syllabus"];
  groundLog: PackInput["groundLog"];
  endorsements: PackInput["endorsements"];
  /** the people who took part in the student's training, with what they did */
  involved: { personId: string; parts: string[] }[];
}

/** 403 without records.inspect; 404 for a student the caller may not see (or who does not exist). */
export async function inspectedStudent(user: CurrentUser, studentId: string): Promise<InspectedStudent> {
  if (!can(user, "records.inspect")) throw new HttpError(403, "You may not make inspection packs");
  if (!(await accessTo(user, studentId, "records"))) throw new HttpError(404, "studentId: no such student", "studentId");
  const record = await trainingRecordFor(user, studentId);
  const st = record.student;
  const replacements = { st: st.id, course: st.courseId, school: user.schoolId };

  const [syllabus] = await sequelize.query<PackInput["syllabus"]>(
    `SELECT number, approved_on::text AS "approvedOn", effective_from::text AS "effectiveFrom", change_note AS "changeNote"
       FROM syllabus_revisions WHERE id = :rev`,
    { replacements: { rev: st.revisionId }, type: QueryTypes.SELECT },
  );
  if (!syllabus) throw new Error("syllabus revision of the enrolment not found");

  // the chronological ground log with the instructor of each session
  const groundLog = (
    await sequelize.query<{ occurred_at: Date; title: string | null; status: string; minutes: number; instructor: string | null }>(
      `SELECT g.occurred_at, br.title, g.status, g.credited_minutes AS minutes, p.name AS instructor FROM ground_log_current g
         LEFT JOIN briefing_revisions br ON br.id = g.briefing_revision_id
         LEFT JOIN training_sessions s ON s.id = g.session_id LEFT JOIN people p ON p.id = s.instructor_id
        WHERE g.student_id = :st AND g.course_id = :course ORDER BY g.occurred_at`,
      { replacements, type: QueryTypes.SELECT },
    )
  ).map((r) => ({
    date: dateInZone(r.occurred_at, record.school.timeZone),
    title: r.title ?? "Session",
    status: r.status,
    minutes: r.minutes,
    instructorName: r.instructor,
  }));

  const endorsements = (
    await sequelize.query<
      Omit<PackInput["endorsements"][number], "result"> & {
        takenOn: string | null;
        scorePercent: number | null;
        passMarkPercent: number | null;
        passed: boolean | null;
        validUntil: string | null;
        areasMissed: string[] | null;
      }
    >(
      `SELECT e.endorsed_on::text AS "endorsedOn", e.attempt, e.authority_name AS "authorityName", i.name AS "instructorName",
              e.statement, e.audit_hash AS "auditHash", r.taken_on::text AS "takenOn", r.score_percent AS "scorePercent",
              r.pass_mark_percent AS "passMarkPercent", r.passed, r.valid_until::text AS "validUntil", r.areas_missed AS "areasMissed"
         FROM knowledge_test_endorsements e JOIN people i ON i.id = e.instructor_id
         LEFT JOIN knowledge_test_results r ON r.endorsement_id = e.id
        WHERE e.school_id = :school AND e.student_id = :st AND e.course_id = :course
        ORDER BY e.attempt`,
      { replacements, type: QueryTypes.SELECT },
    )
  ).map(({ takenOn, scorePercent, passMarkPercent, passed, validUntil, areasMissed, ...e }) => ({
    ...e,
    result:
      takenOn === null
        ? null
        : {
            takenOn,
            scorePercent: scorePercent ?? 0,
            passMarkPercent: passMarkPercent ?? 0,
            passed: passed ?? false,
            validUntil,
            areasMissed: areasMissed ?? [],
          },
  }));

  const involved = await sequelize.query<{ personId: string; parts: string[] }>(
    `SELECT x.person_id AS "personId", array_agg(DISTINCT x.part ORDER BY x.part) AS parts
       FROM (SELECT s.instructor_id AS person_id, 'taught' AS part FROM ground_log_current g
               JOIN training_sessions s ON s.id = g.session_id WHERE g.student_id = :st AND g.course_id = :course
             UNION ALL SELECT instructor_id, 'checked' FROM oral_checks WHERE student_id = :st AND school_id = :school
             UNION ALL SELECT signer_id, 'signed' FROM sign_offs WHERE student_id = :st AND school_id = :school
             UNION ALL SELECT examiner_id, 'examined' FROM stage_checks WHERE student_id = :st AND school_id = :school
             UNION ALL SELECT instructor_id, 'endorsed' FROM knowledge_test_endorsements
                        WHERE student_id = :st AND school_id = :school AND course_id = :course
             UNION ALL SELECT certifier_id, 'certified' FROM record_certifications WHERE student_id = :st AND school_id = :school) x
       JOIN people p ON p.id = x.person_id AND p.school_id = :school
      GROUP BY x.person_id, p.name ORDER BY p.name`,
    { replacements, type: QueryTypes.SELECT },
  );

  return { record, syllabus, groundLog, endorsements, involved };
}
