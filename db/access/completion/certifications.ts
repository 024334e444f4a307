import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { HttpError } from "@/lib/http/errors";
import { getSchool } from "../shared/school";
import { recordStudentFor, type RecordStudent } from "./record-student";

// The chief instructor's certifications of a student's record, and the graduation certificate's data.

export interface Certification {
  id: string;
  enrolmentId: string;
  purpose: "graduation" | "termination" | "transfer_out";
  certifierName: string;
  certifierCertificate: string | null;
  statement: string;
  certifiedOn: string;
  auditHash: string;
}

export async function certificationsOf(schoolId: string, studentId: string, t?: Transaction): Promise<Certification[]> {
  return sequelize.query<Certification>(
    `SELECT c.id, c.enrolment_id AS "enrolmentId", c.purpose, p.name AS "certifierName", c.certifier_certificate AS "certifierCertificate",
            c.statement, c.certified_on AS "certifiedOn", c.audit_hash AS "auditHash"
       FROM record_certifications c JOIN people p ON p.id = c.certifier_id
      WHERE c.school_id = :schoolId AND c.student_id = :studentId ORDER BY c.created_at`,
    { replacements: { schoolId, studentId }, type: QueryTypes.SELECT, transaction: t },
  );
}

export interface GraduationCertificate {
  school: { name: string; certificateNumber: string | null; timeZone: string };
  student: RecordStudent;
  graduatedOn: string;
  certification: Certification;
}

/** The graduate's certificate data: the graduate themself or staff who keep their record; otherwise 404. */
export async function graduationCertificateFor(viewer: CurrentUser, studentId: string): Promise<GraduationCertificate> {
  const { student, access } = await recordStudentFor(viewer, studentId, "progress");
  if (access === "sponsor") throw new HttpError(404, "studentId: no such student", "studentId");
  const certification = (await certificationsOf(viewer.schoolId, student.id)).find(
    (c) => c.purpose === "graduation" && c.enrolmentId === student.enrolmentId,
  );
  if (!certification || !student.ended)
    throw new HttpError(404, "studentId: no graduation has been certified for this student", "studentId");
  const school = await getSchool(viewer.schoolId);
  return {
    school: { name: school.name, certificateNumber: school.settings.schoolCertificateNumber ?? null, timeZone: school.timeZone },
    student,
    graduatedOn: student.ended.on,
    certification,
  };
}
