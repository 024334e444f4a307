"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { scheduleSessionSchema } from "@/lib/timetable/schema";
import { MultiSearchPicker, SearchPicker } from "@/components/search-picker";
import type { PickerChoices, PickerOption } from "@/lib/directory/picker";
import { scheduleSessionAction } from "../actions";

type In = z.input<typeof scheduleSessionSchema>;
type Out = z.output<typeof scheduleSessionSchema>;

export interface SchedulingChoices {
  briefings: { id: string; title: string; revisionNumber: number; minutes: number }[];
  /** listed while few, else searched (GET /api/directory/instructors) */
  instructors: PickerChoices;
  /** the caller, when they may teach (the first choice of instructor) */
  self: PickerOption | null;
  /** listed while few, else searched (GET /api/directory/cohorts, /api/directory/students) */
  cohorts: PickerChoices;
  students: PickerChoices;
  rooms: string[];
  roomChoices: { id: string; name: string; capacity: number | null }[];
}

function newKey() {
  return `sch-${crypto.randomUUID()}`;
}

export function ScheduleForm({ choices, defaults }: { choices: SchedulingChoices; defaults: { date: string; instructorId: string } }) {
  const router = useRouter();
  const [message, setMessage] = useState<string | null>(null);
  const [key] = useState(newKey);
  // the students chosen through the search picker (a large school)
  const [picked, setPicked] = useState<PickerOption[]>([]);
  function pickStudents(next: PickerOption[]) {
    setPicked(next);
    setValue(
      "studentIds",
      next.map((p) => p.id),
      { shouldDirty: true },
    );
  }
  const {
    register,
    handleSubmit,
    setValue,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<In, unknown, Out>({
    resolver: zodResolver(scheduleSessionSchema),
    defaultValues: {
      briefingId: "",
      date: defaults.date,
      time: "09:00",
      durationMinutes: 60,
      roomId: choices.roomChoices[0]?.id ?? "",
      room: "",
      instructorId: defaults.instructorId,
      cohortId: "",
      studentIds: [],
    },
  });
  async function onSubmit(data: Out) {
    setMessage(null);
    const r = await scheduleSessionAction({ ...data, idempotencyKey: key });
    if (r.ok) {
      router.push(`/timetable/${r.data.id}`);
      return;
    }
    setMessage(r.message);
    for (const [field, msgs] of Object.entries(r.fieldErrors ?? {})) {
      if (field in scheduleSessionSchema.shape) setError(field as keyof In, { message: msgs[0] });
    }
  }
  const err = (f: keyof In) =>
    errors[f]?.message && (
      <p id={`${f}-error`} className="field-error">
        {String(errors[f]?.message)}
      </p>
    );
  return (
    <form onSubmit={handleSubmit(onSubmit)} className="card grid max-w-3xl gap-4 sm:grid-cols-2" noValidate aria-label="Schedule a session">
      <div className="sm:col-span-2">
        <label htmlFor="briefingId" className="field-label">
          Briefing
        </label>
        <select
          id="briefingId"
          className="field-input"
          aria-invalid={!!errors.briefingId}
          aria-describedby="briefingId-error"
          {...register("briefingId", {
            onChange: (e) => {
              const b = choices.briefings.find((x) => x.id === e.target.value);
              if (b && b.minutes >= 15) setValue("durationMinutes", b.minutes);
            },
          })}
        >
          <option value="">Choose a briefing</option>
          {choices.briefings.map((b) => (
            <option key={b.id} value={b.id}>
              {b.title} (revision {b.revisionNumber}
              {b.minutes ? `, ${b.minutes} min` : ""})
            </option>
          ))}
        </select>
        {err("briefingId")}
      </div>
      <div>
        <label htmlFor="date" className="field-label">
          Date
        </label>
        <input
          id="date"
          type="date"
          className="field-input"
          aria-invalid={!!errors.date}
          aria-describedby="date-error"
          {...register("date")}
        />
        {err("date")}
      </div>
      <div>
        <label htmlFor="time" className="field-label">
          Start time
        </label>
        <input
          id="time"
          type="time"
          className="field-input"
          aria-invalid={!!errors.time}
          aria-describedby="time-error"
          {...register("time")}
        />
        {err("time")}
      </div>
      <div>
        <label htmlFor="durationMinutes" className="field-label">
          Length (minutes)
        </label>
        <input
          id="durationMinutes"
          type="number"
          min={15}
          max={480}
          step={5}
          className="field-input num"
          aria-invalid={!!errors.durationMinutes}
          aria-describedby="durationMinutes-error"
          {...register("durationMinutes")}
        />
        {err("durationMinutes")}
      </div>
      <div>
        <label htmlFor="roomId" className="field-label">
          Room
        </label>
        <select id="roomId" className="field-input" aria-invalid={!!errors.roomId} aria-describedby="roomId-error" {...register("roomId")}>
          <option value="">Choose a room</option>
          {choices.roomChoices.map((r) => (
            <option key={r.id} value={r.id}>
              {r.name}
              {r.capacity ? ` (${r.capacity} seats)` : ""}
            </option>
          ))}
        </select>
        {err("roomId")}
        {err("room")}
      </div>
      {choices.instructors.kind === "list" ? (
        <div>
          <label htmlFor="instructorId" className="field-label">
            Instructor
          </label>
          <select
            id="instructorId"
            className="field-input"
            aria-invalid={!!errors.instructorId}
            aria-describedby="instructorId-error"
            {...register("instructorId")}
          >
            <option value="">Choose an instructor</option>
            {choices.instructors.rows.map((i) => (
              <option key={i.id} value={i.id}>
                {i.name}
              </option>
            ))}
          </select>
          {err("instructorId")}
        </div>
      ) : (
        <SearchPicker
          id="instructorId"
          name="instructorId"
          label="Instructor"
          endpoint="/api/directory/instructors"
          params={{ purpose: "timetable" }}
          initial={defaults.instructorId && choices.self?.id === defaults.instructorId ? choices.self : null}
          error={errors.instructorId?.message ? String(errors.instructorId.message) : null}
          onChange={(i) => setValue("instructorId", i?.id ?? "", { shouldDirty: true })}
        />
      )}
      {choices.cohorts.kind === "list" ? (
        <div>
          <label htmlFor="cohortId" className="field-label">
            Cohort
          </label>
          <select
            id="cohortId"
            className="field-input"
            aria-invalid={!!errors.cohortId}
            aria-describedby="cohortId-error"
            {...register("cohortId")}
          >
            <option value="">No cohort (students below)</option>
            {choices.cohorts.rows.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </select>
          {err("cohortId")}
        </div>
      ) : (
        <SearchPicker
          id="cohortId"
          name="cohortId"
          label="Cohort"
          placeholder="No cohort: type a name to choose one"
          endpoint="/api/directory/cohorts"
          params={{ purpose: "timetable" }}
          error={errors.cohortId?.message ? String(errors.cohortId.message) : null}
          onChange={(c) => setValue("cohortId", c?.id ?? "", { shouldDirty: true })}
        />
      )}
      {choices.students.kind === "list" ? (
        <div className="sm:col-span-2">
          <label htmlFor="studentIds" className="field-label">
            Individual students (in addition to the cohort; Ctrl or ⌘ to choose several)
          </label>
          <select
            id="studentIds"
            multiple
            size={6}
            className="field-input h-auto"
            aria-describedby="studentIds-error"
            {...register("studentIds")}
          >
            {choices.students.rows.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
          {err("studentIds")}
        </div>
      ) : (
        <div className="sm:col-span-2">
          <MultiSearchPicker
            id="studentIds"
            name="studentIdsChosen"
            label="Individual students (in addition to the cohort; choose one at a time)"
            endpoint="/api/directory/students"
            params={{ purpose: "schedule" }}
            error={errors.studentIds?.message ? String(errors.studentIds.message) : null}
            value={picked}
            onChange={pickStudents}
          />
        </div>
      )}
      <div className="sm:col-span-2" aria-live="polite">
        {message && (
          <p role="alert" className="field-error" data-testid="form-message">
            {message}
          </p>
        )}
      </div>
      <div className="sm:col-span-2">
        <button type="submit" className="btn-primary" disabled={isSubmitting}>
          {isSubmitting ? "Scheduling…" : "Schedule the session"}
        </button>
      </div>
    </form>
  );
}
