import Link from "next/link";
import { sponsorOverview, type SponsoredOverview } from "@/db/access/sponsoring/overview";
import type { CurrentUser } from "@/lib/auth/session";
import { CHECK_OUTCOME_WORDS } from "@/lib/labels";
import { formatDay, hoursLabel } from "@/lib/time";
import { ResumeLetterButton } from "../../letters/_components/resume-button";

// The sponsor's Today: one entry per student they sponsor, in plain words, each part only when
// the student shares it; whether the Weekly letter is on, and how to turn it back on.

// The line sits in one live region that outlives the refresh after "Receive … again", so the new
// state ("… is on.") is what the sponsor sees and hears as the confirmation.
function LetterLine({ s }: { s: SponsoredOverview }) {
  return (
    <div data-testid="letter-status" role="status" aria-live="polite" className="space-y-1">
      <LetterWords s={s} />
    </div>
  );
}

function LetterWords({ s }: { s: SponsoredOverview }) {
  const first = s.name.split(/\s+/)[0] ?? s.name;
  if (s.letter === "on")
    return (
      <p>
        The Weekly letter about {first} is on.{" "}
        <Link href="/letters" className="underline">
          Letters sent to you
        </Link>
      </p>
    );
  if (s.letter === "stopped-by-you")
    return (
      <>
        <p>
          <strong>The Weekly letter about {first} is off:</strong> you stopped it. To turn it back on:
        </p>
        <ResumeLetterButton studentId={s.studentId} studentName={first} />
      </>
    );
  return (
    <p>
      <strong>The Weekly letter about {first} is off:</strong> {first} has not chosen to send it to you. {first} can turn it on in Chalkwing
      under Sharing.
    </p>
  );
}

export async function SponsorToday({ user }: { user: CurrentUser }) {
  const students = await sponsorOverview(user);
  return (
    <section className="card space-y-3" aria-labelledby="sponsored-title">
      <h2 id="sponsored-title">The students you sponsor</h2>
      {students.length === 0 && <p>No student is linked to you.</p>}
      <ul className="divide-y divide-paper-edge" aria-label="Students you sponsor">
        {students.map((s) => (
          <li key={s.studentId} className="space-y-1 py-3" data-testid="sponsored-student">
            <h3 className="font-semibold">
              {s.progressLink ? (
                <Link href={`/progress/${s.studentId}`} className="underline">
                  {s.name}
                </Link>
              ) : (
                s.name
              )}
              {s.courseTitle && <span className="text-caption font-normal text-ink-soft"> · {s.courseTitle}</span>}
            </h3>
            {s.assessment && (
              <p data-testid="standing">
                {s.assessment.headline}
                {s.assessment.reasons.length > 0 && ` ${sentence(s.assessment.reasons.join("; "))}.`}
              </p>
            )}
            {s.milestones && (
              <p>
                {s.milestones.signed} of {s.milestones.total} syllabus items signed off.
                {s.milestones.latest &&
                  ` Latest: ${s.milestones.latest.code} ${s.milestones.latest.title} (${formatDay(s.milestones.latest.on)}).`}
              </p>
            )}
            {s.latestCheck && (
              <p>
                Latest oral check ({formatDay(s.latestCheck.on)}): {s.latestCheck.items}, {CHECK_OUTCOME_WORDS[s.latestCheck.outcome]}.
              </p>
            )}
            {s.hours && <p>Ground hours: {hoursLabel(s.hours.minutes, s.hours.minimumMinutes)}.</p>}
            {!s.shares.milestones && !s.shares.outcomes && !s.shares.hours && !s.shares.attendance && !s.shares.schedule && (
              <p className="text-ink-soft">{s.name} shares nothing with you at the moment.</p>
            )}
            <LetterLine s={s} />
          </li>
        ))}
      </ul>
    </section>
  );
}

/** A reason list read as a sentence: its first letter capital. */
function sentence(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
