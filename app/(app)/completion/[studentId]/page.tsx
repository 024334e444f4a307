import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePagePermission } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/errors";
import { studentCompletion } from "@/db/access/completion/student-completion";
import { END_KINDS, type EndKind } from "@/lib/completion/schema";
import { END_KIND_WORDS, proposedStatement } from "@/lib/completion/statements";
import { dateInZone, formatDay } from "@/lib/time";
import { now } from "@/lib/clock";
import { uuidParam } from "@/lib/http/api";
import { EndTrainingForm } from "./_components/end-training-form";
import { WithdrawCohortForm } from "./_components/withdraw-cohort-form";

export const metadata: Metadata = { title: "End of training" };
export const dynamic = "force-dynamic";

const PURPOSE_WORDS = { graduation: "Graduation", termination: "End of training", transfer_out: "Transfer to another school" };

export default async function StudentCompletionPage({ params }: { params: Promise<{ studentId: string }> }) {
  const { studentId } = await params;
  const user = await requirePagePermission("records.certify", `/completion/${studentId}`);
  if (!uuidParam.safeParse(studentId).success) notFound();
  let data;
  try {
    data = await studentCompletion(user, studentId);
  } catch (e) {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  }
  const { student, school, memberships, certifications, graduationGaps } = data;
  const today = dateInZone(now(), school.timeZone);
  const openMembership = memberships.find((m) => m.toDate === null);
  const graduated = certifications.some((c) => c.purpose === "graduation" && c.enrolmentId === student.enrolmentId);
  const statements = Object.fromEntries(
    END_KINDS.map((kind) => [
      kind,
      proposedStatement({
        kind,
        certifierName: user.name,
        studentName: student.name,
        schoolName: school.name,
        courseTitle: `${student.courseCode} ${student.courseTitle}`,
      }),
    ]),
  ) as Record<EndKind, string>;
  return (
    <div className="max-w-3xl space-y-6">
      <header>
        <p className="text-caption">
          <Link className="underline" href="/completion">
            End of training
          </Link>{" "}
          / {student.name}
        </p>
        <h1 className="text-display">{student.name}</h1>
        <p className="text-ink-soft">
          {student.courseCode} {student.courseTitle} · enrolled {formatDay(student.enrolledOn)} · {student.cohortName ?? "no cohort"}
        </p>
      </header>

      {student.ended ? (
        <section className="card space-y-2" aria-labelledby="outcome" data-testid="training-ended">
          <h2 id="outcome">Training ended</h2>
          <p>
            <span className="font-semibold">{student.ended.kind ? END_KIND_WORDS[student.ended.kind] : "Ended"}</span> on{" "}
            <span className="num">{formatDay(student.ended.on)}</span>
            {student.ended.reason && <>: {student.ended.reason}</>}
          </p>
          {graduated && (
            <p>
              <a
                className="btn-primary inline-flex items-center"
                href={`/api/records/${student.id}/certificate`}
                data-testid="certificate-link"
              >
                Graduation certificate (PDF)
              </a>
            </p>
          )}
          <p>
            <a className="underline" href={`/api/records/${student.id}/training-record`}>
              Training record (PDF)
            </a>
          </p>
        </section>
      ) : (
        <>
          <section className="card space-y-3" aria-labelledby="end-training">
            <h2 id="end-training">End training and certify the record</h2>
            <p className="text-caption text-ink-soft">
              The enrolment ends on the date given, the student leaves their cohort then, and your certification of the record is kept and
              cannot be changed afterwards.
            </p>
            {graduationGaps.length > 0 ? (
              <div className="space-y-1" data-testid="graduation-gaps">
                <p className="font-semibold">Not ready to graduate yet: the course is not complete.</p>
                <ul className="list-disc space-y-1 break-words pl-5">
                  {graduationGaps.map((g) => (
                    <li key={g}>{g[0]!.toUpperCase() + g.slice(1)}</li>
                  ))}
                </ul>
                <p className="text-caption text-ink-soft">Ending training as terminated or transferred stays possible.</p>
              </div>
            ) : (
              <p data-testid="graduation-ready">Every condition of graduation is met.</p>
            )}
            <EndTrainingForm studentId={student.id} studentName={student.name} today={today} statements={statements} />
          </section>
          <section className="card space-y-3" aria-labelledby="leave-cohort">
            <h2 id="leave-cohort">Leave the cohort, stay on the course</h2>
            {openMembership ? (
              <WithdrawCohortForm studentId={student.id} cohortName={openMembership.cohortName} today={today} />
            ) : (
              <p className="text-ink-soft">The student belongs to no cohort now.</p>
            )}
          </section>
        </>
      )}

      {certifications.length > 0 && (
        <section className="card space-y-3" aria-labelledby="certifications">
          <h2 id="certifications">Certifications of the record</h2>
          <ul className="space-y-3">
            {certifications.map((c) => (
              <li key={c.id} className="border-b border-paper-edge pb-2">
                <p className="font-semibold">
                  {PURPOSE_WORDS[c.purpose]} · {formatDay(c.certifiedOn)} · {c.certifierName}
                  {c.certifierCertificate && <span className="text-caption font-normal"> ({c.certifierCertificate})</span>}
                </p>
                <blockquote className="border-l-4 border-wing-600 pl-3">{c.statement}</blockquote>
                <p className="break-all text-caption text-ink-soft">Audit record {c.auditHash}</p>
              </li>
            ))}
          </ul>
        </section>
      )}

      <section className="card space-y-2" aria-labelledby="memberships">
        <h2 id="memberships">Cohorts</h2>
        {memberships.length === 0 ? (
          <p className="text-ink-soft">Never in a cohort.</p>
        ) : (
          <ul className="space-y-1">
            {memberships.map((m) => (
              <li key={m.id}>
                <span className="font-semibold">{m.cohortName}</span>: from <span className="num">{formatDay(m.fromDate)}</span>
                {m.toDate ? (
                  <>
                    {" "}
                    to <span className="num">{formatDay(m.toDate)}</span>
                    {m.endReason && <span className="text-ink-soft"> · {m.endReason}</span>}
                  </>
                ) : (
                  " (now)"
                )}
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
