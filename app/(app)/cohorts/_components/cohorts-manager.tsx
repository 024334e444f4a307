"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ScrollArea } from "@/components/ui/scroll-area";
import { formatDay } from "@/lib/time";
import { ChoiceField } from "@/components/search-picker";
import type { PickerChoices } from "@/lib/directory/picker";
import { addMemberAction, closeCohortAction, createCohortAction, moveMemberAction, renameCohortAction } from "../actions";

interface Cohort {
  id: string;
  name: string;
  courseCode: string;
  leadName: string;
  startsOn: string;
  closedOn: string | null;
  members: { id: string; name: string; fromDate: string }[];
  memberCount: number;
}
type Choice = { id: string; name: string };
type Result = { ok: true } | { ok: false; message: string; fieldErrors?: Record<string, string[]> };

export function CohortsManager({
  cohorts,
  openCohorts,
  courses,
  instructors,
  students,
  today,
}: {
  cohorts: Cohort[];
  /** every open cohort of the school (the page shows one page of cohorts), or "search" when many */
  openCohorts: PickerChoices;
  courses: Choice[];
  /** the school's active instructors while few, else "search" (GET /api/directory/instructors) */
  instructors: PickerChoices;
  /** the school's active students while few, else "search" (GET /api/directory/students) */
  students: PickerChoices;
  today: string;
}) {
  const router = useRouter();
  const [createKey, setCreateKey] = useState(() => crypto.randomUUID());
  const [placeKey, setPlaceKey] = useState(() => crypto.randomUUID());
  const [message, setMessage] = useState<{ text: string; ok: boolean } | null>(null);
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [busy, setBusy] = useState(false);

  async function run(p: Promise<Result>, okText: string, after?: () => void) {
    setBusy(true);
    const r = await p;
    setBusy(false);
    if (r.ok) {
      setErrors({});
      setMessage({ ok: true, text: okText });
      after?.();
      router.refresh();
    } else {
      setErrors(r.fieldErrors ?? {});
      setMessage({ ok: false, text: r.message });
    }
  }
  const values = (e: React.FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    return Object.fromEntries([...new FormData(e.currentTarget).entries()].map(([k, v]) => [k, String(v)]));
  };
  const err = (name: string) => (errors[name] ? <p className="field-error">{errors[name][0]}</p> : null);

  return (
    <div className="space-y-6">
      <div aria-live="polite">
        {message && (
          <p className={message.ok ? "text-ink-soft" : "field-error"} role={message.ok ? undefined : "alert"} data-testid="cohorts-message">
            {message.text}
          </p>
        )}
      </div>
      <ScrollArea label="Cohorts">
        <table className="data-table w-full" data-testid="cohorts-table">
          <thead>
            <tr>
              <th scope="col">Cohort</th>
              <th scope="col">Course</th>
              <th scope="col">Lead</th>
              <th scope="col">Starts</th>
              <th scope="col">Students today</th>
              <th scope="col">Rename or close</th>
            </tr>
          </thead>
          <tbody>
            {cohorts.map((c) => (
              <tr key={c.id}>
                <td>
                  {c.name}
                  {c.closedOn && <span className="text-ink-soft"> · closed from {formatDay(c.closedOn)}</span>}
                </td>
                <td>{c.courseCode}</td>
                <td>{c.leadName}</td>
                <td>{formatDay(c.startsOn)}</td>
                <td>
                  {c.memberCount === 0
                    ? "—"
                    : c.members.map((m) => m.name).join(", ") +
                      (c.memberCount > c.members.length ? ` and ${c.memberCount - c.members.length} more` : "")}
                </td>
                <td>
                  <form
                    className="flex flex-wrap items-end gap-2"
                    aria-label={`Rename ${c.name}`}
                    onSubmit={(e) => run(renameCohortAction({ cohortId: c.id, name: values(e).name }), "Renamed.")}
                  >
                    <label className="sr-only" htmlFor={`rn-${c.id}`}>
                      New name for {c.name}
                    </label>
                    <input id={`rn-${c.id}`} name="name" defaultValue={c.name} maxLength={100} className="field-input" />
                    <button type="submit" className="btn-quiet" disabled={busy}>
                      Rename
                    </button>
                  </form>
                  {!c.closedOn && (
                    <form
                      className="mt-2 flex flex-wrap items-end gap-2"
                      aria-label={`Close ${c.name}`}
                      onSubmit={(e) => run(closeCohortAction({ cohortId: c.id, closedOn: values(e).closedOn }), `${c.name} is closed.`)}
                    >
                      <label className="sr-only" htmlFor={`cl-${c.id}`}>
                        Close {c.name} from
                      </label>
                      <input id={`cl-${c.id}`} name="closedOn" type="date" defaultValue={today} className="field-input" />
                      <button type="submit" className="btn-quiet" disabled={busy}>
                        Close from this date
                      </button>
                    </form>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollArea>

      <form
        className="card grid gap-3 sm:grid-cols-2"
        aria-labelledby="place-title"
        onSubmit={(e) => {
          const v = values(e);
          const submitter = (e.nativeEvent as SubmitEvent).submitter as HTMLButtonElement | null;
          const input = { studentId: v.studentId, idempotencyKey: placeKey };
          const p =
            submitter?.value === "add"
              ? addMemberAction({ ...input, cohortId: v.cohortId, fromDate: v.onDate })
              : moveMemberAction({ ...input, toCohortId: v.cohortId, onDate: v.onDate });
          return run(p, "Done: the membership is dated.", () => setPlaceKey(crypto.randomUUID()));
        }}
      >
        <h2 id="place-title" className="sm:col-span-2">
          Add or move a student
        </h2>
        <ChoiceField
          id="pl-student"
          name="studentId"
          label="Student"
          emptyLabel="Choose a student"
          choices={students}
          endpoint="/api/directory/students"
          params={{ purpose: "cohorts" }}
          error={errors.studentId?.[0]}
        />
        <ChoiceField
          id="pl-cohort"
          name="cohortId"
          label="Cohort"
          emptyLabel="Choose a cohort"
          choices={openCohorts}
          endpoint="/api/directory/cohorts"
          params={{ purpose: "placing" }}
          error={(errors.cohortId ?? errors.toCohortId)?.[0]}
        />
        <div>
          <label htmlFor="pl-date" className="field-label">
            From
          </label>
          <input id="pl-date" name="onDate" type="date" defaultValue={today} className="field-input" />
          {err("onDate") ?? err("fromDate")}
        </div>
        <div className="flex items-end gap-2">
          <button type="submit" value="move" className="btn-primary" disabled={busy}>
            Move to this cohort
          </button>
          <button type="submit" value="add" className="btn-quiet" disabled={busy}>
            Add (no cohort yet)
          </button>
        </div>
      </form>

      <form
        className="card grid gap-3 sm:grid-cols-2"
        aria-labelledby="new-title"
        onSubmit={(e) => {
          const v = values(e);
          return run(createCohortAction({ ...v, idempotencyKey: createKey }), `${v.name} created.`, () =>
            setCreateKey(crypto.randomUUID()),
          );
        }}
      >
        <h2 id="new-title" className="sm:col-span-2">
          New cohort
        </h2>
        <div>
          <label htmlFor="nc-name" className="field-label">
            Name
          </label>
          <input id="nc-name" name="name" maxLength={100} className="field-input" />
          {err("name")}
        </div>
        <div>
          <label htmlFor="nc-course" className="field-label">
            Course
          </label>
          <select id="nc-course" name="courseId" className="field-input">
            {courses.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </select>
          {err("courseId")}
        </div>
        <ChoiceField
          id="nc-lead"
          name="leadInstructorId"
          label="Lead instructor"
          choices={instructors}
          endpoint="/api/directory/instructors"
          params={{ purpose: "cohorts" }}
          error={errors.leadInstructorId?.[0]}
        />
        <div>
          <label htmlFor="nc-starts" className="field-label">
            Starts on
          </label>
          <input id="nc-starts" name="startsOn" type="date" defaultValue={today} className="field-input" />
          {err("startsOn")}
        </div>
        <div className="sm:col-span-2">
          <button type="submit" className="btn-primary" disabled={busy}>
            Create the cohort
          </button>
        </div>
      </form>
    </div>
  );
}
