import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/errors";
import { progressFor } from "@/db/access/records/progress-map";
import { getSchool } from "@/db/access/shared/school";
import { ITEM_STATUS_LABEL, type ItemStatus } from "@/lib/records/progress";
import { LEVEL_LABEL, CHECK_OUTCOME_LABEL } from "@/lib/records/outcome";
import { answerModeText } from "@/lib/records/questions";
import { hoursLabel, formatDay } from "@/lib/time";
import { Caution } from "@/components/caution";
import { OutcomeBadge } from "../_components/outcome-badge";
import { OutcomeChart } from "../_components/outcome-chart";
import { AcknowledgeButton } from "../_components/acknowledge-button";

export const metadata: Metadata = { title: "Progress map" };
export const dynamic = "force-dynamic";

// Item status has marks of its own (squares and a star, blue-grey), so it never reads as an
// outcome (Solid / Shaky / Not yet: circles in green, amber and red) on the same card.
const STATUS_STYLE: Record<ItemStatus, string> = {
  not_started: "border-paper-edge bg-white",
  taught: "border-paper-edge bg-paper-deep",
  checked: "border-wing-500 border-dashed bg-wing-50",
  signed: "border-wing-600 bg-wing-100",
  stage_passed: "border-wing-800 bg-wing-100",
};
const STATUS_MARK: Record<ItemStatus, string> = { not_started: "□", taught: "◇", checked: "◈", signed: "■", stage_passed: "★" };

export default async function ProgressPage({ params }: { params: Promise<{ studentId: string }> }) {
  const { studentId } = await params;
  const user = await requirePagePermission("progress.view", `/progress/${studentId}`);
  let map;
  try {
    map = await progressFor(user, studentId);
  } catch (e) {
    if (e instanceof HttpError) notFound();
    throw e;
  }
  const school = await getSchool(user.schoolId);
  const isSelf = map.access === "self";
  return (
    <div className="space-y-6">
      <header>
        <p className="text-caption">
          <Link className="underline" href="/progress">
            Progress map
          </Link>
        </p>
        <h1 className="text-display">{map.student.name}</h1>
        <p className="text-ink-soft">
          {map.student.courseCode} {map.student.courseTitle} · {map.student.cohortName ?? "no cohort"} · enrolled{" "}
          {formatDay(map.student.enrolledOn)}
          {map.access !== "sponsor" && (
            <>
              {" "}
              ·{" "}
              <a className="underline" href={`/api/records/${map.student.id}/training-record`}>
                Training record (PDF)
              </a>
            </>
          )}
          {map.access === "staff" && can(user, "checks.record") && (
            <>
              {" "}
              ·{" "}
              <Link className="underline" href={`/records/${map.student.id}`}>
                Record a check
              </Link>
            </>
          )}
        </p>
      </header>
      <Caution />
      {map.ground && (
        <section className="card" aria-labelledby="ground">
          <h2 id="ground">Ground log</h2>
          <p className="num text-lead" data-testid="ground-hours">
            {hoursLabel(map.ground.minutes, map.ground.minimumMinutes)}
          </p>
          <div
            className="mt-1 h-3 w-full overflow-hidden rounded bg-paper-deep"
            role="img"
            aria-label={`${Math.round((100 * map.ground.minutes) / Math.max(1, map.ground.minimumMinutes))} % of the minimum ground time`}
          >
            <div
              className="h-full bg-wing-600"
              style={{ width: `${Math.min(100, (100 * map.ground.minutes) / Math.max(1, map.ground.minimumMinutes))}%` }}
            />
          </div>
        </section>
      )}
      <section aria-labelledby="grid-title" className="space-y-4">
        <h2 id="grid-title">Syllabus</h2>
        <p className="text-caption text-ink-soft">
          {(Object.keys(ITEM_STATUS_LABEL) as ItemStatus[]).map((s) => (
            <span key={s} className="mr-3">
              {STATUS_MARK[s]} {ITEM_STATUS_LABEL[s]}
            </span>
          ))}
        </p>
        {map.stages.map((s) => (
          <section key={s.stageId} className="card" aria-labelledby={`stage-${s.stageId}`}>
            <h3 id={`stage-${s.stageId}`} className="font-semibold">
              {s.code} · {s.title}{" "}
              <span className="text-caption font-normal text-ink-soft">
                ·{" "}
                {s.passed ? "stage check passed" : s.ready ? "ready for the stage check" : `not ready yet, still to come: ${s.waitingFor}`}{" "}
                · {s.signedCount} of {s.itemCount} signed
              </span>
            </h3>
            <ul className="mt-2 grid gap-2 sm:grid-cols-2 lg:grid-cols-3" data-testid="progress-grid">
              {s.items.map((i) => (
                <li
                  key={i.id}
                  className={`rounded-md border-2 p-2 ${STATUS_STYLE[i.status]}`}
                  data-testid={`item-${i.code}`}
                  data-status={i.status}
                >
                  <p className="font-semibold">
                    <span className="num">{i.code}</span> {i.title}
                  </p>
                  <p className="text-caption">
                    <span aria-hidden="true">{STATUS_MARK[i.status]} </span>
                    {ITEM_STATUS_LABEL[i.status]}
                    {i.status === "stage_passed" && i.stagePassed
                      ? ` ${i.stagePassed.on} (examiner ${i.stagePassed.examinerName})`
                      : i.signedOn
                        ? ` ${formatDay(i.signedOn)} (${i.signerName})`
                        : ""}
                  </p>
                  {i.transferCredit && (
                    <p className="text-caption" data-testid={`transfer-${i.code}`}>
                      Credited by transfer from {i.transferCredit.sourceSchool} (tested {formatDay(i.transferCredit.on)})
                    </p>
                  )}
                  <p className="text-caption text-ink-soft">
                    Requires {LEVEL_LABEL[i.requiredLevel].toLowerCase()}
                    {i.lastOutcome && (
                      <>
                        {" "}
                        · last check <OutcomeBadge outcome={i.lastOutcome} />
                      </>
                    )}
                  </p>
                </li>
              ))}
            </ul>
          </section>
        ))}
      </section>
      <section className="card" aria-labelledby="chart-title">
        <h2 id="chart-title">Outcomes over time</h2>
        {map.chart.length === 0 ? <p className="text-ink-soft">No oral checks yet.</p> : <OutcomeChart data={map.chart} />}
      </section>
      <section className="card" aria-labelledby="checks-title">
        <h2 id="checks-title">Oral checks</h2>
        {map.checks.length === 0 && <p className="text-ink-soft">No oral checks yet.</p>}
        <ul className="mt-2 space-y-3">
          {map.checks.map((c) => (
            <li key={c.id} className="border-b border-paper-edge pb-2" data-testid="progress-check">
              <p className="font-semibold">
                {formatDay(c.occurredAt, school.timeZone)} · {c.itemCodes.join(", ")} · {CHECK_OUTCOME_LABEL[c.outcome]}
                {c.withdrawn ? " (withdrawn)" : ""}
              </p>
              <p className="text-caption text-ink-soft">
                with {c.instructorName} · level of learning shown: {LEVEL_LABEL[c.levelShown]}
              </p>
              {c.questions.length > 0 && (
                <ol className="mt-1 list-decimal pl-5 text-caption">
                  {c.questions.map((q) => (
                    <li key={q.position}>
                      {q.text} <OutcomeBadge outcome={q.outcome} />
                      {q.generated && (
                        <>
                          {" "}
                          · answer {q.generated.answer.display}
                          <span className="block text-ink-soft" data-testid="answer-mode">
                            {answerModeText(q.generated)}
                          </span>
                        </>
                      )}
                    </li>
                  ))}
                </ol>
              )}
              {c.remarks && (
                <p className="text-caption">
                  <span className="font-semibold">Remarks (internal):</span> {c.remarks}
                </p>
              )}
              {isSelf &&
                !c.withdrawn &&
                (c.acknowledgedAt ? (
                  <p className="text-caption">You acknowledged this debrief on {formatDay(c.acknowledgedAt, school.timeZone)}.</p>
                ) : (
                  <AcknowledgeButton checkId={c.id} />
                ))}
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}
