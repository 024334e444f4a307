import "server-only";
import { randomUUID } from "node:crypto";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone, formatDay } from "@/lib/time";
import { endorsementStatement, fillWording } from "@/lib/endorsements/rules";
import type { EndorseInput } from "@/lib/endorsements/schema";
import { requireStudentFor } from "../shared/student-scope";
import { getSchool } from "../shared/school";
import { writeAudit } from "../records/audit-chain";
import { confirmPassword } from "../records/sign-offs";
import { authoritySettingsFor } from "./settings";
import { EndorsementRefusal, unmetPreconditions } from "./preconditions";

// Endorsing a student for the knowledge test: every precondition checked and each failing one
// named, the instructor's password re-entered, the school's wording and the signed statement kept
// with the append-only endorsement, and an audit-chain event in the same transaction.

export interface EndorseResult {
  endorsementId: string;
  attempt: number;
  statement: string;
  auditHash: string;
}

export async function endorse(t: Transaction, user: CurrentUser, input: EndorseInput): Promise<EndorseResult> {
  if (!can(user, "endorsements.sign")) throw new HttpError(403, "You may not endorse students for knowledge tests");
  const { student } = await requireStudentFor(user, input.studentId, "records", t);
  const school = await getSchool(user.schoolId, t);
  const today = dateInZone(now(), school.timeZone);
  const endorsedOn = input.endorsedOn ?? today;
  if (endorsedOn > today) throw new HttpError(400, "endorsedOn: cannot be in the future", "endorsedOn");
  if (endorsedOn < student.enrolledOn)
    throw new HttpError(400, `endorsedOn: cannot be before the enrolment (${formatDay(student.enrolledOn)})`, "endorsedOn");
  // one endorsement at a time per student: concurrent attempts queue here and see each other's row
  await sequelize.query(`SELECT pg_advisory_xact_lock(hashtext('endorse:' || :s))`, {
    replacements: { s: student.id },
    transaction: t,
  });
  const settings = await authoritySettingsFor(user.schoolId, t);
  const { unmet, attempt } = await unmetPreconditions(student, user.id, endorsedOn, settings.attemptLimit, t);
  if (unmet.length) throw new EndorsementRefusal(unmet);
  await confirmPassword(user, input.password, t);

  const wording = fillWording(settings.endorsementWording, {
    student: student.name,
    course: `${student.courseCode} ${student.courseTitle}`,
  });
  const statement = endorsementStatement({
    instructorName: user.name,
    wording,
    endorsedOn: formatDay(endorsedOn),
    authorityName: settings.authorityName,
  });
  const id = randomUUID();
  const audit = await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "endorsement.signed",
    recordType: "knowledge_test_endorsement",
    recordId: id,
    after: {
      studentId: student.id,
      courseId: student.courseId,
      enrolmentId: student.enrolmentId,
      instructorId: user.id,
      endorsedOn,
      attempt,
      authorityName: settings.authorityName,
      wording,
      statement,
    },
  });
  const [row] = await sequelize.query<{ id: string }>(
    `INSERT INTO knowledge_test_endorsements (id, school_id, student_id, course_id, enrolment_id, instructor_id, endorsed_on, authority_name, wording, statement, attempt, audit_hash)
     VALUES (:id, :school, :student, :course, :enrolment, :instructor, :on, :authority, :wording, :statement, :attempt, :hash)
     ON CONFLICT (student_id, course_id, attempt) DO NOTHING RETURNING id`,
    {
      type: QueryTypes.SELECT,
      transaction: t,
      replacements: {
        id,
        school: user.schoolId,
        student: student.id,
        course: student.courseId,
        enrolment: student.enrolmentId,
        instructor: user.id,
        on: endorsedOn,
        authority: settings.authorityName,
        wording,
        statement,
        attempt,
        hash: audit.hash,
      },
    },
  );
  if (!row) throw new HttpError(409, "studentId: this student was endorsed meanwhile", "studentId");
  return { endorsementId: id, attempt, statement, auditHash: audit.hash };
}
