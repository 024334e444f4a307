import "server-only";
import { randomUUID } from "node:crypto";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone, formatDay } from "@/lib/time";
import type { EndTrainingInput } from "@/lib/completion/schema";
import { CERTIFICATION_PURPOSE } from "@/lib/completion/statements";
import { requireStudentFor } from "../shared/student-scope";
import { getSchool } from "../shared/school";
import { writeAudit } from "../records/audit-chain";
import { confirmPassword } from "../records/sign-offs";
import { graduationGaps } from "./graduation-gaps";
import { certificateNumbersOn } from "../people/qualification-reads";

// Ending a student's training (graduation, termination, transfer out): the enrolment gets its date,
// kind and reason, and the chief instructor certifies the record (14 CFR 141.101(c)) with their
// password re-entered. The certification is an append-only row and an audit-chain event.

export interface EndTrainingResult {
  certificationId: string;
  enrolmentId: string;
  status: "completed" | "withdrawn";
  auditHash: string;
}

export async function endTraining(t: Transaction, user: CurrentUser, input: EndTrainingInput): Promise<EndTrainingResult> {
  if (!can(user, "records.certify")) throw new HttpError(403, "Only the chief instructor certifies a record");
  const { student } = await requireStudentFor(user, input.studentId, "records", t).catch((e: unknown) => {
    if (e instanceof HttpError && e.status === 404)
      throw new HttpError(409, "studentId: this student has no training in progress to end", "studentId");
    throw e;
  });
  const school = await getSchool(user.schoolId, t);
  const today = dateInZone(now(), school.timeZone);
  if (input.endedOn > today) throw new HttpError(400, "endedOn: cannot be later than today", "endedOn");
  if (input.endedOn < student.enrolledOn)
    throw new HttpError(400, `endedOn: cannot be before the enrolment (${formatDay(student.enrolledOn)})`, "endedOn");
  await confirmPassword(user, input.password, t);

  if (input.kind === "graduated") {
    // 14 CFR 141.95(a): only a student who completed the approved course graduates (graduation-gaps.ts)
    const gaps = await graduationGaps(student, t);
    if (gaps.length) throw new HttpError(409, `kind: cannot graduate: ${gaps.join("; ")}`, "kind");
  }

  const status = input.kind === "graduated" ? "completed" : "withdrawn";
  const [, changed] = await sequelize.query(
    `UPDATE enrolments SET status = :status, ended_on = :endedOn, end_reason = :reason, end_kind = :kind
      WHERE id = :id AND status = 'active'`,
    {
      replacements: { status, endedOn: input.endedOn, reason: input.reason, kind: input.kind, id: student.enrolmentId },
      type: QueryTypes.UPDATE,
      transaction: t,
    },
  );
  if (!changed) throw new HttpError(409, "studentId: this training was ended meanwhile", "studentId");

  const certificationId = randomUUID();
  const purpose = CERTIFICATION_PURPOSE[input.kind];
  const certifierCertificate = await certificateNumbersOn(user.id, today);
  const audit = await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "record.certified",
    recordType: "record_certification",
    recordId: certificationId,
    before: { enrolmentId: student.enrolmentId, status: "active" },
    after: {
      enrolmentId: student.enrolmentId,
      studentId: student.id,
      status,
      endKind: input.kind,
      endedOn: input.endedOn,
      reason: input.reason,
      purpose,
      statement: input.statement,
      certifierCertificate,
    },
  });
  await sequelize.query(
    `INSERT INTO record_certifications (id, school_id, student_id, enrolment_id, purpose, certifier_id, certifier_certificate,
                                        statement, certified_on, audit_hash)
     VALUES (:id, :school, :student, :enrolment, :purpose, :certifier, :number, :statement, :on, :hash)`,
    {
      replacements: {
        id: certificationId,
        school: user.schoolId,
        student: student.id,
        enrolment: student.enrolmentId,
        purpose,
        certifier: user.id,
        number: certifierCertificate,
        statement: input.statement,
        on: today,
        hash: audit.hash,
      },
      transaction: t,
    },
  );
  return { certificationId, enrolmentId: student.enrolmentId, status, auditHash: audit.hash };
}
