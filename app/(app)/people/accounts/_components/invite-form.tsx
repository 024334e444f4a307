"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { invitePersonSchema } from "@/lib/people/schema";
import { invitePersonAction } from "../actions";

type Choice = { value: string; label: string };
const FIELDS = ["name", "email", "roles"] as const;
type Field = (typeof FIELDS)[number];

/** The chief invites a member of staff or a sponsor: a new account and an invitation mail to choose a password. */
export function InviteForm({ roles }: { roles: Choice[] }) {
  const router = useRouter();
  const [idempotencyKey, setIdempotencyKey] = useState(() => crypto.randomUUID());
  const [errors, setErrors] = useState<Partial<Record<Field, string>>>({});
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const fd = new FormData(form);
    const input = { name: String(fd.get("name") ?? ""), email: String(fd.get("email") ?? ""), roles: fd.getAll("roles").map(String) };
    setMessage(null);
    const local = invitePersonSchema.safeParse(input);
    if (!local.success) {
      const next: Partial<Record<Field, string>> = {};
      for (const i of local.error.issues) {
        const f = String(i.path[0]) as Field;
        if (FIELDS.includes(f)) next[f] ??= i.message;
      }
      setErrors(next);
      return;
    }
    setErrors({});
    setBusy(true);
    const r = await invitePersonAction({ ...input, idempotencyKey });
    setBusy(false);
    if (r.ok) {
      setMessage({ ok: true, text: `Invited ${r.data.name}: an invitation to choose a password is on its way to ${r.data.email}.` });
      setIdempotencyKey(crypto.randomUUID());
      form.reset();
      router.refresh();
      return;
    }
    const next: Partial<Record<Field, string>> = {};
    for (const [f, m] of Object.entries(r.fieldErrors ?? {})) if ((FIELDS as readonly string[]).includes(f)) next[f as Field] = m[0];
    setErrors(next);
    // a refusal shown beside its field is not repeated here
    setMessage({ ok: false, text: Object.keys(next).length ? "Not invited: see the message above." : r.message });
  }

  const described = (f: Field) => ({ "aria-invalid": !!errors[f], "aria-describedby": errors[f] ? `inv-${f}-error` : undefined });
  const error = (f: Field) =>
    errors[f] ? (
      <p id={`inv-${f}-error`} className="field-error">
        {errors[f]}
      </p>
    ) : null;

  return (
    <form onSubmit={onSubmit} className="card space-y-3" aria-labelledby="invite-title" noValidate>
      <h2 id="invite-title">Invite a person</h2>
      <div>
        <label htmlFor="inv-name" className="field-label">
          Name
        </label>
        <input id="inv-name" name="name" className="field-input" autoComplete="off" {...described("name")} />
        {error("name")}
      </div>
      <div>
        <label htmlFor="inv-email" className="field-label">
          E-mail
        </label>
        <input id="inv-email" name="email" type="email" className="field-input" autoComplete="off" {...described("email")} />
        {error("email")}
      </div>
      <fieldset aria-describedby={errors.roles ? "inv-roles-error" : undefined}>
        <legend className="field-label">Roles</legend>
        <div className="flex flex-wrap gap-4">
          {roles.map((r) => (
            <label key={r.value} className="flex items-center gap-2">
              <input type="checkbox" name="roles" value={r.value} />
              {r.label}
            </label>
          ))}
        </div>
        {error("roles")}
      </fieldset>
      <div aria-live="polite">
        {message && (
          <p role={message.ok ? "status" : "alert"} className={message.ok ? "font-semibold text-solid-800" : "field-error"}>
            {message.text}
          </p>
        )}
      </div>
      <button type="submit" className="btn-primary" disabled={busy}>
        {busy ? "Inviting…" : "Invite"}
      </button>
    </form>
  );
}
