import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { HttpError } from "@/lib/http/errors";
import { dateInZone } from "@/lib/time";
import { now } from "@/lib/clock";
import { recordStudentFor } from "../completion/record-student";
import type { RecordStudent } from "../completion/record-student";
import { getSchool } from "../shared/school";
import { creditedMinutesFor } from "../ground-log/ground-hours";
import { transferCreditsOf } from "../transfers/credits";
import { listChecksOfStudent, type CheckSummary } from "./check-history";
import { signOffRegister } from "./sign-off-register";
import { chainHead } from "./audit-chain";
import { itemsOfRevision } from "./items";
import { certificateNumbersOn, certifyingInstructor } from "../people/qualification-reads";
import { certificationsOf, type Certification } from "../completion/certifications";

// The printable training record of one student.

export interface TrainingRecord {
  school: { name: string; timeZone: string };
  student: RecordStudent;
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
    /** the signer's certificate number(s) in force on the date signed for */
    certificateNumber: string | null;
  }[];
  stageChecks: {
    stageCode: string;
    attempt: number;
    result: string;
    date: string;
    examinerName: string;
    written: string | null;
    certificateNumber: string | null;
  }[];
  /** syllabus items of the student's revision without a sign-off in force */
  notYetDone: { code: string; title: string; stageCode: string }[];
  /** the chief instructor who certifies the printed record, with the certificate number in force today */
  certifier: { name: string; certificateNumber: string | null } | null;
  /** the chief's certification of this enrolment's record at its end (newest), if any */
  certification: Certification | null;
  today: string;
  head: { hash: string; position: number };
  generatedAt: Date;
}

/** Everything the printable training record shows (staff or the student themself). */
export async function trainingRecordFor(viewer: CurrentUser, studentId: string): Promise<TrainingRecord> {
  // the record outlives the enrolment: a graduate or a student who left still gets it (141.101(e))
  const { student, access } = await recordStudentFor(viewer, studentId, "progress");
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
  // ground time credited by transfer (14 CFR 141.77(c)) is a line of the log, so the lines add up to groundMinutes
  const transfers = await transferCreditsOf(student.id, student.courseId);
  for (const c of transfers)
    groundLog.push({
      date: c.testTakenOn,
      title: `Credited by transfer from ${c.sourceSchool}${c.sourceApproved ? " (approved course)" : ""}`,
      status: "credited_by_transfer",
      minutes: c.creditedMinutes,
    });
  const transferredItems = new Map(transfers.flatMap((c) => c.items.map((i) => [i.id, c.sourceSchool] as const)));
  // the caller's access to this student was checked above: the register is read for them alone
  const { rows } = await signOffRegister(viewer, {}, { studentId: student.id });
  const numbers = new Map<string, string | null>();
  const numberOf = async (personId: string, date: string) => {
    const k = `${personId}:${date}`;
    if (!numbers.has(k)) numbers.set(k, await certificateNumbersOn(personId, date));
    return numbers.get(k) ?? null;
  };
  const signed = new Set(rows.filter((r) => r.kind === "sign_off" && r.state === "current").map((r) => r.itemCode));
  const today = dateInZone(now(), school.timeZone);
  const signOffs = [];
  for (const r of rows.filter((r) => r.kind === "sign_off"))
    signOffs.push({
      itemCode: r.itemCode ?? "",
      itemTitle: r.itemTitle ?? "",
      signedOn: r.date,
      signerName: r.signerName,
      state: r.state,
      reason: r.reason,
      signatureHash: r.signatureHash,
      certificateNumber: await numberOf(r.signerId, r.date),
    });
  const stageChecks = [];
  for (const r of rows.filter((r) => r.kind === "stage_check"))
    stageChecks.push({
      stageCode: r.stageCode,
      attempt: 0,
      result: r.state,
      date: r.date,
      examinerName: r.signerName,
      written: r.basis,
      certificateNumber: await numberOf(r.signerId, r.date),
    });
  return {
    school: { name: school.name, timeZone: school.timeZone },
    student,
    groundMinutes: await creditedMinutesFor(student.id, student.courseId),
    groundLog,
    checks: await listChecksOfStudent(viewer.schoolId, student.id, { withRemarks: false }),
    signOffs,
    stageChecks,
    notYetDone: (await itemsOfRevision(student.revisionId))
      .filter((i) => !signed.has(i.code))
      .map((i) => ({
        code: i.code,
        title: transferredItems.has(i.id) ? `${i.title} (credited by transfer from ${transferredItems.get(i.id)})` : i.title,
        stageCode: i.stageCode,
      })),
    certifier: await certifyingInstructor(viewer.schoolId, viewer.id, today),
    certification:
      (await certificationsOf(viewer.schoolId, student.id)).filter((c) => c.enrolmentId === student.enrolmentId).at(-1) ?? null,
    today,
    head: await chainHead(viewer.schoolId),
    generatedAt: now(),
  };
}
