"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { changeRolesAction } from "../actions";

type Choice = { value: string; label: string };
type Person = { id: string; name: string; roles: string[]; self: boolean };

/** The chief changes a person's roles; their sessions end at once. */
export function RolesForm({ roles, people }: { roles: Choice[]; people: Person[] }) {
  const router = useRouter();
  const [personId, setPersonId] = useState("");
  const [chosen, setChosen] = useState<string[]>([]);
  const [errors, setErrors] = useState<{ personId?: string; roles?: string }>({});
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const person = people.find((p) => p.id === personId);

  function pick(id: string) {
    setPersonId(id);
    setChosen(people.find((p) => p.id === id)?.roles ?? []);
    setErrors({});
    setMessage(null);
  }

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    setMessage(null);
    if (!personId) return setErrors({ personId: "choose a person" });
    if (chosen.length === 0) return setErrors({ roles: "choose at least one role" });
    setErrors({});
    setBusy(true);
    const r = await changeRolesAction({ personId, roles: chosen });
    setBusy(false);
    if (r.ok) {
      setMessage({
        ok: true,
        text: r.data.sessionsEnded
          ? `Roles of ${person?.name ?? "the person"} changed: their sessions have ended and they sign in again.`
          : "Nothing changed: those are already the person's roles.",
      });
      router.refresh();
      return;
    }
    const next = { personId: r.fieldErrors?.personId?.[0], roles: r.fieldErrors?.roles?.[0] };
    setErrors(next);
    // a refusal shown beside its field is not repeated here
    setMessage({ ok: false, text: next.personId || next.roles ? "Not saved: see the message above." : r.message });
  }

  return (
    <form onSubmit={onSubmit} className="card space-y-3" aria-labelledby="roles-title" noValidate>
      <h2 id="roles-title">Change a person&apos;s roles</h2>
      <div>
        <label htmlFor="roles-person" className="field-label">
          Person
        </label>
        <select
          id="roles-person"
          className="field-input"
          value={personId}
          onChange={(e) => pick(e.target.value)}
          aria-invalid={!!errors.personId}
          aria-describedby={errors.personId ? "roles-person-hint roles-person-error" : "roles-person-hint"}
        >
          <option value="">Choose a person</option>
          {people.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
              {p.self ? " (you)" : ""}
            </option>
          ))}
        </select>
        <p id="roles-person-hint" className="text-caption text-ink-soft">
          The people listed under Staff and sponsors on this page; find another with Name contains.
        </p>
        {errors.personId && (
          <p id="roles-person-error" className="field-error">
            {errors.personId}
          </p>
        )}
      </div>
      <fieldset aria-describedby={errors.roles ? "roles-roles-error" : undefined} disabled={!person}>
        <legend className="field-label">Roles</legend>
        <div className="flex flex-wrap gap-4">
          {roles.map((r) => (
            <label key={r.value} className="flex items-center gap-2">
              <input
                type="checkbox"
                name="roles"
                value={r.value}
                checked={chosen.includes(r.value)}
                onChange={(e) => setChosen((c) => (e.target.checked ? [...c, r.value] : c.filter((x) => x !== r.value)))}
              />
              {r.label}
            </label>
          ))}
        </div>
        {errors.roles && (
          <p id="roles-roles-error" className="field-error">
            {errors.roles}
          </p>
        )}
      </fieldset>
      <div aria-live="polite">
        {message && (
          <p role={message.ok ? "status" : "alert"} className={message.ok ? "font-semibold text-solid-800" : "field-error"}>
            {message.text}
          </p>
        )}
      </div>
      <button type="submit" className="btn-primary" disabled={busy || !person}>
        {busy ? "Saving…" : "Save roles (ends their sessions)"}
      </button>
    </form>
  );
}
