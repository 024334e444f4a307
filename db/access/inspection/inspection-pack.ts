import "server-only";
import type { CurrentUser } from "@/lib/auth/session";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import { passRateWindow } from "@/lib/endorsements/rules";
import type { PackInput } from "@/lib/inspection/content";
import { getSchool } from "../shared/school";
import { verifyChain, chainHead } from "../records/audit-chain";
import { passRateByCourse } from "../endorsements/pass-rate";
import { inspectedStudent } from "./student-file";
import { instructorFiles } from "./instructor-files";
import { creditAndRetention } from "./credit-and-retention";

// Everything the inspection pack prints for one student (records.inspect, the chief instructor),
// as plain values for lib/inspection: the student's file, the instructor files of everyone who
// taught, checked or signed for them, transfer-in credit and the record's retention date, the audit
// chain's full verification with its head, and the first-attempt pass rate per course over the
// last 24 calendar months.

export async function inspectionPackFor(user: CurrentUser, studentId: string): Promise<PackInput & { madeAt: Date }> {
  const f = await inspectedStudent(user, studentId);
  const { record } = f;
  const school = await getSchool(user.schoolId);
  const madeAt = now();
  const today = dateInZone(madeAt, school.timeZone);
  // the head first, then the full walk (which may reach rows written in between)
  const head = await chainHead(user.schoolId);
  const chain = await verifyChain(user.schoolId);
  const window = passRateWindow(today);
  const st = record.student;
  return {
    madeAt,
    school: { name: school.name, timeZone: school.timeZone, certificateNumber: school.settings.schoolCertificateNumber ?? null },
    student: {
      name: st.name,
      email: st.email,
      courseCode: st.courseCode,
      courseTitle: st.courseTitle,
      minGroundMinutes: st.minGroundMinutes,
      enrolledOn: st.enrolledOn,
      cohortName: st.cohortName,
      leadInstructorName: st.leadInstructorName,
      ended: st.ended,
    },
    syllabus: f.syllabus,
    groundMinutes: record.groundMinutes,
    groundLog: f.groundLog,
    checks: [...record.checks]
      .sort((a, b) => a.occurredAt.getTime() - b.occurredAt.getTime())
      .map((c) => ({
        occurredAt: c.occurredAt,
        itemCodes: c.itemCodes,
        outcome: c.outcome,
        levelShown: c.levelShown,
        instructorName: c.instructorName,
        durationMinutes: c.durationMinutes,
        withdrawn: c.withdrawn ? { reason: c.withdrawn.reason } : null,
        amendedBy: c.amendedBy,
        questions: c.questions.map((q) => ({
          position: q.position,
          itemCode: q.itemCode,
          text: q.text,
          outcome: q.outcome,
          prompted: q.prompted,
        })),
      })),
    // oldest first, as the ground log and the checks (the register lists newest first)
    signOffs: [...record.signOffs].sort((a, b) => a.signedOn.localeCompare(b.signedOn)),
    stageChecks: [...record.stageChecks].sort((a, b) => a.date.localeCompare(b.date)),
    endorsements: f.endorsements,
    certification: record.certification,
    chain: {
      ok: chain.ok,
      checked: chain.checked,
      // a verified chain: the head the walk reached; a broken one: the newest row, and the last good link apart
      headHash: chain.ok ? chain.headHash : head.hash,
      headPosition: chain.ok ? chain.checked : head.position,
      lastGoodHash: chain.headHash,
      broken: chain.broken ? { position: chain.broken.position, problem: chain.broken.problem } : null,
    },
    instructors: await instructorFiles({ id: school.id, timeZone: school.timeZone }, f.involved, today, madeAt),
    passRate: { window, rows: await passRateByCourse(user.schoolId, window) },
    ...(await creditAndRetention({ id: school.id, timeZone: school.timeZone }, { id: st.id, courseId: st.courseId })),
  };
}
