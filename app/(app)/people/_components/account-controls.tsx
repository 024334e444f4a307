"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ChoiceField } from "@/components/search-picker";
import type { PickerChoices } from "@/lib/directory/picker";
import { linkSponsorAction, setAccountActiveAction } from "../actions";

/**
 * The chief's account changes: deactivate or reactivate an account, link a sponsor to a student.
 * Each choice is a plain select while the set is small, else a search picker (GET /api/directory/*).
 */
export function AccountControls({
  people,
  sponsors,
  students,
}: {
  people: PickerChoices;
  sponsors: PickerChoices;
  students: PickerChoices;
}) {
  const router = useRouter();
  const [linkKey, setLinkKey] = useState(() => crypto.randomUUID());
  const [message, setMessage] = useState<{ text: string; ok: boolean } | null>(null);
  const [busy, setBusy] = useState(false);
  const values = (e: React.FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    return Object.fromEntries([...new FormData(e.currentTarget).entries()].map(([k, v]) => [k, String(v)]));
  };
  async function run(p: Promise<{ ok: true } | { ok: false; message: string }>, okText: string, after?: () => void) {
    setBusy(true);
    const r = await p;
    setBusy(false);
    setMessage(r.ok ? { ok: true, text: okText } : { ok: false, text: r.message });
    if (r.ok) {
      after?.();
      router.refresh();
    }
  }
  return (
    <section className="card space-y-4" aria-labelledby="accounts-title">
      <h2 id="accounts-title">Accounts and sponsors</h2>
      <div aria-live="polite">
        {message && (
          <p className={message.ok ? "text-ink-soft" : "field-error"} role={message.ok ? undefined : "alert"}>
            {message.text}
          </p>
        )}
      </div>
      <form
        className="flex flex-wrap items-end gap-3"
        aria-label="Deactivate or reactivate an account"
        onSubmit={(e) => {
          const v = values(e);
          const active = ((e.nativeEvent as SubmitEvent).submitter as HTMLButtonElement | null)?.value === "on";
          return run(
            setAccountActiveAction({ personId: v.personId, active }),
            active ? "The account is active again." : "Deactivated: the person's sessions have ended.",
          );
        }}
      >
        <ChoiceField
          id="acc-person"
          name="personId"
          label="Person"
          emptyLabel="Choose a person"
          choices={people}
          endpoint="/api/directory/people"
          params={{ role: "any" }}
        />
        <button type="submit" value="off" className="btn-quiet" disabled={busy}>
          Deactivate (ends their sessions)
        </button>
        <button type="submit" value="on" className="btn-quiet" disabled={busy}>
          Reactivate
        </button>
      </form>
      <form
        className="flex flex-wrap items-end gap-3"
        aria-label="Link a sponsor to a student"
        onSubmit={(e) => {
          const v = values(e);
          return run(
            linkSponsorAction({ ...v, idempotencyKey: linkKey }),
            "Linked. The student's sharing choices decide what the sponsor sees.",
            () => setLinkKey(crypto.randomUUID()),
          );
        }}
      >
        <ChoiceField
          id="ln-sponsor"
          name="sponsorId"
          label="Sponsor"
          emptyLabel="Choose a sponsor"
          choices={sponsors}
          endpoint="/api/directory/people"
          params={{ role: "sponsor" }}
        />
        <ChoiceField
          id="ln-student"
          name="studentId"
          label="Student"
          emptyLabel="Choose a student"
          choices={students}
          endpoint="/api/directory/students"
          params={{ purpose: "sponsors" }}
        />
        <div>
          <label htmlFor="ln-rel" className="field-label">
            Relationship
          </label>
          <input id="ln-rel" name="relationship" defaultValue="sponsor" maxLength={60} className="field-input" />
        </div>
        <button type="submit" className="btn-primary" disabled={busy}>
          Link
        </button>
      </form>
    </section>
  );
}
