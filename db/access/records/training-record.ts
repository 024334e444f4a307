import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { HttpError } from "@/lib/http/errors";
import { dateInZone } from "@/lib/time";
import { now } from "@/lib/clock";
import { requireStudentFor } from "../shared/student-scope";
import type { StudentRef } from "../shared/enrolment";
import { getSchool } from "../shared/school";
import { creditedMinutesFor } from "../ground-log/ground-hours";
import { listChecksOfStudent, type CheckSummary } from "./check-history";
import { signOffRegister } from "./sign-off-register";
import { chainHead } from "./audit-chain";

// The printable training record of one student.

export interface TrainingRecord {
  school: { name: string; timeZone: string };
  student: StudentRef;
  groundMinutes: number;
  groundLog: { date: string; title: string; status: string; minutes: number }[];
  checks: CheckSummary[];
  signOffs: {
    itemCode: string;
    itemTitle: string;
    signedOn: string;
    signerName: string;
    state: string;
    reason: string | null;
    signatureHash: string;
  }[];
  stageChecks: { stageCode: string; attempt: number; result: string; date: string; examinerName: string; written: string | null }[];
  head: { hash: string; position: number };
  generatedAt: Date;
}

/** Everything the printable training record shows (staff or the student themself). */
export async function trainingRecordFor(viewer: CurrentUser, studentId: string): Promise<TrainingRecord> {
  const { student, access } = await requireStudentFor(viewer, studentId, "progress");
  if (access === "sponsor") throw new HttpError(404, "studentId: no such student", "studentId");
  const school = await getSchool(viewer.schoolId);
  const groundLog = (
    await sequelize.query<{ occurred_at: Date; title: string | null; status: string; credited_minutes: number }>(
      `SELECT g.occurred_at, br.title, g.status, g.credited_minutes FROM ground_log_current g
         LEFT JOIN briefing_revisions br ON br.id = g.briefing_revision_id
        WHERE g.student_id = :st AND g.course_id = :course ORDER BY g.occurred_at`,
      { replacements: { st: student.id, course: student.courseId }, type: QueryTypes.SELECT },
    )
  ).map((r) => ({
    date: dateInZone(r.occurred_at, school.timeZone),
    title: r.title ?? "Session",
    status: r.status,
    minutes: r.credited_minutes,
  }));
  // the caller's access to this student was checked above: the register is read for them alone
  const { rows } = await signOffRegister(viewer, {}, { studentId: student.id });
  return {
    school: { name: school.name, timeZone: school.timeZone },
    student,
    groundMinutes: await creditedMinutesFor(student.id, student.courseId),
    groundLog,
    checks: await listChecksOfStudent(viewer.schoolId, student.id, { withRemarks: false }),
    signOffs: rows
      .filter((r) => r.kind === "sign_off")
      .map((r) => ({
        itemCode: r.itemCode ?? "",
        itemTitle: r.itemTitle ?? "",
        signedOn: r.date,
        signerName: r.signerName,
        state: r.state,
        reason: r.reason,
        signatureHash: r.signatureHash,
      })),
    stageChecks: rows
      .filter((r) => r.kind === "stage_check")
      .map((r) => ({ stageCode: r.stageCode, attempt: 0, result: r.state, date: r.date, examinerName: r.signerName, written: r.basis })),
    head: await chainHead(viewer.schoolId),
    generatedAt: now(),
  };
}
