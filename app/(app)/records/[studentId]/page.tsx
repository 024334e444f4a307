import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/errors";
import { requireStudentFor } from "@/db/access/shared/student-scope";
import { getSchool } from "@/db/access/shared/school";
import { progressFor } from "@/db/access/records/progress-map";
import { RecordRefusal } from "@/db/access/records/refusals";
import { mayExamine } from "@/db/access/records/stage-checks";
import { listQuestionAircraft, recentSessionsOf } from "@/db/access/records/question-aircraft";
import { planSignOff } from "@/db/access/records/sign-off-plan";
import { currentSignOffs } from "@/db/access/records/sign-offs";
import { ITEM_STATUS_LABEL } from "@/lib/records/progress";
import { Caution } from "@/components/caution";
import { LEVEL_LABEL, OUTCOME_LABEL, CHECK_OUTCOME_LABEL } from "@/lib/records/outcome";
import { formatDay, formatDayTime } from "@/lib/time";
import { CheckForm } from "./_components/check-form";
import { SignOffPanel } from "./_components/sign-off-panel";
import { WithdrawButton } from "./_components/withdraw-button";
import { AmendButton } from "./_components/amend-button";
import { StageCheckForm } from "./_components/stage-check-form";
import { AmendCheck } from "./_components/amend-check";
import { stageCheckStatement } from "@/lib/records/statements";
import { answerModeText } from "@/lib/records/questions";
import { dateInZone } from "@/lib/time";
import { now } from "@/lib/clock";
import { OutcomeBadge } from "@/app/(app)/progress/_components/outcome-badge";
import { WideTable } from "@/components/ui/wide-table";
import { PracticeReadiness } from "@/app/(app)/practice/_components/practice-readiness";
import { STAGE_RESULT_WORDS, words } from "@/lib/labels";

export const metadata: Metadata = { title: "Student record" };
export const dynamic = "force-dynamic";

export default async function StudentRecordPage({ params }: { params: Promise<{ studentId: string }> }) {
  const { studentId } = await params;
  const user = await requirePagePermission("checks.record", `/records/${studentId}`);
  let student;
  try {
    ({ student } = await requireStudentFor(user, studentId, "examiner"));
  } catch (e) {
    if (e instanceof HttpError) notFound();
    throw e;
  }
  const school = await getSchool(user.schoolId);
  const progress = await progressFor(user, student.id, { asExaminer: true }).catch(() => null);
  if (!progress) notFound();
  const aircraft = await listQuestionAircraft(user.schoolId, undefined, student.id);
  const sessions = (await recentSessionsOf(student.id, user.schoolId)).map((x) => ({
    id: x.id,
    label: `${formatDayTime(x.startsAt, school.timeZone)} · ${x.title}`,
  }));
  const signed = new Map((await currentSignOffs(student.id)).map((s) => [s.itemId, s]));
  const openStages = progress.stages.filter((s, i) => !s.passed && (i === 0 || progress.stages[i - 1]!.passed));
  const openItems = openStages.flatMap((s) => s.items);
  const plans = await Promise.all(
    openItems
      .filter((i) => !signed.has(i.id))
      .map(async (i) => {
        try {
          const p = await planSignOff(user, { studentId: student.id, itemId: i.id });
          return { item: i, statement: p.statement, refusal: null as string | null };
        } catch (e) {
          if (e instanceof RecordRefusal || e instanceof HttpError)
            return { item: i, statement: null, refusal: e.message.replace(/^[\w.]+: /, "") };
          throw e;
        }
      }),
  );
  const canExamine = await mayExamine(user);
  const recent = progress.checks.slice(0, 6);
  return (
    <div className="space-y-6">
      <header>
        <p className="text-caption">
          <Link className="underline" href="/records">
            Records
          </Link>{" "}
          / {student.name}
        </p>
        <h1 className="text-display">{student.name}</h1>
        <p className="text-ink-soft">
          {student.courseCode} · {student.cohortName ?? "no cohort"} · lead {student.leadInstructorName ?? "—"} ·{" "}
          <Link className="underline" href={`/progress/${student.id}`}>
            Progress map
          </Link>{" "}
          ·{" "}
          <a className="underline" href={`/api/records/${student.id}/training-record`}>
            Training record (PDF)
          </a>
          {can(user, "records.inspect") && (
            <>
              {" "}
              ·{" "}
              <a className="underline" href={`/api/records/${student.id}/inspection-pack`}>
                Inspection pack (PDF)
              </a>
            </>
          )}
          {can(user, "sharing.students") && (
            <>
              {" "}
              ·{" "}
              <Link className="underline" href={`/sharing/${student.id}`}>
                Sponsors and sharing
              </Link>
            </>
          )}
          {can(user, "records.certify") && (
            <>
              {" "}
              ·{" "}
              <Link className="underline" href={`/completion/${student.id}`}>
                End training
              </Link>
            </>
          )}
        </p>
      </header>
      <Caution />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <section className="card" aria-labelledby="new-check">
          <h2 id="new-check">Record an oral check</h2>
          {openItems.length === 0 ? (
            <p className="mt-2 text-ink-soft">No items open for checks.</p>
          ) : (
            <CheckForm
              studentId={student.id}
              items={openItems.map((i) => ({ id: i.id, code: i.code, title: i.title, requiredLevel: i.requiredLevel }))}
              aircraft={aircraft}
              sessions={sessions}
            />
          )}
        </section>
        <aside className="card space-y-3" aria-labelledby="recent">
          <h2 id="recent">Recent outcomes</h2>
          {recent.length === 0 && <p className="text-ink-soft">No checks yet.</p>}
          <ul className="space-y-3" data-testid="recent-outcomes">
            {recent.map((c) => (
              <li key={c.id} className="border-b border-paper-edge pb-2">
                <p className="text-caption text-ink-soft num">
                  {formatDayTime(c.occurredAt, school.timeZone)} · {c.instructorName}
                </p>
                <p className="font-semibold">
                  {c.itemCodes.join(", ")} · {CHECK_OUTCOME_LABEL[c.outcome]}
                  {c.withdrawn ? " (withdrawn)" : c.amendedBy ? " (amended)" : ""}
                </p>
                <ul className="mt-1 flex flex-wrap gap-1">
                  {c.questions.map((q) => (
                    <li key={q.position}>
                      <OutcomeBadge outcome={q.outcome} prefix={q.itemCode} />
                    </li>
                  ))}
                </ul>
              </li>
            ))}
          </ul>
        </aside>
      </div>

      <section className="card" aria-labelledby="signoffs">
        <h2 id="signoffs">Sign-offs</h2>
        <div className="mt-2">
          <WideTable label="Sign-offs, scrolls sideways" more={1}>
            <table className="data-table">
              <thead>
                <tr>
                  <th scope="col">Item</th>
                  <th scope="col">Status</th>
                  <th scope="col" data-more="">
                    Sign-off
                  </th>
                </tr>
              </thead>
              <tbody>
                {progress.stages.flatMap((s) =>
                  s.items.map((i) => {
                    const so = signed.get(i.id);
                    const plan = plans.find((p) => p.item.id === i.id);
                    return (
                      <tr key={i.id}>
                        <td>
                          <span className="num font-semibold">{i.code}</span> {i.title}
                          <br />
                          <span className="text-caption text-ink-soft">requires {LEVEL_LABEL[i.requiredLevel].toLowerCase()}</span>
                        </td>
                        <td>
                          {ITEM_STATUS_LABEL[i.status]}
                          {i.lastOutcome && <> · last {OUTCOME_LABEL[i.lastOutcome]}</>}
                        </td>
                        <td data-more="">
                          {so ? (
                            <div className="space-y-1">
                              <p>
                                Signed for {formatDay(so.signedOn)} by {so.signerName}
                              </p>
                              {can(user, "records.amend") && (
                                <div className="flex flex-wrap gap-2">
                                  <WithdrawButton kind="signOff" id={so.id} label={`Withdraw sign-off of ${i.code}`} />
                                  <AmendButton signOffId={so.id} itemCode={i.code} />
                                </div>
                              )}
                            </div>
                          ) : plan?.statement ? (
                            can(user, "records.sign") ? (
                              <SignOffPanel studentId={student.id} itemId={i.id} itemCode={i.code} statement={plan.statement} />
                            ) : null
                          ) : plan?.refusal ? (
                            <p className="text-caption text-ink-soft" data-testid={`refusal-${i.code}`}>
                              Not yet signable: {plan.refusal}
                            </p>
                          ) : (
                            <p className="text-caption text-ink-soft">{s.passed ? "Stage passed" : "Stage not open"}</p>
                          )}
                        </td>
                      </tr>
                    );
                  }),
                )}
              </tbody>
            </table>
          </WideTable>
        </div>
      </section>

      <section className="card" aria-labelledby="stages">
        <h2 id="stages">Stage checks</h2>
        <ul className="mt-2 space-y-4">
          {progress.stages.map((s) => (
            <li key={s.stageId} className="space-y-2">
              <p>
                <span className="font-semibold">
                  {s.code} · {s.title}
                </span>
                : {s.passed ? "passed" : s.ready ? "ready for its stage check" : `not ready yet, still to come: ${s.waitingFor}`}
                {s.attempts.length > 0 && (
                  <span className="text-caption text-ink-soft">
                    {" "}
                    · attempts:{" "}
                    {s.attempts
                      .map((a) => `${a.attempt} ${words(STAGE_RESULT_WORDS, a.result).toLowerCase()} (${a.examinerName})`)
                      .join(", ")}
                  </span>
                )}
              </p>
              {s.ready && can(user, "stagechecks.conduct") && canExamine && (
                <StageCheckForm
                  studentId={student.id}
                  stageId={s.stageId}
                  stageCode={s.code}
                  items={s.items.map((i) => ({ id: i.id, code: i.code, title: i.title }))}
                  isLead={student.leadInstructorId === user.id}
                  mayOverride={can(user, "stagechecks.designate")}
                  passMark={school.settings.stageCheckPassMarkPercent}
                  statement={stageCheckStatement({
                    examinerName: user.name,
                    studentName: student.name,
                    stageCode: s.code,
                    stageTitle: s.title,
                    occurredOn: dateInZone(now(), school.timeZone),
                  })}
                />
              )}
            </li>
          ))}
        </ul>
      </section>

      <PracticeReadiness user={user} studentId={studentId} />

      <section className="card" aria-labelledby="history">
        <h2 id="history">Oral checks</h2>
        <ul className="mt-2 space-y-4">
          {progress.checks.map((c) => (
            <li key={c.id} id={`check-${c.id}`} className="border-b border-paper-edge pb-3" data-testid="check-history">
              <p className={`font-semibold ${c.withdrawn || c.amendedBy ? "line-through" : ""}`}>
                {formatDayTime(c.occurredAt, school.timeZone)} · {c.itemCodes.join(", ")} · {CHECK_OUTCOME_LABEL[c.outcome]} · level{" "}
                {LEVEL_LABEL[c.levelShown].toLowerCase()} · {c.durationMinutes} min · {c.instructorName}
              </p>
              {c.withdrawn && (
                <p className="text-notyet-800">
                  Withdrawn by {c.withdrawn.byName}: {c.withdrawn.reason}
                </p>
              )}
              {c.amends && (
                <p className="text-caption">
                  Amends{" "}
                  <a className="underline" href={`#check-${c.amends.id}`}>
                    an earlier check
                  </a>
                  : {c.amends.reason}
                </p>
              )}
              {c.amendedBy && (
                <p className="text-caption" data-testid="amended-by">
                  Amended by{" "}
                  <a className="underline" href={`#check-${c.amendedBy}`}>
                    a later check
                  </a>
                  ; kept here as recorded.
                </p>
              )}
              <p className="text-caption text-ink-soft">
                Recorded {formatDayTime(c.recordedAt, school.timeZone)}
                {c.acknowledgedAt
                  ? ` · debrief acknowledged ${formatDay(c.acknowledgedAt, school.timeZone)}`
                  : " · debrief not yet acknowledged"}
              </p>
              <ol className="mt-1 list-decimal space-y-1 pl-5">
                {c.questions.map((q) => (
                  <li key={q.position}>
                    <span className="num text-caption">{q.itemCode}</span> {q.text} <OutcomeBadge outcome={q.outcome} />
                    {q.prompted && <span className="text-caption"> · prompted</span>}
                    {q.correctiveGiven && <span className="text-caption"> · corrective instruction given</span>}
                    {!q.required && <span className="text-caption"> · not a required element</span>}
                    {q.answerSummary && <span className="block text-caption text-ink-soft">Answer: {q.answerSummary}</span>}
                    {q.generated && (
                      <span className="block text-caption text-ink-soft">
                        Computed answer: {q.generated.answer.display} (lib/aero {q.generated.libraryVersion}
                        {q.studentFigure !== null ? `; student said ${q.studentFigure}` : ""})
                        <span className="block" data-testid="answer-mode">
                          {answerModeText(q.generated)}
                        </span>
                      </span>
                    )}
                  </li>
                ))}
              </ol>
              {c.remarks && (
                <p className="mt-1 text-caption">
                  <span className="font-semibold">Remarks (internal):</span> {c.remarks}
                </p>
              )}
              {!c.withdrawn && !c.amendedBy && can(user, "records.amend") && (
                <div className="mt-1 flex flex-wrap gap-2">
                  <WithdrawButton kind="check" id={c.id} label="Withdraw this check" />
                  {openItems.length > 0 && (
                    <AmendCheck
                      checkId={c.id}
                      studentId={student.id}
                      items={openItems.map((i) => ({ id: i.id, code: i.code, title: i.title, requiredLevel: i.requiredLevel }))}
                      aircraft={aircraft}
                      sessions={sessions}
                    />
                  )}
                </div>
              )}
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}
