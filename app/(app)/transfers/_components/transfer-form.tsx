"use client";
import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { hoursLabel } from "@/lib/time";
import { SearchPicker } from "@/components/search-picker";

export interface StudentChoice {
  id: string;
  name: string;
  courseCode: string;
  minGroundMinutes: number;
  approvedCapMinutes: number;
  notApprovedCapMinutes: number;
  creditedApproved: number;
  creditedNotApproved: number;
  items: { id: string; code: string; title: string; stageCode: string }[];
}

type ApiError = { error?: { message: string; field?: string } };

/**
 * The chief's form for a transfer credit: sent as one multipart upload with the evidence file.
 * `search`: the school has too many students to list; the student is found with the search picker
 * and the page reloads with `?student=` to bring that student's course and items (`students` holds
 * only them).
 */
export function TransferForm({ students, search = false }: { students: StudentChoice[]; search?: boolean }) {
  const router = useRouter();
  const id = useId();
  const [key, setKey] = useState(() => crypto.randomUUID());
  const [studentId, setStudentId] = useState(students[0]?.id ?? "");
  const [approved, setApproved] = useState("yes");
  const [error, setError] = useState<{ message: string; field?: string } | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const student = students.find((s) => s.id === studentId);
  const room = student
    ? approved === "yes"
      ? Math.max(0, student.approvedCapMinutes - student.creditedApproved - student.creditedNotApproved)
      : Math.max(0, student.notApprovedCapMinutes - student.creditedNotApproved)
    : 0;

  async function submit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const body = new FormData(form);
    body.set("idempotencyKey", key);
    setBusy(true);
    setMessage(null);
    const res = await fetch("/api/transfers/credits", { method: "POST", body });
    setBusy(false);
    if (res.ok) {
      setError(null);
      setMessage("Transfer credit recorded.");
      form.reset();
      setKey(crypto.randomUUID());
      router.refresh();
      return;
    }
    const j = (await res.json().catch(() => ({}))) as ApiError;
    setError(j.error ?? { message: `The credit was not recorded (${res.status})` });
  }

  const err = (field: string) =>
    error?.field === field ? (
      <p id={`${id}-${field}-error`} className="field-error">
        {error.message.replace(/^[A-Za-z]+: /, "")}
      </p>
    ) : null;
  const aria = (field: string) => (error?.field === field ? { "aria-invalid": true, "aria-describedby": `${id}-${field}-error` } : {});

  if (students.length === 0 && !search)
    return <p className="text-ink-soft">No student is in training: credit is recorded on an active enrolment.</p>;
  return (
    <form className="card space-y-3" aria-label="Record a transfer credit" noValidate onSubmit={submit} encType="multipart/form-data">
      {search ? (
        <SearchPicker
          id={`${id}-student`}
          name="studentId"
          label="Student"
          endpoint="/api/directory/students"
          params={{ purpose: "transfers" }}
          initial={student ? { id: student.id, name: student.name, detail: student.courseCode } : null}
          error={error?.field === "studentId" ? error.message.replace(/^[A-Za-z]+: /, "") : null}
          onChange={(c) => router.replace(c ? `/transfers?student=${encodeURIComponent(c.id)}` : "/transfers", { scroll: false })}
        />
      ) : (
        <div>
          <label htmlFor={`${id}-student`} className="field-label">
            Student
          </label>
          <select
            id={`${id}-student`}
            name="studentId"
            className="field-input"
            value={studentId}
            onChange={(e) => setStudentId(e.target.value)}
            {...aria("studentId")}
          >
            {students.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name} ({s.courseCode})
              </option>
            ))}
          </select>
          {err("studentId")}
        </div>
      )}
      <div>
        <label htmlFor={`${id}-source`} className="field-label">
          Earlier school
        </label>
        <input id={`${id}-source`} name="sourceSchool" className="field-input" maxLength={200} {...aria("sourceSchool")} />
        {err("sourceSchool")}
      </div>
      <fieldset>
        <legend className="field-label">Was the earlier course an approved course?</legend>
        <div className="flex flex-wrap gap-4">
          {[
            ["yes", "Yes: up to 50% of the ground minimum"],
            ["no", "No: up to 25%"],
          ].map(([v, label]) => (
            <label key={v} className="flex min-h-10 items-center gap-2">
              <input type="radio" name="sourceApproved" value={v} checked={approved === v} onChange={() => setApproved(v!)} />
              {label}
            </label>
          ))}
        </div>
      </fieldset>
      <div>
        <label htmlFor={`${id}-minutes`} className="field-label">
          Ground time credited (minutes)
        </label>
        <input
          id={`${id}-minutes`}
          name="creditedMinutes"
          type="number"
          min={0}
          inputMode="numeric"
          className="field-input num"
          defaultValue={0}
          aria-describedby={`${id}-room`}
          {...(error?.field === "creditedMinutes"
            ? { "aria-invalid": true, "aria-describedby": `${id}-room ${id}-creditedMinutes-error` }
            : {})}
        />
        {student && (
          <p id={`${id}-room`} className="text-caption text-ink-soft">
            Course minimum {hoursLabel(student.minGroundMinutes)}; at most <span className="num">{room}</span> more minutes can be credited
            this way (14 CFR 141.77(c)).
          </p>
        )}
        {err("creditedMinutes")}
      </div>
      {student && student.items.length > 0 && (
        <fieldset {...(error?.field === "itemIds" ? { "aria-describedby": `${id}-itemIds-error` } : {})}>
          <legend className="field-label">Syllabus items credited</legend>
          <div className="grid gap-1 sm:grid-cols-2">
            {student.items.map((i) => (
              <label key={i.id} className="flex min-h-10 items-start gap-2">
                <input type="checkbox" name="itemIds" value={i.id} className="mt-1" />
                <span>
                  <span className="num">{i.code}</span> {i.title}
                </span>
              </label>
            ))}
          </div>
          {err("itemIds")}
        </fieldset>
      )}
      <div className="grid gap-3 sm:grid-cols-3">
        <div>
          <label htmlFor={`${id}-kind`} className="field-label">
            This school&apos;s test
          </label>
          <select id={`${id}-kind`} name="testKind" className="field-input" defaultValue="knowledge" {...aria("testKind")}>
            <option value="knowledge">Knowledge test</option>
            <option value="proficiency">Proficiency test</option>
            <option value="both">Both</option>
          </select>
          {err("testKind")}
        </div>
        <div>
          <label htmlFor={`${id}-on`} className="field-label">
            Taken on
          </label>
          <input id={`${id}-on`} name="testTakenOn" type="date" className="field-input" {...aria("testTakenOn")} />
          {err("testTakenOn")}
        </div>
        <div>
          <label htmlFor={`${id}-result`} className="field-label">
            Result
          </label>
          <input id={`${id}-result`} name="testResult" className="field-input" maxLength={200} {...aria("testResult")} />
          {err("testResult")}
        </div>
      </div>
      <div>
        <label htmlFor={`${id}-note`} className="field-label">
          Note (optional)
        </label>
        <textarea id={`${id}-note`} name="note" rows={2} className="field-input" maxLength={2000} {...aria("note")} />
        {err("note")}
      </div>
      <div>
        <label htmlFor={`${id}-evidence`} className="field-label">
          Evidence from the earlier school (PDF, PNG or JPEG, up to 10 MB)
        </label>
        <input
          id={`${id}-evidence`}
          name="evidence"
          type="file"
          accept=".pdf,.png,.jpg,.jpeg,application/pdf,image/png,image/jpeg"
          className="field-input"
          {...aria("evidence")}
        />
        {err("evidence")}
      </div>
      <button type="submit" className="btn-primary" disabled={busy}>
        Record the credit
      </button>
      <div aria-live="polite">
        {error &&
          ![
            "studentId",
            "sourceSchool",
            "creditedMinutes",
            "itemIds",
            "testKind",
            "testTakenOn",
            "testResult",
            "note",
            "evidence",
          ].includes(error.field ?? "") && <p className="field-error">{error.message}</p>}
        {error && <p className="sr-only">{error.message}</p>}
        {message && <p className="text-ink-soft">{message}</p>}
      </div>
    </form>
  );
}
