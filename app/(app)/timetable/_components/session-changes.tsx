"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { rescheduleSessionSchema, cancelSessionSchema } from "@/lib/timetable/schema";
import { SearchPicker } from "@/components/search-picker";
import type { PickerChoices } from "@/lib/directory/picker";
import { rescheduleSessionAction, cancelSessionAction } from "../actions";

type RIn = z.input<typeof rescheduleSessionSchema>;
type ROut = z.output<typeof rescheduleSessionSchema>;
type CIn = z.input<typeof cancelSessionSchema>;
type COut = z.output<typeof cancelSessionSchema>;

/** Reschedule and cancel forms for one session. */
export function SessionChanges({
  session,
  instructors,
  rooms,
}: {
  session: {
    id: string;
    date: string;
    time: string;
    durationMinutes: number;
    roomId: string;
    instructorId: string;
    instructorName: string;
  };
  /** listed while few, else searched (GET /api/directory/instructors) */
  instructors: PickerChoices;
  rooms: { id: string; name: string }[];
}) {
  const router = useRouter();
  const [msg, setMsg] = useState<{ text: string; ok: boolean } | null>(null);
  const r = useForm<RIn, unknown, ROut>({
    resolver: zodResolver(rescheduleSessionSchema),
    defaultValues: {
      sessionId: session.id,
      date: session.date,
      time: session.time,
      durationMinutes: session.durationMinutes,
      roomId: session.roomId,
      room: "",
      instructorId: session.instructorId,
    },
  });
  const c = useForm<CIn, unknown, COut>({
    resolver: zodResolver(cancelSessionSchema),
    defaultValues: { sessionId: session.id, reason: "" },
  });
  async function reschedule(data: ROut) {
    const res = await rescheduleSessionAction({ ...data, idempotencyKey: `rs-${crypto.randomUUID()}` });
    setMsg(
      res.ok
        ? { ok: true, text: `Moved. ${res.data.told} student${res.data.told === 1 ? " is" : "s are"} told by mail.` }
        : { ok: false, text: res.message },
    );
    if (res.ok) router.refresh();
  }
  async function cancel(data: COut) {
    const res = await cancelSessionAction({ ...data, idempotencyKey: `cs-${crypto.randomUUID()}` });
    setMsg(
      res.ok
        ? { ok: true, text: `Cancelled. ${res.data.told} student${res.data.told === 1 ? " is" : "s are"} told by mail.` }
        : { ok: false, text: res.message },
    );
    if (res.ok) router.refresh();
  }
  const re = r.formState.errors;
  return (
    <div className="grid gap-6 lg:grid-cols-2">
      <form onSubmit={r.handleSubmit(reschedule)} className="card grid gap-3 sm:grid-cols-2" aria-labelledby="rs-title" noValidate>
        <h2 id="rs-title" className="sm:col-span-2">
          Reschedule
        </h2>
        <div>
          <label htmlFor="rs-date" className="field-label">
            Date
          </label>
          <input id="rs-date" type="date" className="field-input" {...r.register("date")} />
          {re.date && <p className="field-error">{re.date.message}</p>}
        </div>
        <div>
          <label htmlFor="rs-time" className="field-label">
            Start time
          </label>
          <input id="rs-time" type="time" className="field-input" {...r.register("time")} />
          {re.time && <p className="field-error">{re.time.message}</p>}
        </div>
        <div>
          <label htmlFor="rs-len" className="field-label">
            Length (minutes)
          </label>
          <input id="rs-len" type="number" min={15} max={480} step={5} className="field-input num" {...r.register("durationMinutes")} />
          {re.durationMinutes && <p className="field-error">{re.durationMinutes.message}</p>}
        </div>
        <div>
          <label htmlFor="rs-room" className="field-label">
            Room
          </label>
          <select id="rs-room" className="field-input" {...r.register("roomId")}>
            <option value="">Choose a room</option>
            {rooms.map((x) => (
              <option key={x.id} value={x.id}>
                {x.name}
              </option>
            ))}
          </select>
          {re.roomId && <p className="field-error">{re.roomId.message}</p>}
        </div>
        {instructors.kind === "list" ? (
          <div className="sm:col-span-2">
            <label htmlFor="rs-instructor" className="field-label">
              Instructor
            </label>
            <select id="rs-instructor" className="field-input" {...r.register("instructorId")}>
              {instructors.rows.map((i) => (
                <option key={i.id} value={i.id}>
                  {i.name}
                </option>
              ))}
            </select>
          </div>
        ) : (
          <SearchPicker
            className="sm:col-span-2"
            id="rs-instructor"
            name="instructorId"
            label="Instructor"
            endpoint="/api/directory/instructors"
            params={{ purpose: "timetable" }}
            initial={{ id: session.instructorId, name: session.instructorName }}
            error={re.instructorId?.message ?? null}
            onChange={(i) => r.setValue("instructorId", i?.id ?? "", { shouldDirty: true })}
          />
        )}
        <div className="sm:col-span-2">
          <button type="submit" className="btn-primary" disabled={r.formState.isSubmitting}>
            Move the session
          </button>
        </div>
      </form>
      <form onSubmit={c.handleSubmit(cancel)} className="card space-y-3" aria-labelledby="cs-title" noValidate>
        <h2 id="cs-title">Cancel</h2>
        <p className="text-ink-soft">
          The session stays on the Timetable and in calendar feeds, marked cancelled, and frees the room, the instructor and the students.
        </p>
        <div>
          <label htmlFor="cs-reason" className="field-label">
            Reason (sent to the students)
          </label>
          <textarea id="cs-reason" rows={3} className="field-input py-2" {...c.register("reason")} />
          {c.formState.errors.reason && <p className="field-error">{c.formState.errors.reason.message}</p>}
        </div>
        <button type="submit" className="btn-quiet border-notyet-600 text-notyet-800" disabled={c.formState.isSubmitting}>
          Cancel the session
        </button>
      </form>
      <div aria-live="polite" className="lg:col-span-2">
        {msg && (
          <p
            role={msg.ok ? "status" : "alert"}
            className={msg.ok ? "font-semibold text-solid-800" : "field-error"}
            data-testid="change-message"
          >
            {msg.text}
          </p>
        )}
      </div>
    </div>
  );
}
