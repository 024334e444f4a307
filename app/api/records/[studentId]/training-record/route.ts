// GET /api/records/[studentId]/training-record: the printable training record as a PDF (staff, or the student themself).
import { route, uuidParam } from "@/lib/http/api";
import { HttpError } from "@/lib/http/errors";
import { trainingRecordFor } from "@/db/access/records/training-record";
import { certificationStatement, trainingRecordPdf } from "@/lib/records/training-record-pdf";
import { LEVEL_LABEL, OUTCOME_LABEL, CHECK_OUTCOME_LABEL } from "@/lib/records/outcome";
import { answerModeText } from "@/lib/records/questions";
import { hoursLabel, formatDay, formatDayTime } from "@/lib/time";
import { ATTENDANCE_WORDS, SIGN_OFF_STATE_WORDS, STAGE_RESULT_WORDS, words, codeToWords } from "@/lib/labels";
import { fileNamePart } from "@/lib/http/download";

export const GET = route<{ studentId: string }>("progress.view", async ({ user, params }) => {
  if (!uuidParam.safeParse(params.studentId).success) throw new HttpError(404, "studentId: no such student", "studentId");
  const r = await trainingRecordFor(user, params.studentId);
  const tz = r.school.timeZone;
  const pdf = await trainingRecordPdf({
    schoolName: r.school.name,
    studentName: r.student.name,
    enrolment: [
      `Course: ${r.student.courseCode} ${r.student.courseTitle}`,
      ...(r.student.ended
        ? [
            `Training ended on ${formatDay(r.student.ended.on)}: ${r.student.ended.kind ? codeToWords(r.student.ended.kind) : "ended"}${r.student.ended.reason ? ` (${r.student.ended.reason})` : ""}`,
          ]
        : []),
      `Enrolled on ${formatDay(r.student.enrolledOn)}; cohort ${r.student.cohortName ?? "none"}; lead instructor ${r.student.leadInstructorName ?? "none"}`,
      `E-mail: ${r.student.email}`,
    ],
    groundSummary: `Credited ground time: ${hoursLabel(r.groundMinutes, r.student.minGroundMinutes)}`,
    groundLog: r.groundLog.map((g) => [g.date, g.title, words(ATTENDANCE_WORDS, g.status), hoursLabel(g.minutes)]),
    signOffs: r.signOffs.map((s) => [
      `${s.itemCode} ${s.itemTitle}`,
      s.signedOn,
      s.signerName,
      s.certificateNumber ?? "none on that date",
      s.reason ? `${words(SIGN_OFF_STATE_WORDS, s.state)}: ${s.reason}` : words(SIGN_OFF_STATE_WORDS, s.state),
      s.signatureHash.slice(0, 16),
    ]),
    stageChecks: r.stageChecks.map((s) => [
      s.stageCode,
      s.date,
      s.examinerName,
      s.certificateNumber ?? "none on that date",
      words(STAGE_RESULT_WORDS, s.result),
      s.written ?? "",
    ]),
    checks: r.checks.map((c) => ({
      heading: `${formatDayTime(c.occurredAt, tz)} · ${c.itemCodes.join(", ")} · ${CHECK_OUTCOME_LABEL[c.outcome]} · level of learning shown: ${LEVEL_LABEL[c.levelShown]} · ${c.instructorName}${c.withdrawn ? ` · WITHDRAWN: ${c.withdrawn.reason}` : ""}`,
      lines: c.questions.map(
        (q) =>
          `${q.position}. [${q.itemCode}] ${q.text} - ${OUTCOME_LABEL[q.outcome]}${q.prompted ? ", prompted" : ""}` +
          (q.generated
            ? ` (computed answer ${q.generated.answer.display}${q.studentFigure !== null ? `; student said ${q.studentFigure}` : ""}). ${answerModeText(q.generated)}`
            : ""),
      ),
    })),
    notYetDone: r.notYetDone.map((i) => [i.code, i.stageCode, i.title]),
    certification: r.certification
      ? {
          statement: r.certification.statement,
          name: r.certification.certifierName,
          certificateNumber: r.certification.certifierCertificate ?? "none recorded",
          certified: { on: formatDay(r.certification.certifiedOn), auditHash: r.certification.auditHash },
        }
      : {
          statement: certificationStatement({
            certifierName: r.certifier?.name ?? "the chief instructor",
            studentName: r.student.name,
            schoolName: r.school.name,
          }),
          name: r.certifier?.name ?? "",
          certificateNumber: r.certifier?.certificateNumber ?? "",
        },
    headHash: r.head.hash,
    headPosition: r.head.position,
    generatedAt: formatDayTime(r.generatedAt, tz),
  });
  const safe = fileNamePart(r.student.name);
  return new Response(Buffer.from(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `inline; filename="training-record-${safe}.pdf"`,
      "Cache-Control": "no-store",
      "X-Audit-Head": r.head.hash,
    },
  });
});
