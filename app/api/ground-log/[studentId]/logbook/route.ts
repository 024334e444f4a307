// GET /api/ground-log/[studentId]/logbook: a student's logbook lines as CSV (for the student's record).
import { route, uuidParam } from "@/lib/http/api";
import { HttpError } from "@/lib/http/errors";
import { logbookDownload } from "@/db/access/ground-log/logbook";
import { toCsv } from "@/lib/csv";
import { ATTENDANCE_LABELS } from "@/lib/timetable/schema";
import { fileNamePart } from "@/lib/http/download";

export const dynamic = "force-dynamic";

export const GET = route<{ studentId: string }>("groundlog.view", async ({ user, params }) => {
  const id = uuidParam.safeParse(params.studentId);
  if (!id.success) throw new HttpError(400, "studentId: not a valid id", "studentId");
  const book = await logbookDownload(user, id.data);
  if (!book) throw new HttpError(404, "studentId: no such student", "studentId");
  const { lines, studentName } = book;
  const csv = toCsv(
    ["Date", "Minutes credited", "Hours", "Attendance", "Subjects", "Instructor", "Instructor certificate", "Amended", "Amendment reason"],
    lines.map((l) => [
      l.date,
      l.durationMinutes,
      (l.durationMinutes / 60).toFixed(2),
      ATTENDANCE_LABELS[l.status],
      l.subjects,
      l.instructorName,
      l.certificateNumber ?? "",
      l.amended ? "yes" : "no",
      l.reason ?? "",
    ]),
  );
  const safe = fileNamePart(studentName);
  return new Response(`\uFEFF${csv}`, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="logbook-${safe}.csv"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
    },
  });
});
