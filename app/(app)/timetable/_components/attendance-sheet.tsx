"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import {
  recordAttendanceSchema,
  amendEntrySchema,
  ATTENDANCE_STATUSES,
  ATTENDANCE_LABELS,
  type AttendanceStatusName,
} from "@/lib/timetable/schema";
import type { AttendanceSheetLine } from "@/db/access/ground-log/attendance-sheet";
import { recordAttendanceAction, amendEntryAction } from "../actions";
import { ScrollArea } from "@/components/ui/scroll-area";
import { rowMessage } from "@/lib/validation/messages";

type In = z.input<typeof recordAttendanceSchema>;
type Out = z.output<typeof recordAttendanceSchema>;

function creditPreview(minutes: number, status: AttendanceStatusName | undefined, late: unknown, early: unknown): number {
  if (!status || status === "absent" || status === "absent_excused") return 0;
  const l = status === "late" ? Number(late) || 0 : 0;
  const e = status === "left_early" ? Number(early) || 0 : 0;
  return Math.max(0, minutes - l - e);
}

/** After a session: each student's attendance and credited minutes; recorded lines are corrected by amendment. */
export function AttendanceSheet({
  sessionId,
  sessionMinutes,
  lines,
}: {
  sessionId: string;
  sessionMinutes: number;
  lines: AttendanceSheetLine[];
}) {
  const router = useRouter();
  const open = lines.filter((l) => !l.entryId);
  const done = lines.filter((l) => l.entryId);
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const [key] = useState(() => `att-${crypto.randomUUID()}`);
  const {
    register,
    handleSubmit,
    control,
    formState: { errors, isSubmitting },
  } = useForm<In, unknown, Out>({
    resolver: zodResolver(recordAttendanceSchema),
    defaultValues: {
      sessionId,
      lines: open.map((l) => ({ studentId: l.studentId, status: "attended", lateMinutes: 0, earlyMinutes: 0, creditedMinutes: "" })),
    },
  });
  const watched = useWatch({ control, name: "lines" });
  async function onSubmit(data: Out) {
    const r = await recordAttendanceAction({ ...data, idempotencyKey: key });
    setMsg(
      r.ok
        ? { ok: true, text: `Recorded ${r.data.recorded} student${r.data.recorded === 1 ? "" : "s"}.` }
        : { ok: false, text: rowMessage(r, (i) => open[i]?.name) },
    );
    if (r.ok) router.refresh();
  }
  return (
    <section className="card space-y-4" aria-labelledby="att-title">
      <h2 id="att-title">Attendance and credited minutes</h2>
      <p className="text-ink-soft">
        Session length {sessionMinutes} min. Late arrival and early departure reduce the minutes credited; an absence earns none and opens
        make-up items for the session&apos;s syllabus items.
      </p>
      {open.length > 0 && (
        <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-3" aria-label="Record attendance">
          {open.map((l, i) => {
            const st = watched?.[i]?.status as AttendanceStatusName | undefined;
            const e = errors.lines?.[i];
            return (
              <fieldset
                key={l.studentId}
                className="grid gap-3 rounded-md border border-paper-edge p-3 sm:grid-cols-[1fr_12rem_8rem_8rem_9rem]"
                data-testid="attendance-line"
              >
                <legend className="px-1 font-semibold">{l.name}</legend>
                <input type="hidden" {...register(`lines.${i}.studentId`)} />
                <div className="sm:col-span-1">
                  <label htmlFor={`st-${i}`} className="field-label">
                    Attendance
                  </label>
                  <select id={`st-${i}`} className="field-input" {...register(`lines.${i}.status`)}>
                    {ATTENDANCE_STATUSES.map((s) => (
                      <option key={s} value={s}>
                        {ATTENDANCE_LABELS[s]}
                      </option>
                    ))}
                  </select>
                </div>
                <div>
                  <label htmlFor={`late-${i}`} className="field-label">
                    Minutes late
                  </label>
                  <input
                    id={`late-${i}`}
                    type="number"
                    min={0}
                    className="field-input num"
                    disabled={st !== "late"}
                    {...register(`lines.${i}.lateMinutes`)}
                  />
                </div>
                <div>
                  <label htmlFor={`early-${i}`} className="field-label">
                    Minutes left early
                  </label>
                  <input
                    id={`early-${i}`}
                    type="number"
                    min={0}
                    className="field-input num"
                    disabled={st !== "left_early"}
                    {...register(`lines.${i}.earlyMinutes`)}
                  />
                </div>
                <div>
                  <label htmlFor={`cr-${i}`} className="field-label">
                    Credited (min)
                  </label>
                  <input
                    id={`cr-${i}`}
                    type="number"
                    min={0}
                    className="field-input num"
                    placeholder={String(creditPreview(sessionMinutes, st, watched?.[i]?.lateMinutes, watched?.[i]?.earlyMinutes))}
                    {...register(`lines.${i}.creditedMinutes`)}
                  />
                </div>
                {e && (
                  <p className="field-error sm:col-span-5">
                    {Object.values(e)
                      .map((x) => (x as { message?: string })?.message)
                      .filter(Boolean)
                      .join("; ")}
                  </p>
                )}
              </fieldset>
            );
          })}
          <button type="submit" className="btn-primary" disabled={isSubmitting}>
            {isSubmitting ? "Recording…" : "Record attendance"}
          </button>
        </form>
      )}
      <div aria-live="polite">
        {msg && (
          <p
            role={msg.ok ? "status" : "alert"}
            className={msg.ok ? "font-semibold text-solid-800" : "field-error"}
            data-testid="attendance-message"
          >
            {msg.text}
          </p>
        )}
      </div>
      {done.length > 0 && (
        <ScrollArea label="Recorded attendance, scrolls sideways">
          <table className="data-table" data-testid="attendance-recorded">
            <caption className="sr-only">Recorded attendance</caption>
            <thead>
              <tr>
                <th scope="col">Student</th>
                <th scope="col">Attendance</th>
                <th scope="col">Credited</th>
                <th scope="col">History</th>
                <th scope="col">Correct</th>
              </tr>
            </thead>
            <tbody>
              {done.map((l) => (
                <tr key={l.studentId}>
                  <td>{l.name}</td>
                  <td>
                    {ATTENDANCE_LABELS[l.status!]}
                    {l.status === "late" ? ` (${l.lateMinutes} min)` : l.status === "left_early" ? ` (${l.earlyMinutes} min early)` : ""}
                  </td>
                  <td className="num">{l.creditedMinutes} min</td>
                  <td className="text-caption">
                    {l.history.length > 1
                      ? l.history.map((h, j) => (
                          <span key={h.entryId} className="block">
                            {j === 0 ? "Recorded" : "Amended"}: {ATTENDANCE_LABELS[h.status]}, {h.creditedMinutes} min by {h.recordedByName}
                            {h.reason ? ` (${h.reason})` : ""}
                          </span>
                        ))
                      : `Recorded by ${l.history[0]?.recordedByName ?? "—"}`}
                  </td>
                  <td>
                    <AmendForm line={l} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollArea>
      )}
    </section>
  );
}

type AIn = z.input<typeof amendEntrySchema>;
type AOut = z.output<typeof amendEntrySchema>;

function AmendForm({ line }: { line: AttendanceSheetLine }) {
  const router = useRouter();
  const [openForm, setOpen] = useState(false);
  const [msg, setMsg] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    resetField,
    formState: { errors, isSubmitting },
  } = useForm<AIn, unknown, AOut>({
    resolver: zodResolver(amendEntrySchema),
    defaultValues: {
      entryId: line.entryId!,
      status: line.status!,
      lateMinutes: line.lateMinutes,
      earlyMinutes: line.earlyMinutes,
      creditedMinutes: "",
      reason: "",
      password: "",
    },
  });
  if (!openForm)
    return (
      <button type="button" className="btn-quiet" onClick={() => setOpen(true)} aria-label={`Correct ${line.name}'s entry`}>
        Correct
      </button>
    );
  async function onSubmit(data: AOut) {
    setMsg(null);
    const r = await amendEntryAction({ ...data, idempotencyKey: `am-${crypto.randomUUID()}` });
    if (r.ok) {
      setOpen(false);
      router.refresh();
      return;
    }
    // a refusal of the password (or the reason) is shown beside its field, the password field emptied
    const field = r.field === "password" || r.field === "reason" ? r.field : null;
    if (field) {
      if (field === "password") resetField("password");
      setError(field, { message: r.fieldErrors?.[field]?.[0] ?? r.message }, { shouldFocus: true });
    } else setMsg(r.message);
  }
  const id = line.studentId;
  return (
    <form onSubmit={handleSubmit(onSubmit)} className="min-w-60 space-y-2" noValidate aria-label={`Correct ${line.name}'s entry`}>
      <div>
        <label htmlFor={`am-st-${id}`} className="field-label">
          Attendance
        </label>
        <select id={`am-st-${id}`} className="field-input" {...register("status")}>
          {ATTENDANCE_STATUSES.map((s) => (
            <option key={s} value={s}>
              {ATTENDANCE_LABELS[s]}
            </option>
          ))}
        </select>
      </div>
      <div className="grid grid-cols-2 gap-2">
        <div>
          <label htmlFor={`am-l-${id}`} className="field-label">
            Min. late
          </label>
          <input id={`am-l-${id}`} type="number" min={0} className="field-input num" {...register("lateMinutes")} />
        </div>
        <div>
          <label htmlFor={`am-e-${id}`} className="field-label">
            Min. early
          </label>
          <input id={`am-e-${id}`} type="number" min={0} className="field-input num" {...register("earlyMinutes")} />
        </div>
      </div>
      <div>
        <label htmlFor={`am-r-${id}`} className="field-label">
          What was wrong
        </label>
        <input id={`am-r-${id}`} className="field-input" {...register("reason")} />
        {errors.reason && <p className="field-error">{errors.reason.message}</p>}
      </div>
      <div>
        <label htmlFor={`am-pw-${id}`} className="field-label">
          Re-enter your password to sign the amendment
        </label>
        <input
          id={`am-pw-${id}`}
          type="password"
          autoComplete="current-password"
          className="field-input"
          aria-invalid={!!errors.password}
          aria-describedby={errors.password ? `am-pw-${id}-error` : undefined}
          {...register("password")}
        />
        {errors.password && (
          <p id={`am-pw-${id}-error`} className="field-error" role="alert">
            {errors.password.message}
          </p>
        )}
      </div>
      {msg && (
        <p role="alert" className="field-error">
          {msg}
        </p>
      )}
      <button type="submit" className="btn-primary" disabled={isSubmitting}>
        Save the amendment
      </button>
    </form>
  );
}
