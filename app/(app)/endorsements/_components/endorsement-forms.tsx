"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ChoiceField } from "@/components/search-picker";
import type { PickerChoices } from "@/lib/directory/picker";
import { completeRemedialAction, endorseAction, recordResultAction } from "../actions";

type Errors = Record<string, string[]>;

/** A form of choices is shown while there is something to choose: a non-empty list, or a set large enough to search. */
const offers = (c: PickerChoices) => c.kind === "search" || c.rows.length > 0;

/** Endorse a student (password re-entry), record a test result, and mark remedial training done. */
export function EndorsementForms(props: {
  /** listed while few (with their course), else searched (GET /api/directory/students?purpose=endorsements) */
  students: PickerChoices;
  /** endorsements awaiting a result, listed while few, else searched (GET /api/directory/endorsements?kind=awaiting) */
  awaiting: PickerChoices;
  /** open remedial items, likewise (kind=remedial) */
  remedials: PickerChoices;
  maySign: boolean;
  mayRecord: boolean;
}) {
  const router = useRouter();
  const [keys, setKeys] = useState(() => ({ endorse: crypto.randomUUID(), result: crypto.randomUUID() }));
  const [errors, setErrors] = useState<Errors>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(
    e: React.FormEvent<HTMLFormElement>,
    run: (f: FormData) => Promise<{ ok: boolean; message?: string; fieldErrors?: Errors }>,
    done: string,
  ) {
    e.preventDefault();
    const form = e.currentTarget;
    setBusy(true);
    const res = await run(new FormData(form));
    setBusy(false);
    if (res.ok) {
      setErrors({});
      setMessage(done);
      setKeys({ endorse: crypto.randomUUID(), result: crypto.randomUUID() });
      form.reset();
      router.refresh();
    } else {
      setErrors(res.fieldErrors ?? {});
      setMessage(res.message ?? "Not saved");
    }
  }
  const err = (name: string) =>
    errors[name] ? (
      <p id={`${name}-error`} className="field-error">
        {errors[name][0]}
      </p>
    ) : null;
  const described = (name: string) => (errors[name] ? { "aria-invalid": true, "aria-describedby": `${name}-error` } : {});
  const str = (f: FormData, k: string) => String(f.get(k) ?? "");

  return (
    <div className="space-y-4">
      {props.maySign && (
        <form
          className="card grid gap-3 sm:grid-cols-4 sm:items-end"
          aria-label="Endorse a student"
          noValidate
          onSubmit={(e) =>
            submit(
              e,
              (f) =>
                endorseAction({
                  studentId: str(f, "studentId"),
                  endorsedOn: str(f, "endorsedOn"),
                  password: str(f, "password"),
                  idempotencyKey: keys.endorse,
                }),
              "Endorsement signed.",
            )
          }
        >
          <ChoiceField
            id="studentId"
            name="studentId"
            label="Student"
            choices={props.students}
            endpoint="/api/directory/students"
            params={{ purpose: "endorsements" }}
            error={errors.studentId?.[0]}
          />
          <div>
            <label htmlFor="endorsedOn" className="field-label">
              Endorsed on (empty: today)
            </label>
            <input id="endorsedOn" name="endorsedOn" type="date" className="field-input" {...described("endorsedOn")} />
            {err("endorsedOn")}
          </div>
          <div>
            <label htmlFor="endorse-password" className="field-label">
              Your password (to sign)
            </label>
            <input
              id="endorse-password"
              name="password"
              type="password"
              autoComplete="current-password"
              className="field-input"
              {...described("password")}
            />
            {err("password")}
          </div>
          <button
            type="submit"
            className="btn-primary"
            disabled={busy || (props.students.kind === "list" && props.students.rows.length === 0)}
          >
            Sign the endorsement
          </button>
        </form>
      )}
      {props.mayRecord && offers(props.awaiting) && (
        <form
          className="card grid gap-3 sm:grid-cols-5 sm:items-end"
          aria-label="Record a test result"
          noValidate
          onSubmit={(e) =>
            submit(
              e,
              (f) =>
                recordResultAction({
                  endorsementId: str(f, "endorsementId"),
                  takenOn: str(f, "takenOn"),
                  scorePercent: str(f, "scorePercent"),
                  areasMissed: str(f, "areasMissed"),
                  idempotencyKey: keys.result,
                }),
              "Result recorded.",
            )
          }
        >
          <ChoiceField
            id="endorsementId"
            name="endorsementId"
            label="Endorsement"
            choices={props.awaiting}
            endpoint="/api/directory/endorsements"
            params={{ kind: "awaiting" }}
            placeholder="A part of the student's name"
            error={errors.endorsementId?.[0]}
          />
          <div>
            <label htmlFor="takenOn" className="field-label">
              Test taken on
            </label>
            <input id="takenOn" name="takenOn" type="date" className="field-input" {...described("takenOn")} />
            {err("takenOn")}
          </div>
          <div>
            <label htmlFor="scorePercent" className="field-label">
              Score (%)
            </label>
            <input
              id="scorePercent"
              name="scorePercent"
              type="number"
              min={0}
              max={100}
              inputMode="numeric"
              className="field-input num"
              {...described("scorePercent")}
            />
            {err("scorePercent")}
          </div>
          <div>
            <label htmlFor="areasMissed" className="field-label">
              Knowledge areas missed (one a line)
            </label>
            <textarea id="areasMissed" name="areasMissed" rows={2} className="field-input" {...described("areasMissed")} />
            {err("areasMissed")}
          </div>
          <button type="submit" className="btn-primary" disabled={busy}>
            Record the result
          </button>
        </form>
      )}
      {props.mayRecord && offers(props.remedials) && (
        <form
          className="card grid gap-3 sm:grid-cols-3 sm:items-end"
          aria-label="Remedial training done"
          noValidate
          onSubmit={(e) =>
            submit(
              e,
              (f) => completeRemedialAction({ remedialId: str(f, "remedialId"), note: str(f, "note") }),
              "Remedial training recorded.",
            )
          }
        >
          <ChoiceField
            id="remedialId"
            name="remedialId"
            label="Open remedial item"
            choices={props.remedials}
            endpoint="/api/directory/endorsements"
            params={{ kind: "remedial" }}
            placeholder="A part of the student's name or the area"
            error={errors.remedialId?.[0]}
          />
          <div>
            <label htmlFor="note" className="field-label">
              Training given
            </label>
            <input id="note" name="note" className="field-input" maxLength={2000} {...described("note")} />
            {err("note")}
          </div>
          <button type="submit" className="btn-primary" disabled={busy}>
            Mark done
          </button>
        </form>
      )}
      <div aria-live="polite">
        {message && (
          <p className="text-ink-soft" data-testid="endorsement-message">
            {message}
          </p>
        )}
      </div>
    </div>
  );
}
