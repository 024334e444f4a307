"use client";
import { formatNumber } from "@/components/charts/format";
import { memo, useCallback, useMemo, useRef, useState, type Dispatch, type SetStateAction } from "react";
import { useRouter } from "next/navigation";
import type { Chart } from "chart.js";
import { CurveChart, CASE_COLOURS, CURVE_DASH, type ChartExporter, type Concealment } from "@/components/charts/curve-chart";
import { composeExport, downloadCanvas, exportMetaFor } from "@/components/charts/export-png";
import {
  CALL_PROMPTS,
  CONFIGURATION_KEYS,
  CONFIGURATION_LABELS,
  CURVE_KEYS,
  CURVE_LABELS,
  MARKER_KEYS,
  MARKER_LABELS,
  callAnswer,
  defaultSpec,
  formatSpeed,
  speedFromUnit,
  speedInUnit,
  speedUnitLabel,
  type AirframeSnapshot,
  type CallKind,
  type CurveKey,
  type ConfigurationKey,
  type DemoCase,
  type DemoSpec,
} from "@/lib/curve-lab/demo-spec";
import {
  callAnswerFlag,
  caseFigures,
  flaggedLiftToDrag,
  flaggedSpeed,
  whatIf,
  GUST_ABOVE_VMD,
  GUST_BELOW_VMD,
  AXIS_ASSUMPTION,
} from "@/lib/curve-lab/readouts";
import { kgToLb, mToFt, ftToM } from "@/lib/aero";
import { callGap } from "@/lib/curve-lab/call-gap";
import { deleteDemoAction, duplicateDemoAction, makeCallAction, renameDemoAction, saveDemoAction } from "../actions";
import { formatDay } from "@/lib/time";

export interface WorkbenchProps {
  mode: "builder" | "student";
  demoId: string | null;
  demoRevisionId: string | null;
  revisionNumber: number | null;
  name: string;
  initialSpec: DemoSpec;
  /** builder: profiles to build from */
  airframes?: AirframeSnapshot[];
  canChange?: boolean;
  inUse?: boolean;
  /** student: their call on this revision, if made (the page then opens on the result, not the prompt) */
  priorCall?: { predictedMs: number; actualMs: number } | null;
  /** student: their own calls on this demo, newest first (any revision) */
  earlierCalls?: EarlierCall[];
}

export interface EarlierCall {
  id: string;
  revisionNumber: number;
  kind: CallKind;
  predictedMs: number;
  actualMs: number;
  /** the answer's validity words on its revision ("" when valid) */
  answerFlag: string;
  createdAt: string;
}

const CALL_KIND_LABELS: Record<CallKind, string> = { vmd: "Vmd", stall: "Stall speed", gust: "Speed after a gust" };

const fmt = formatNumber;
/** The demo name's limit (as the server's schema, lib/curve-lab/schema.ts). */
const DEMO_NAME_MAX = 120;

function clamp(x: number, lo: number, hi: number) {
  return Math.min(hi, Math.max(lo, x));
}

/** A case's mass carried to another aircraft: the same fraction of the way from empty to maximum mass, in whole kg. */
export function massForNewAirframe(massKg: number, from: AirframeSnapshot, to: AirframeSnapshot): number {
  const span = from.maxMassKg - from.emptyMassKg;
  const f = span > 0 ? clamp((massKg - from.emptyMassKg) / span, 0, 1) : 1;
  if (f === 1) return to.maxMassKg;
  if (f === 0) return to.emptyMassKg;
  return clamp(Math.round(to.emptyMassKg + f * (to.maxMassKg - to.emptyMassKg)), to.emptyMassKg, to.maxMassKg);
}

/** The builder (instructors) and the student's view of a demo: sliders, the live chart, readouts. */
export function DemoWorkbench(props: WorkbenchProps) {
  const { mode } = props;
  const router = useRouter();
  const [spec, setSpec] = useState<DemoSpec>(props.initialSpec);
  const [name, setName] = useState(props.name);
  const [focus, setFocus] = useState(0);
  const [status, setStatus] = useState<{ kind: "ok" | "error"; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  // One idempotency key per form instance (renewed after each success), so a retried submit creates nothing twice.
  const [saveKey, setSaveKey] = useState(() => crypto.randomUUID());
  const [duplicateKey, setDuplicateKey] = useState(() => crypto.randomUUID());
  const [callKey, setCallKey] = useState(() => crypto.randomUUID());
  const chartRef = useRef<Chart | null>(null);
  const exportRef = useRef<ChartExporter | null>(null);
  const [paper, setPaper] = useState(false);
  // thrust held at the chosen speed, per case (a view choice, not saved with the demo)
  const [thrust, setThrust] = useState<boolean[]>([]);
  const toggleThrust = useCallback((i: number, on: boolean) => setThrust((t) => Object.assign([...t], { [i]: on })), []);

  // Call it first (students): conceal the answer until the call is made.
  const callKind: CallKind | null = mode === "student" ? spec.callKind : null;
  const [guessMs, setGuessMs] = useState<number | null>(props.priorCall?.predictedMs ?? null);
  // the answer carries its validity words, taken from the spec the call was made on (the sliders are locked while calling)
  const [answer, setAnswer] = useState<{ predictedMs: number; actualMs: number; flag: string } | null>(() =>
    props.priorCall && callKind ? { ...props.priorCall, flag: callAnswerFlag(spec, callKind) } : null,
  );
  const calling = callKind !== null && answer === null;
  const conceal = useMemo<Concealment | null>(() => {
    if (!calling) return null;
    if (callKind === "vmd") return { regions: true, markers: ["vmd", "vmp", "bestGlide"], curves: ["total", "liftToDrag", "power"] };
    if (callKind === "stall") return { regions: false, markers: ["stall"], curves: [] };
    return { regions: true, markers: ["vmd", "vmp", "bestGlide"], curves: [] };
  }, [calling, callKind]);
  const callSpec = useMemo<DemoSpec>(
    () => (callKind === "gust" ? { ...spec, markers: { ...spec.markers, chosen: true } } : spec),
    [spec, callKind],
  );

  const nameLength = name.trim().length;
  const nameProblem =
    nameLength > DEMO_NAME_MAX ? `Demo name: at most ${DEMO_NAME_MAX} characters (this one has ${nameLength}); shorten it to save.` : null;
  const unit = spec.axis.unit;
  const u = speedUnitLabel(unit);
  const labelsKey = spec.cases.map((c) => c.label).join("\u0000");
  const caseLabels = useMemo(() => labelsKey.split("\u0000"), [labelsKey]);
  const focused = spec.cases[focus] ?? spec.cases[0]!;
  const figures = useMemo(() => caseFigures(spec.airframe, focused, spec.axis.speed), [spec.airframe, focused, spec.axis.speed]);
  const whatIfLines = useMemo(() => whatIf(spec, Math.min(focus, spec.cases.length - 1)), [spec, focus]);

  const updateCase = useCallback((i: number, patch: Partial<DemoCase>) => {
    setSpec((s) => ({ ...s, cases: s.cases.map((c, j) => (j === i ? { ...c, ...patch } : c)) }));
  }, []);

  const locked = calling; // the call is about the saved first case: sliders wait for the reveal
  const configs = useMemo(
    () => CONFIGURATION_KEYS.filter((k) => k === "clean" || spec.airframe.configurations[k] !== null),
    [spec.airframe],
  );

  function chooseAirframe(id: string) {
    const a = props.airframes?.find((x) => x.id === id);
    if (!a) return;
    const fresh = defaultSpec(a);
    setSpec((s) => ({
      ...s,
      airframe: a,
      range: fresh.range,
      chosenSpeedMs: fresh.chosenSpeedMs,
      cases: s.cases.map((c) => ({
        ...c,
        // the mass moves to the same place in the new type's range: the old maximum becomes the new
        // maximum (so a "Max mass" case stays true), the old empty mass the new empty mass
        massKg: massForNewAirframe(c.massKg, s.airframe, a),
        configuration: c.configuration === "clean" || a.configurations[c.configuration] !== null ? c.configuration : "clean",
      })),
    }));
  }

  function addCase() {
    setSpec((s) => {
      if (s.cases.length >= 4) return s;
      const last = s.cases[s.cases.length - 1]!;
      const massKg = clamp(Math.round((s.airframe.emptyMassKg + s.airframe.maxMassKg) / 2), s.airframe.emptyMassKg, s.airframe.maxMassKg);
      return { ...s, cases: [...s.cases, { ...last, label: `Case ${s.cases.length + 1}`, massKg }] };
    });
  }
  const removeCase = useCallback((i: number) => {
    setSpec((s) => (s.cases.length <= 1 ? s : { ...s, cases: s.cases.filter((_, j) => j !== i) }));
    setThrust((t) => t.filter((_, j) => j !== i));
    setFocus(0);
  }, []);

  async function save() {
    if (nameProblem) return setStatus({ kind: "error", text: nameProblem });
    setBusy(true);
    setStatus(null);
    const r = await saveDemoAction({ demoId: props.demoId, name, spec, idempotencyKey: saveKey });
    setBusy(false);
    if (!r.ok) {
      setStatus({ kind: "error", text: r.message });
      return;
    }
    setSaveKey(crypto.randomUUID());
    const d = r.data;
    setStatus({
      kind: "ok",
      text:
        d.newRevision && props.demoId
          ? `Saved as revision ${d.revisionNumber}: students keep the revision they were given.`
          : `Saved (revision ${d.revisionNumber}).`,
    });
    if (!props.demoId) router.replace(`/curve-lab/demos/${d.demoId}`);
    else router.refresh();
  }
  async function rename() {
    if (!props.demoId) return;
    if (nameProblem) return setStatus({ kind: "error", text: nameProblem });
    setBusy(true);
    const r = await renameDemoAction({ demoId: props.demoId, name });
    setBusy(false);
    setStatus(r.ok ? { kind: "ok", text: `Renamed to "${r.data.name}".` } : { kind: "error", text: r.message });
    if (r.ok) router.refresh();
  }
  async function duplicate() {
    if (!props.demoId) return;
    setBusy(true);
    const r = await duplicateDemoAction({ demoId: props.demoId, idempotencyKey: duplicateKey });
    setBusy(false);
    if (!r.ok) return setStatus({ kind: "error", text: r.message });
    setDuplicateKey(crypto.randomUUID());
    router.push(`/curve-lab/demos/${r.data.demoId}`);
  }
  async function remove() {
    if (!props.demoId || !window.confirm(`Delete the demo "${name}"?`)) return;
    setBusy(true);
    const r = await deleteDemoAction({ demoId: props.demoId });
    setBusy(false);
    if (!r.ok) return setStatus({ kind: "error", text: r.message });
    router.push("/curve-lab");
  }

  async function makeCall() {
    if (guessMs === null || !props.demoRevisionId || !callKind) return;
    setBusy(true);
    const r = await makeCallAction({ demoRevisionId: props.demoRevisionId, kind: callKind, predictedMs: guessMs, idempotencyKey: callKey });
    setBusy(false);
    if (!r.ok) return setStatus({ kind: "error", text: r.message });
    setCallKey(crypto.randomUUID());
    // a call already made on this revision (another tab) comes back unchanged: show that one
    setGuessMs(r.data.predictedMs);
    setAnswer({ predictedMs: r.data.predictedMs, actualMs: r.data.actualMs, flag: callAnswerFlag(spec, callKind) });
  }

  function exportPng() {
    const draw = exportRef.current;
    if (!draw) return;
    const { canvas } = composeExport(draw, { ...exportMetaFor(name, spec), note: AXIS_ASSUMPTION }, { light: paper });
    downloadCanvas(canvas, `${name || "demo"}${paper ? " (paper)" : ""}.png`.replace(/[^\w .()-]+/g, "_"));
  }
  async function exportCsv() {
    // each row carries the model's validity words per case (below the stall, above Mach 0.3)
    const [{ toCsv }, { curvesTable }] = await Promise.all([import("@/lib/csv"), import("@/lib/curve-lab/curves-csv")]);
    const { header, rows } = curvesTable(spec);
    const blob = new Blob([toCsv(header, rows)], { type: "text/csv;charset=utf-8" });
    const a = document.createElement("a");
    a.href = URL.createObjectURL(blob);
    a.download = `${name || "demo"}.csv`.replace(/[^\w .-]+/g, "_");
    a.click();
    setTimeout(() => URL.revokeObjectURL(a.href), 1000);
  }

  const rangeMin = speedInUnit(spec.range.minSpeedMs, unit);
  const rangeMax = speedInUnit(spec.range.maxSpeedMs, unit);
  const step = unit === "kt" ? 1 : 0.5;

  return (
    <div className="space-y-4">
      {mode === "builder" && (
        <section aria-label="Demo" className="card flex flex-wrap items-end gap-3">
          <div className="min-w-56 flex-1">
            <label htmlFor="demo-name" className="field-label">
              Demo name
            </label>
            {/* no maxLength: a pasted name is never cut silently; over the limit it is refused with a message */}
            <input
              id="demo-name"
              className="field-input"
              value={name}
              aria-invalid={nameProblem !== null}
              aria-describedby={nameProblem ? "demo-name-error" : undefined}
              onChange={(e) => setName(e.target.value)}
            />
            {nameProblem && (
              <p id="demo-name-error" className="field-error" data-testid="demo-name-error">
                {nameProblem}
              </p>
            )}
          </div>
          {props.airframes && (
            <div className="min-w-56">
              <label htmlFor="demo-airframe" className="field-label">
                Airframe
              </label>
              <select
                id="demo-airframe"
                className="field-input"
                value={spec.airframe.id ?? ""}
                onChange={(e) => chooseAirframe(e.target.value)}
              >
                {spec.airframe.id && !props.airframes.some((a) => a.id === spec.airframe.id) && (
                  <option value={spec.airframe.id}>{spec.airframe.name} (as saved)</option>
                )}
                {props.airframes.map((a) => (
                  <option key={a.id} value={a.id ?? ""}>
                    {a.name}
                  </option>
                ))}
              </select>
            </div>
          )}
          {props.canChange !== false && (
            <button type="button" className="btn-primary" onClick={save} disabled={busy} data-testid="save-demo">
              Save
            </button>
          )}
          {props.demoId && props.canChange !== false && (
            <button type="button" className="btn-quiet" onClick={rename} disabled={busy}>
              Rename
            </button>
          )}
          {props.demoId && (
            <button type="button" className="btn-quiet" onClick={duplicate} disabled={busy}>
              Duplicate
            </button>
          )}
          {props.demoId && props.canChange !== false && (
            <button
              type="button"
              className="btn-quiet"
              onClick={remove}
              disabled={busy || props.inUse}
              title={props.inUse ? "In use: kept for the students and briefings that use it" : undefined}
            >
              Delete
            </button>
          )}
          {props.demoId && (
            <a className="btn-quiet" href={`/curve-lab/demos/${props.demoId}/projector`}>
              Projector view
            </a>
          )}
          <p aria-live="polite" className="basis-full text-caption" data-testid="demo-status">
            {status && <span className={status.kind === "error" ? "font-semibold text-notyet-800" : "text-solid-800"}>{status.text}</span>}
            {!status && props.inUse && props.revisionNumber !== null && (
              <span className="text-ink-soft">
                Revision {props.revisionNumber}, in use: saving makes a new revision so students keep what was taught.
              </span>
            )}
          </p>
        </section>
      )}

      {mode === "student" && callKind !== null && (
        <section aria-labelledby="call-h" className="card space-y-3 border-wing-500" data-testid="call-it-first">
          <h2 id="call-h">Call it first</h2>
          <p>{CALL_PROMPTS[callKind]} Place your marker: drag the slider, type a speed, or click on the chart.</p>
          <div className="flex flex-wrap items-end gap-3">
            <div className="min-w-64 flex-1">
              <label htmlFor="call-slider" className="field-label">
                Your call ({u})
              </label>
              <input
                id="call-slider"
                type="range"
                className="mt-2 block min-h-touch w-full"
                min={rangeMin}
                max={rangeMax}
                step={step}
                disabled={!calling}
                value={guessMs === null ? (rangeMin + rangeMax) / 2 : speedInUnit(guessMs, unit)}
                onChange={(e) => setGuessMs(speedFromUnit(Number(e.target.value), unit))}
              />
            </div>
            <div className="w-32">
              <label htmlFor="call-number" className="field-label">
                Speed ({u})
              </label>
              <input
                id="call-number"
                type="number"
                className="field-input num"
                min={rangeMin}
                max={rangeMax}
                step={step}
                disabled={!calling}
                value={guessMs === null ? "" : Number(speedInUnit(guessMs, unit).toFixed(1))}
                onChange={(e) => setGuessMs(e.target.value === "" ? null : speedFromUnit(Number(e.target.value), unit))}
              />
            </div>
            <button
              type="button"
              className="btn-primary"
              disabled={!calling || guessMs === null || busy}
              onClick={makeCall}
              data-testid="make-call"
            >
              Call it and reveal
            </button>
          </div>
          <div aria-live="polite" data-testid="call-result">
            {answer && <CallResult predictedMs={answer.predictedMs} actualMs={answer.actualMs} flag={answer.flag} unit={unit} />}
          </div>
          {props.earlierCalls && props.earlierCalls.length > 0 && (
            <div>
              <h3 className="field-label">Your calls on this demo</h3>
              <ul className="space-y-1 text-caption" data-testid="own-calls">
                {props.earlierCalls.map((c) => {
                  const g = callGap(c.predictedMs, c.actualMs, unit);
                  return (
                    <li key={c.id} className="num">
                      Revision {c.revisionNumber}, {CALL_KIND_LABELS[c.kind]}: your call {g.call}, answer {g.answer}
                      {c.answerFlag ? ` (${c.answerFlag})` : ""},{" "}
                      {g.direction === "on the answer" ? "on the answer" : `${g.gap} ${g.direction}`} · {formatDay(new Date(c.createdAt))}
                    </li>
                  );
                })}
              </ul>
            </div>
          )}
        </section>
      )}

      <div className="grid grid-cols-1 gap-4 lg:grid-cols-[minmax(0,1fr)_20rem]">
        <section aria-label="Chart" className="min-w-0 space-y-2 rounded-card bg-board-900 p-3 text-chalk">
          <CurveChart
            spec={callSpec}
            focus={Math.min(focus, spec.cases.length - 1)}
            variant="desk"
            conceal={conceal}
            guessMs={callKind ? guessMs : null}
            answerMs={answer ? answer.actualMs : null}
            onPickSpeed={calling ? setGuessMs : undefined}
            chartRef={chartRef}
            exportRef={exportRef}
            thrust={thrust}
            className="h-[26rem] w-full min-w-0 overflow-hidden"
            label={`Drag against ${spec.axis.speed === "true" ? "TAS" : "EAS"} for ${spec.cases.map((c) => c.label).join(", ")}`}
          />
          <Legend labels={caseLabels} curves={spec.curves} hidden={conceal?.curves ?? NO_CURVES} />
          <p className="text-caption text-chalk-dim">{AXIS_ASSUMPTION}</p>
          <div className="flex flex-wrap gap-2">
            <button
              type="button"
              className="btn border border-board-600 text-chalk hover:bg-board-700"
              onClick={exportPng}
              disabled={calling}
            >
              Export chart (PNG)
            </button>
            <label className="flex min-h-touch items-center gap-2 text-caption">
              <input
                type="checkbox"
                className="h-5 w-5"
                checked={paper}
                onChange={(e) => setPaper(e.target.checked)}
                data-testid="export-paper"
              />
              White background, for printing
            </label>
            <button
              type="button"
              className="btn border border-board-600 text-chalk hover:bg-board-700"
              onClick={exportCsv}
              disabled={calling}
            >
              Export data (CSV)
            </button>
          </div>
        </section>

        <aside className="space-y-3" aria-label="Readouts">
          {!calling ? (
            <section className="card space-y-1" aria-labelledby="readouts-h">
              <h2 id="readouts-h">{focused.label}</h2>
              <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 num">
                <dt>Vmd</dt>
                <dd data-testid="readout-vmd">{flaggedSpeed(figures.vmdMs, unit, figures.flags.vmd)}</dd>
                <dt>Vmp</dt>
                <dd data-testid="readout-vmp">{flaggedSpeed(figures.vmpMs, unit, figures.flags.vmp)}</dd>
                <dt>Stall</dt>
                <dd data-testid="readout-stall">
                  {flaggedSpeed(figures.stallMs, unit, figures.flags.stall)} ({CONFIGURATION_LABELS[focused.configuration].toLowerCase()})
                </dd>
                <dt>(L/D)max</dt>
                <dd>{flaggedLiftToDrag(figures)}</dd>
                <dt>Best glide</dt>
                <dd>
                  {flaggedSpeed(figures.bestGlideMs, unit, figures.flags.bestGlide)}, {fmt(figures.glideRatio, 1)}:1
                </dd>
              </dl>
              <p className="text-caption text-ink-soft">Speeds as {spec.axis.speed === "true" ? "TAS" : "EAS (IAS = CAS = EAS here)"}.</p>
            </section>
          ) : (
            <section className="card">
              <p>Readouts appear after your call.</p>
            </section>
          )}
          {!calling && (
            <section className="card space-y-1" aria-labelledby="whatif-h">
              <h2 id="whatif-h">What if</h2>
              <ul className="list-disc space-y-1 pl-5" data-testid="what-if">
                {whatIfLines.map((l) => (
                  <li key={l}>{l}</li>
                ))}
              </ul>
            </section>
          )}
          {!calling && (
            <section className="space-y-2" aria-label="What a gust does">
              <p className="rounded-md border-l-4 border-unstable-500 bg-unstable-100 p-2 text-caption">
                <strong>Below Vmd: speed-unstable.</strong> {GUST_BELOW_VMD}
              </p>
              <p className="rounded-md border-l-4 border-stable-500 bg-stable-100 p-2 text-caption">
                <strong>Above Vmd: speed-stable.</strong> {GUST_ABOVE_VMD}
              </p>
            </section>
          )}
        </aside>
      </div>

      <section aria-labelledby="cases-h" className="card space-y-3">
        <div className="flex flex-wrap items-center justify-between gap-2">
          <h2 id="cases-h">Cases</h2>
          {mode === "builder" && (
            <button type="button" className="btn-quiet" onClick={addCase} disabled={spec.cases.length >= 4}>
              Add case
            </button>
          )}
        </div>
        {locked && <p className="text-caption text-ink-soft">The sliders unlock after your call.</p>}
        <div className="grid gap-3 md:grid-cols-2">
          {spec.cases.map((c, i) => (
            <CaseEditor
              key={i}
              index={i}
              c={c}
              airframe={spec.airframe}
              configs={configs}
              mode={mode}
              locked={locked}
              focused={focus === i}
              thrust={thrust[i] ?? false}
              onThrust={toggleThrust}
              canRemove={mode === "builder" && spec.cases.length > 1}
              onChange={updateCase}
              onFocus={setFocus}
              onRemove={removeCase}
            />
          ))}
        </div>
      </section>

      <ShowPanel
        curves={spec.curves}
        markers={spec.markers}
        axis={spec.axis}
        range={spec.range}
        chosenSpeedMs={spec.chosenSpeedMs}
        callKind={spec.callKind}
        notes={spec.notes}
        mode={mode}
        locked={locked}
        setSpec={setSpec}
        answerText={
          mode === "builder" && spec.callKind
            ? flaggedSpeed(callAnswer(spec, spec.callKind), unit, callAnswerFlag(spec, spec.callKind))
            : null
        }
      />
    </div>
  );
}

/** The reveal: the call, the answer and the gap between the two numbers as shown. */
function CallResult({ predictedMs, actualMs, flag, unit }: { predictedMs: number; actualMs: number; flag: string; unit: "kt" | "ms" }) {
  const g = callGap(predictedMs, actualMs, unit);
  return (
    <p className="text-lead">
      Your call <span className="num font-semibold">{g.call}</span> · answer <span className="num font-semibold">{g.answer}</span>
      {flag && <span data-testid="call-answer-flag"> ({flag})</span>} ·{" "}
      {g.direction === "on the answer" ? (
        <span className="font-semibold">right on the answer</span>
      ) : (
        <>
          you were{" "}
          <span className="num font-semibold">
            {g.gap} {g.direction}
          </span>
        </>
      )}
      .
    </p>
  );
}

interface CaseEditorProps {
  index: number;
  c: DemoCase;
  airframe: AirframeSnapshot;
  configs: ConfigurationKey[];
  mode: "builder" | "student";
  locked: boolean;
  focused: boolean;
  thrust: boolean;
  onThrust: (i: number, on: boolean) => void;
  canRemove: boolean;
  onChange: (i: number, patch: Partial<DemoCase>) => void;
  onFocus: (i: number) => void;
  onRemove: (i: number) => void;
}

/** One case's sliders; memoised so moving one case's slider re-renders only that case. */
const CaseEditor = memo(function CaseEditor({
  index,
  c,
  airframe,
  configs,
  mode,
  locked,
  focused,
  thrust,
  onThrust,
  canRemove,
  onChange,
  onFocus,
  onRemove,
}: CaseEditorProps) {
  return (
    <fieldset className="space-y-2 rounded-md border border-paper-edge p-3" data-testid={`case-${index}`}>
      <legend className="px-1 font-semibold">
        <span
          aria-hidden="true"
          className="mr-2 inline-block h-3 w-3 rounded-full align-middle"
          style={{ background: CASE_COLOURS[index], outline: "1px solid #414a5c" }}
        />
        Case {index + 1}
      </legend>
      <div className="flex flex-wrap items-end gap-2">
        <label className="flex min-h-touch items-center gap-2 text-caption">
          <input type="radio" name="focus" checked={focused} onChange={() => onFocus(index)} className="h-5 w-5" /> Spotlight (its readouts
          and speed regions)
        </label>
        <label className="flex min-h-touch items-center gap-2 text-caption">
          <input
            type="checkbox"
            checked={thrust}
            disabled={locked}
            onChange={(e) => onThrust(index, e.target.checked)}
            className="h-5 w-5"
            data-testid={`thrust-${index}`}
          />{" "}
          Thrust line (held at the chosen speed)
        </label>
        {canRemove && (
          <button type="button" className="btn-quiet" onClick={() => onRemove(index)}>
            Remove case {index + 1}
          </button>
        )}
      </div>
      {mode === "builder" && (
        <div>
          <label htmlFor={`label-${index}`} className="field-label">
            Label
          </label>
          <input
            id={`label-${index}`}
            className="field-input"
            maxLength={40}
            value={c.label}
            onChange={(e) => onChange(index, { label: e.target.value })}
          />
        </div>
      )}
      <div>
        <label htmlFor={`mass-${index}`} className="field-label">
          Mass, case {index + 1}:{" "}
          <span className="num">
            {fmt(c.massKg)} kg ({fmt(kgToLb(c.massKg))} lb)
          </span>
        </label>
        <input
          id={`mass-${index}`}
          data-testid={`mass-${index}`}
          type="range"
          className="mt-1 block min-h-touch w-full"
          disabled={locked}
          min={Math.floor(airframe.emptyMassKg)}
          max={Math.ceil(airframe.maxMassKg)}
          step={1}
          value={c.massKg}
          aria-valuetext={`${fmt(c.massKg)} kg (${fmt(kgToLb(c.massKg))} lb)`}
          onChange={(e) => onChange(index, { massKg: clamp(Number(e.target.value), airframe.emptyMassKg, airframe.maxMassKg) })}
        />
      </div>
      <div>
        <label htmlFor={`alt-${index}`} className="field-label">
          Pressure altitude, case {index + 1}: <span className="num">{fmt(mToFt(c.altitudeM))} ft</span>
        </label>
        <input
          id={`alt-${index}`}
          type="range"
          className="mt-1 block min-h-touch w-full"
          disabled={locked}
          min={0}
          max={14000}
          step={100}
          value={Math.round(mToFt(c.altitudeM) / 100) * 100}
          aria-valuetext={`${fmt(mToFt(c.altitudeM))} ft`}
          onChange={(e) => onChange(index, { altitudeM: ftToM(Number(e.target.value)) })}
        />
      </div>
      <div>
        <label htmlFor={`isa-${index}`} className="field-label">
          ISA deviation, case {index + 1}:{" "}
          <span className="num">
            {c.isaDeviationK > 0 ? "+" : ""}
            {fmt(c.isaDeviationK)} K
          </span>
        </label>
        <input
          id={`isa-${index}`}
          type="range"
          className="mt-1 block min-h-touch w-full"
          disabled={locked}
          min={-30}
          max={30}
          step={1}
          value={c.isaDeviationK}
          onChange={(e) => onChange(index, { isaDeviationK: Number(e.target.value) })}
        />
      </div>
      <div>
        <label htmlFor={`conf-${index}`} className="field-label">
          Configuration, case {index + 1}
        </label>
        <select
          id={`conf-${index}`}
          className="field-input"
          disabled={locked}
          value={c.configuration}
          onChange={(e) => onChange(index, { configuration: e.target.value as ConfigurationKey })}
        >
          {configs.map((k) => (
            <option key={k} value={k}>
              {CONFIGURATION_LABELS[k]}
            </option>
          ))}
        </select>
      </div>
    </fieldset>
  );
});

interface ShowPanelProps {
  curves: DemoSpec["curves"];
  markers: DemoSpec["markers"];
  axis: DemoSpec["axis"];
  range: DemoSpec["range"];
  chosenSpeedMs: number;
  callKind: CallKind | null;
  notes: string;
  mode: "builder" | "student";
  locked: boolean;
  setSpec: Dispatch<SetStateAction<DemoSpec>>;
  answerText: string | null;
}

/** What the chart shows (curves, markers, axis, range, Call it first, notes); memoised so a mass slider does not re-render it. */
const ShowPanel = memo(function ShowPanel({
  curves,
  markers,
  axis,
  range,
  chosenSpeedMs,
  callKind,
  notes,
  mode,
  locked,
  setSpec,
  answerText,
}: ShowPanelProps) {
  const unit = axis.unit;
  const u = speedUnitLabel(unit);
  const rangeMin = speedInUnit(range.minSpeedMs, unit);
  const rangeMax = speedInUnit(range.maxSpeedMs, unit);
  const step = unit === "kt" ? 1 : 0.5;
  return (
    <section aria-labelledby="show-h" className="card space-y-3">
      <h2 id="show-h">What the chart shows</h2>
      <div className="grid gap-4 md:grid-cols-3">
        <fieldset>
          <legend className="field-label">Curves</legend>
          {CURVE_KEYS.map((k) => (
            <label key={k} className="flex min-h-touch items-center gap-2">
              <input
                type="checkbox"
                className="h-5 w-5"
                checked={curves[k] ?? false}
                disabled={locked}
                onChange={(e) => setSpec((s) => ({ ...s, curves: { ...s.curves, [k]: e.target.checked } }))}
              />
              {CURVE_LABELS[k]}
            </label>
          ))}
        </fieldset>
        <fieldset>
          <legend className="field-label">Markers</legend>
          {MARKER_KEYS.map((k) => (
            <label key={k} className="flex min-h-touch items-center gap-2">
              <input
                type="checkbox"
                className="h-5 w-5"
                checked={markers[k] ?? false}
                disabled={locked}
                onChange={(e) => setSpec((s) => ({ ...s, markers: { ...s.markers, [k]: e.target.checked } }))}
              />
              {MARKER_LABELS[k]}
            </label>
          ))}
        </fieldset>
        <div className="space-y-2">
          <fieldset>
            <legend className="field-label">Speed axis</legend>
            <div className="flex flex-wrap gap-3">
              {(["equivalent", "true"] as const).map((v) => (
                <label key={v} className="flex min-h-touch items-center gap-2">
                  <input
                    type="radio"
                    name="axis-speed"
                    className="h-5 w-5"
                    checked={axis.speed === v}
                    disabled={locked}
                    onChange={() => setSpec((s) => ({ ...s, axis: { ...s.axis, speed: v } }))}
                  />
                  {v === "true" ? "TAS" : "IAS/EAS"}
                </label>
              ))}
              {(["kt", "ms"] as const).map((v) => (
                <label key={v} className="flex min-h-touch items-center gap-2">
                  <input
                    type="radio"
                    name="axis-unit"
                    className="h-5 w-5"
                    checked={axis.unit === v}
                    disabled={locked}
                    onChange={() => setSpec((s) => ({ ...s, axis: { ...s.axis, unit: v } }))}
                  />
                  {speedUnitLabel(v)}
                </label>
              ))}
            </div>
          </fieldset>
          <div className="grid grid-cols-2 gap-2">
            <div>
              <label htmlFor="range-min" className="field-label">
                From ({u})
              </label>
              <input
                id="range-min"
                type="number"
                className="field-input num"
                disabled={locked}
                min={1}
                step={step}
                value={Number(rangeMin.toFixed(1))}
                onChange={(e) => {
                  const v = speedFromUnit(Number(e.target.value), unit);
                  if (v >= 1 && v < range.maxSpeedMs) setSpec((s) => ({ ...s, range: { ...s.range, minSpeedMs: v } }));
                }}
              />
            </div>
            <div>
              <label htmlFor="range-max" className="field-label">
                To ({u})
              </label>
              <input
                id="range-max"
                type="number"
                className="field-input num"
                disabled={locked}
                step={step}
                value={Number(rangeMax.toFixed(1))}
                onChange={(e) => {
                  const v = speedFromUnit(Number(e.target.value), unit);
                  if (v > range.minSpeedMs && v <= 500) setSpec((s) => ({ ...s, range: { ...s.range, maxSpeedMs: v } }));
                }}
              />
            </div>
          </div>
          <div>
            <label htmlFor="chosen" className="field-label">
              Chosen speed: <span className="num">{formatSpeed(chosenSpeedMs, unit)}</span>
            </label>
            <input
              id="chosen"
              type="range"
              className="mt-1 block min-h-touch w-full"
              disabled={locked}
              min={rangeMin}
              max={rangeMax}
              step={step}
              value={speedInUnit(chosenSpeedMs, unit)}
              onChange={(e) => setSpec((s) => ({ ...s, chosenSpeedMs: speedFromUnit(Number(e.target.value), unit) }))}
            />
          </div>
        </div>
      </div>
      {mode === "builder" && (
        <div className="grid gap-3 md:grid-cols-[16rem_1fr]">
          <div>
            <label htmlFor="call-kind" className="field-label">
              Call it first (students)
            </label>
            <select
              id="call-kind"
              className="field-input"
              value={callKind ?? ""}
              onChange={(e) => setSpec((s) => ({ ...s, callKind: e.target.value === "" ? null : (e.target.value as CallKind) }))}
            >
              <option value="">No call</option>
              <option value="vmd">Where is Vmd?</option>
              <option value="stall">Where is the stall speed?</option>
              <option value="gust">Where does the speed settle after a gust?</option>
            </select>
            {answerText && (
              <p className="mt-1 text-caption text-ink-soft">
                Answer for case 1 now: <span className="num">{answerText}</span>
              </p>
            )}
          </div>
          <div>
            <label htmlFor="notes" className="field-label">
              Teaching notes
            </label>
            <textarea
              id="notes"
              className="field-input min-h-24 py-2"
              maxLength={4000}
              value={notes}
              onChange={(e) => setSpec((s) => ({ ...s, notes: e.target.value }))}
            />
          </div>
        </div>
      )}
      {mode === "student" && notes && (
        <div>
          <h3 className="field-label">Notes from your instructor</h3>
          <p className="whitespace-pre-wrap">{notes}</p>
        </div>
      )}
    </section>
  );
});

const NO_CURVES: CurveKey[] = [];

/** The chart's legend: each case's colour with each drawn curve's dash; memoised (labels rarely change). */
const Legend = memo(function Legend({ labels, curves, hidden }: { labels: string[]; curves: DemoSpec["curves"]; hidden: CurveKey[] }) {
  return (
    <ul className="flex flex-wrap gap-x-4 gap-y-1 text-caption" aria-label="Legend">
      {labels.map((label, i) =>
        CURVE_KEYS.filter((k) => curves[k] && !hidden.includes(k)).map((k) => (
          <li key={`${i}-${k}`} className="flex items-center gap-2">
            <svg width="28" height="8" aria-hidden="true">
              <line
                x1="0"
                y1="4"
                x2="28"
                y2="4"
                stroke={CASE_COLOURS[i]}
                strokeWidth={k === "total" ? 3.5 : 2.5}
                strokeDasharray={CURVE_DASH[k].join(" ")}
              />
            </svg>
            {label}: {CURVE_LABELS[k]}
          </li>
        )),
      )}
    </ul>
  );
});
