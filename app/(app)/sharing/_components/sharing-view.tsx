import type { StudentSharing } from "@/db/access/sharing/sponsors-of-student";
import { AGE_OF_MAJORITY } from "@/lib/sharing/consent";
import { ConsentForm } from "./consent-form";

/** The sponsors of one student and what each sees: for the student, or for staff (a minor's links). */
export function SharingView({ sharing, as }: { sharing: StudentSharing; as: "student" | "staff" }) {
  const own = as === "student";
  return (
    <div className="space-y-4">
      {sharing.manager === "school" ? (
        <p className="card" data-testid="sharing-manager">
          {own
            ? `You are under ${AGE_OF_MAJORITY}, so the school links your parents or guardians and decides what they see. Ask your lead instructor about a change.`
            : `${sharing.student.name} is under ${AGE_OF_MAJORITY}: the school decides what their sponsors see.`}
        </p>
      ) : (
        !own && (
          <p className="card" data-testid="sharing-manager">
            {sharing.student.name} is an adult and decides what their sponsors see; staff can read it but not change it.
          </p>
        )
      )}
      {sharing.sponsors.length === 0 ? (
        <p className="card">{own ? "You have no sponsors linked." : "No sponsors are linked."}</p>
      ) : (
        <ul className="space-y-4" aria-label="Sponsors">
          {sharing.sponsors.map((s) => (
            <li key={s.sponsorId} className="card space-y-3" data-testid="sponsor-consent">
              <h2 className="text-lead font-semibold">
                {s.sponsorName} <span className="text-caption font-normal text-ink-soft">({s.relationship})</span>
              </h2>
              <ConsentForm
                studentId={sharing.student.id}
                sponsorId={s.sponsorId}
                sponsorName={s.sponsorName}
                consent={s.consent}
                sponsorStoppedLetter={s.sponsorStoppedLetter}
                as={as}
                readOnly={!sharing.mayChange}
              />
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
