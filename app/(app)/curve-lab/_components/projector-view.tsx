"use client";
import { useEffect, useMemo, useRef, useState, useSyncExternalStore } from "react";
import { createPortal } from "react-dom";
import { CurveChart, CASE_COLOURS } from "@/components/charts/curve-chart";
import { CURVE_LABELS, MARKER_KEYS, type CurveKey, type DemoSpec } from "@/lib/curve-lab/demo-spec";
import { caseFigures, flaggedLiftToDrag, flaggedSpeed, AXIS_ASSUMPTION } from "@/lib/curve-lab/readouts";
import { Caution } from "@/components/caution";

const CURVE_SHORTCUTS: [string, CurveKey][] = [
  ["t", "total"],
  ["z", "zeroLift"],
  ["l", "liftDependent"],
  ["i", "idealInduced"],
  ["n", "increment"],
  ["p", "power"],
  ["g", "liftToDrag"],
];

const noSubscription = () => () => undefined;
/** Set once the key list has been seen: it opens by itself only the first time. */
const KEYS_SEEN = "chalkwing.projector.keys-seen";

/** Full-screen teaching view: the board, big type, thick lines, keyboard only, no editing chrome. */
export function ProjectorView({ name, spec: saved, backHref }: { name: string; spec: DemoSpec; backHref: string }) {
  const [focus, setFocus] = useState(0);
  const [allCases, setAllCases] = useState(true);
  const [curves, setCurves] = useState(saved.curves);
  const [markers, setMarkers] = useState(true);
  const [regions, setRegions] = useState(true);
  const [thrust, setThrust] = useState<boolean[]>([]);
  // the key list opens by itself on the first visit only (nothing renders before mount, so no hydration mismatch)
  const [keysOpen, setKeysOpen] = useState(() => {
    try {
      return typeof window !== "undefined" && !window.localStorage.getItem(KEYS_SEEN);
    } catch {
      return true;
    }
  });
  const root = useRef<HTMLDivElement>(null);
  const focusRef = useRef(0);
  useEffect(() => {
    focusRef.current = focus;
  }, [focus]);

  const spec = useMemo<DemoSpec>(() => {
    const cases = allCases ? saved.cases : [saved.cases[focus] ?? saved.cases[0]!];
    return { ...saved, cases, curves };
  }, [saved, allCases, focus, curves]);
  const chartFocus = allCases ? focus : 0;
  const chartThrust = useMemo(() => (allCases ? thrust : [thrust[focus] ?? false]), [allCases, thrust, focus]);
  const conceal = useMemo(
    () => (markers && regions ? null : { regions: !regions, markers: markers ? [] : [...MARKER_KEYS], curves: [] }),
    [markers, regions],
  );

  // Rendered over everything, straight into <body>; the app shell behind it is made inert so
  // keyboard focus cannot wander into hidden navigation.
  const mounted = useSyncExternalStore(
    noSubscription,
    () => true,
    () => false,
  );
  const host = mounted ? document.body : null;
  useEffect(() => {
    if (!host || !root.current) return;
    const others = Array.from(host.children).filter(
      (el): el is HTMLElement => el instanceof HTMLElement && el !== root.current && !el.inert,
    );
    for (const el of others) el.inert = true;
    root.current.focus();
    try {
      window.localStorage.setItem(KEYS_SEEN, "1");
    } catch {
      // storage refused (private window): the list simply opens again next time
    }
    return () => {
      for (const el of others) el.inert = false;
    };
  }, [host]);

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (e.altKey || e.ctrlKey || e.metaKey) return;
      const k = e.key.toLowerCase();
      const n = saved.cases.length;
      if (k === "arrowright" || k === " ") setFocus((f) => (f + 1) % n);
      else if (k === "arrowleft") setFocus((f) => (f - 1 + n) % n);
      else if (/^[1-4]$/.test(k) && Number(k) <= n) setFocus(Number(k) - 1);
      else if (k === "a") setAllCases((v) => !v);
      else if (k === "m") setMarkers((v) => !v);
      else if (k === "r") setRegions((v) => !v);
      else if (k === "k" || k === "?") setKeysOpen((v) => !v);
      else if (k === "escape") setKeysOpen(false);
      else if (k === "h") setFocusThrust();
      else if (k === "f") {
        if (document.fullscreenElement) void document.exitFullscreen();
        else void root.current?.requestFullscreen?.().catch(() => undefined);
      } else if (k === "q") window.location.assign(backHref);
      else {
        const hit = CURVE_SHORTCUTS.find(([key]) => key === k);
        if (!hit) return;
        setCurves((c) => ({ ...c, [hit[1]]: !c[hit[1]] }));
      }
      e.preventDefault();
    };
    const setFocusThrust = () => {
      const f = focusRef.current;
      setThrust((t) => Object.assign([...t], { [f]: !t[f] }));
    };
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [saved.cases.length, backHref]);

  const c = saved.cases[focus] ?? saved.cases[0]!;
  const fig = caseFigures(saved.airframe, c, saved.axis.speed);
  const unit = saved.axis.unit;

  if (!host) return null;
  return createPortal(
    <div
      ref={root}
      tabIndex={0}
      role="region"
      aria-label="Projector view"
      data-testid="projector"
      className="fixed inset-0 z-50 flex flex-col gap-2 overflow-hidden bg-board-950 px-5 py-3 text-[22px] leading-snug text-chalk outline-none [@media(min-height:1000px)]:gap-3 [@media(min-height:1000px)]:p-6 [@media(min-height:1000px)]:text-[28px]"
    >
      <header className="flex flex-wrap items-baseline justify-between gap-x-8 gap-y-1">
        <h1 className="line-clamp-2 min-w-0 pb-1 text-[32px] leading-[1.3] font-bold [overflow-wrap:anywhere] [@media(min-height:1000px)]:text-[40px]">
          {name}
        </h1>
        <p className="flex flex-wrap items-baseline gap-x-6 text-[28px]" data-testid="projector-readout">
          <span>
            <span
              aria-hidden="true"
              className="mr-2 inline-block h-5 w-5 rounded-full align-middle"
              style={{ background: CASE_COLOURS[focus] }}
            />
            {c.label}
          </span>
          <span className="num" data-testid="projector-vmd">
            Vmd {flaggedSpeed(fig.vmdMs, unit, fig.flags.vmd)}
          </span>
          <span className="num" data-testid="projector-vmp">
            Vmp {flaggedSpeed(fig.vmpMs, unit, fig.flags.vmp)}
          </span>
          <span className="num">stall {flaggedSpeed(fig.stallMs, unit, fig.flags.stall)}</span>
          <span className="num">(L/D)max {flaggedLiftToDrag(fig)}</span>
        </p>
      </header>
      <div className="relative min-h-0 flex-1">
        <CurveChart
          spec={spec}
          focus={chartFocus}
          variant="projector"
          conceal={conceal}
          thrust={chartThrust}
          className="h-full w-full"
          label={`Drag against speed, ${name}`}
        />
        {keysOpen && (
          <section
            aria-label="Keys"
            className="absolute top-2 right-2 max-h-[calc(100%-1rem)] overflow-hidden rounded-card border-2 border-board-600 bg-board-950/95 p-3 text-[20px] leading-tight [@media(min-height:1000px)]:text-[24px]"
            data-testid="key-legend"
          >
            <h2 className="mb-1 font-bold">Keys (K hides this list)</h2>
            <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-0.5 xl:grid-cols-[auto_1fr_auto_1fr]">
              <dt className="font-mono">← →</dt>
              <dd>step through the cases</dd>
              <dt className="font-mono">1–4</dt>
              <dd>go to a case</dd>
              <dt className="font-mono">A</dt>
              <dd>all cases / this case only</dd>
              {CURVE_SHORTCUTS.map(([k, curve]) => (
                <div key={k} className="contents">
                  <dt className="font-mono">{k.toUpperCase()}</dt>
                  <dd>
                    {CURVE_LABELS[curve]} {curves[curve] ? "on" : "off"}
                  </dd>
                </div>
              ))}
              <dt className="font-mono">H</dt>
              <dd>thrust line, this case, {thrust[focus] ? "on" : "off"}</dd>
              <dt className="font-mono">M</dt>
              <dd>markers {markers ? "on" : "off"}</dd>
              <dt className="font-mono">R</dt>
              <dd>stable/unstable regions {regions ? "on" : "off"}</dd>
              <dt className="font-mono">F</dt>
              <dd>full screen</dd>
              <dt className="font-mono">K</dt>
              <dd>show or hide this list</dd>
              <dt className="font-mono">Q</dt>
              <dd>leave the Projector view</dd>
            </dl>
          </section>
        )}
      </div>
      <footer className="space-y-0.5">
        <p>
          <strong className="text-[#f2c27a]">Below Vmd, speed-unstable:</strong> a gust&apos;s speed change grows.{" "}
          <strong className="text-[#8fe0d4]">Above Vmd, speed-stable:</strong> the speed comes back.
        </p>
        <p className="text-[18px] text-chalk-dim [@media(min-height:1000px)]:text-[22px]">
          {AXIS_ASSUMPTION} <span className="text-chalk">K: keys.</span>
        </p>
        <Caution className="text-[18px]! leading-snug! [@media(min-height:1000px)]:text-[22px]!" />
      </footer>
    </div>,
    host,
  );
}
