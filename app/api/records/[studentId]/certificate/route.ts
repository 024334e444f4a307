// GET /api/records/[studentId]/certificate: the graduation certificate as a PDF (the graduate themself, or staff).
import { route, uuidParam } from "@/lib/http/api";
import { HttpError } from "@/lib/http/errors";
import { graduationCertificateFor } from "@/db/access/completion/certifications";
import { graduationCertificatePdf } from "@/lib/completion/certificate-pdf";
import { completionStatement } from "@/lib/completion/statements";
import { formatDay } from "@/lib/time";

export const GET = route<{ studentId: string }>("progress.view", async ({ user, params }) => {
  if (!uuidParam.safeParse(params.studentId).success) throw new HttpError(404, "studentId: no such student", "studentId");
  const c = await graduationCertificateFor(user, params.studentId);
  const course = `${c.student.courseCode} ${c.student.courseTitle}`;
  const pdf = await graduationCertificatePdf({
    schoolName: c.school.name,
    schoolCertificateNumber: c.school.certificateNumber,
    graduateName: c.student.name,
    course,
    graduatedOn: formatDay(c.graduatedOn),
    completionStatement: completionStatement(c.student.name, course),
    certification: {
      statement: c.certification.statement,
      name: c.certification.certifierName,
      certificateNumber: c.certification.certifierCertificate,
      certifiedOn: formatDay(c.certification.certifiedOn),
      auditHash: c.certification.auditHash,
    },
    certificateId: c.certification.id,
  });
  return new Response(Buffer.from(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `inline; filename="graduation-certificate.pdf"`,
      "Cache-Control": "no-store",
    },
  });
});
