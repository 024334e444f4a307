// GET /api/records/[studentId]/inspection-pack: the student's inspection pack as one PDF (the chief instructor, records.inspect).
import { route, uuidParam } from "@/lib/http/api";
import { HttpError } from "@/lib/http/errors";
import { inspectionPackFor } from "@/db/access/inspection/inspection-pack";
import { packDocument, recordHash } from "@/lib/inspection/content";
import { inspectionPackPdf } from "@/lib/inspection/pdf";
import { formatDayTime } from "@/lib/time";
import { fileNamePart } from "@/lib/http/download";

export const GET = route<{ studentId: string }>("records.inspect", async ({ user, params }) => {
  if (!uuidParam.safeParse(params.studentId).success) throw new HttpError(400, "studentId: must be a student's id (a UUID)", "studentId");
  const pack = await inspectionPackFor(user, params.studentId);
  const doc = packDocument(pack);
  const hash = recordHash(doc);
  const pdf = await inspectionPackPdf({
    doc,
    recordHash: hash,
    madeAt: formatDayTime(pack.madeAt, pack.school.timeZone, { seconds: true }),
    timeZone: pack.school.timeZone,
    madeBy: user.name,
  });
  const safe = fileNamePart(pack.student.name);
  return new Response(Buffer.from(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `inline; filename="inspection-pack-${safe}.pdf"`,
      "Cache-Control": "no-store",
      "X-Record-Hash": hash,
      "X-Audit-Head": pack.chain.headHash,
    },
  });
});
