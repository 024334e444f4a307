import "server-only";
import type { CurrentUser } from "@/lib/auth/session";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import { passRateWindow } from "@/lib/endorsements/rules";
import type { PackInput } from "@/lib/inspection/content";
import { getSchool } from "../shared/school";
import { chainForPack } from "./chain-for-pack";
import { passRateByCourse } from "../endorsements/pass-rate";
import { inspectedStudent } from "./student-file";
import { instructorFiles } from "./instructor-files";
import { creditAndRetention } from "./credit-and-retention";

// Everything the inspection pack prints for one student (records.inspect, the chief instructor),
// as plain values for lib/inspection: the student's file, the instructor files of everyone who
// taught, checked or signed for them, transfer-in credit and the record's retention date, the audit
// chain's verification with its head (chain-for-pack.ts: on the latest full walk, or a walk here), and the first-attempt pass rate per course over the
// last 24 calendar months.

export async function inspectionPackFor(user: CurrentUser, studentId: string): Promise<PackInput & { madeAt: Date }> {
  const f = await inspectedStudent(user, studentId);
  const { record } = f;
  const school = await getSchool(user.schoolId);
  const madeAt = now();
  const today = dateInZone(madeAt, school.timeZone);
  const chain = await chainForPack(user.schoolId);
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
    chain,
    instructors: await instructorFiles({ id: school.id, timeZone: school.timeZone }, f.involved, today, madeAt),
    passRate: { window, rows: await passRateByCourse(user.schoolId, window) },
    ...(await creditAndRetention({ id: school.id, timeZone: school.timeZone }, { id: st.id, courseId: st.courseId })),
  };
}
