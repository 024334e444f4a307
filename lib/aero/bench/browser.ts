/**
 * The browser figure of `npm run bench` (Curve Lab): in headless Chromium against a production
 * build, the time from a slider input event to the chart's finished redraw (four cases, 400
 * points each) and its ratio to chart.js redrawing the same datasets with no app code around it,
 * measured in the same run; plus the builder page's cold-load JavaScript (compressed bytes).
 *
 * The server: CHALKWING_BENCH_URL reuses a running production server (with the demo seed); else
 * the bench makes its own database (chalkwing_bench), builds into .next-test-bench and starts on
 * BENCH_PORT (default 3290), and stops it at the end.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { defaultSpec, type AirframeSnapshot, type DemoSpec } from "../../curve-lab/demo-spec";
import { fillFrame, newFrame, datasetIndex, type Frame } from "../../curve-lab/chart-frame";
import { CURVE_KEYS, SAMPLE_POINTS } from "../../curve-lab/demo-spec";
import type { CurveSet } from "../index";
import type { BenchSection } from "./run";

const ROOT = path.resolve(__dirname, "../../..");
const RATIO_TARGET = 1.5;
const JS_TARGET_BYTES = 250 * 1024;
const BLOCKS = 8;
const BLOCK_EVENTS = 40;
const WARMUP = 8;
const FLAGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];

function quantile(sorted: number[], q: number): number {
  if (sorted.length === 0) return NaN;
  const pos = (sorted.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return sorted[lo]! + (sorted[hi]! - sorted[lo]!) * (pos - lo);
}
const ms = (x: number) => `${x.toFixed(2)} ms`;

function run(cmd: string, env: NodeJS.ProcessEnv): Promise<void> {
  return new Promise((resolve, reject) => {
    const p = spawn("bash", ["-c", cmd], { cwd: ROOT, env, stdio: ["ignore", "pipe", "pipe"] });
    let log = "";
    p.stdout.on("data", (d) => (log += String(d)));
    p.stderr.on("data", (d) => (log += String(d)));
    p.on("exit", (code) => (code === 0 ? resolve() : reject(new Error(`${cmd.slice(0, 80)}… exited ${code}\n${log.slice(-3000)}`))));
  });
}

async function waitHttp(url: string, seconds: number): Promise<void> {
  const until = Date.now() + seconds * 1000;
  while (Date.now() < until) {
    try {
      const r = await fetch(url);
      if (r.ok) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error(`${url} did not answer within ${seconds} s`);
}

/** A production server of our own: fresh database, migrations, demo seed, build, start. */
async function startOwnServer(): Promise<{ url: string; stop: () => void }> {
  const port = Number(process.env.BENCH_PORT ?? 3290);
  const url = `http://127.0.0.1:${port}`;
  const env = { ...process.env, CHALKWING_DIST_DIR: ".next-test-bench", NEXTAUTH_URL: url, NODE_ENV: "production" as const };
  const prelude = `set -e; . lib/ops/common.sh; ensure_secret; bash db/cluster.sh start >/dev/null; bash db/cluster.sh create-db chalkwing_bench --fresh >/dev/null; db_urls chalkwing_bench;`;
  console.log(`[browser] preparing a production build in .next-test-bench and a seeded database (chalkwing_bench)`);
  await run(
    `${prelude} tsx_run db/cli.ts migrate >/dev/null; tsx_run db/cli.ts seed >/dev/null; node node_modules/next/dist/bin/next build >/dev/null`,
    env,
  );
  const server: ChildProcess = spawn(
    "bash",
    [
      "-c",
      `. lib/ops/common.sh; ensure_secret; db_urls chalkwing_bench; exec node node_modules/next/dist/bin/next start -p ${port} -H 127.0.0.1`,
    ],
    { cwd: ROOT, env, stdio: "ignore" },
  );
  await waitHttp(`${url}/api/health`, 90);
  return { url, stop: () => server.kill("SIGTERM") };
}

async function signInCookie(base: string): Promise<{ name: string; value: string }> {
  const csrf = await fetch(`${base}/api/auth/csrf`);
  const jar = csrf.headers
    .getSetCookie()
    .map((l) => l.split(";")[0])
    .join("; ");
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await fetch(`${base}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: jar, origin: base },
    body: new URLSearchParams({
      csrfToken,
      email: "instructor@chalkwing.test",
      password: "chalkwing-demo",
      callbackUrl: `${base}/today`,
      json: "true",
    }).toString(),
  });
  const token = res.headers
    .getSetCookie()
    .map((l) => l.split(";")[0]!)
    .find((p) => p.startsWith("next-auth.session-token="));
  if (!token) throw new Error(`sign-in as instructor@chalkwing.test failed (${res.status})`);
  return { name: "next-auth.session-token", value: token.slice("next-auth.session-token=".length) };
}

async function freshContext(
  base: string,
  cookie: { name: string; value: string },
): Promise<{ context: BrowserContext; close: () => Promise<void> }> {
  const dir = mkdtempSync(path.join(tmpdir(), "chalkwing-bench-"));
  const context = await chromium.launchPersistentContext(dir, {
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    headless: true,
    args: FLAGS,
    viewport: { width: 1280, height: 900 },
    baseURL: base,
  });
  await context.addCookies([{ ...cookie, url: base }]);
  return {
    context,
    close: async () => {
      await context.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Cold load of the builder: the compressed bytes of every script the page loads. */
async function coldLoadJs(page: Page): Promise<{ bytes: number; files: number }> {
  const scripts: Promise<number>[] = [];
  page.on("requestfinished", (req) => {
    if (req.resourceType() === "script") scripts.push(req.sizes().then((s) => s.responseBodySize));
  });
  await page.goto("/curve-lab/demos/new", { waitUntil: "networkidle" });
  await page.waitForSelector("[data-testid=curve-chart]");
  const sizes = await Promise.all(scripts);
  return { bytes: sizes.reduce((a, b) => a + b, 0), files: sizes.length };
}

interface AppBlock {
  times: number[];
  oneRedrawEach: boolean;
  pointsOk: boolean;
  sameInstance: boolean;
}

/** Builder page ready to measure: four cases, the page quiet, a request counter attached. */
async function prepareApp(
  page: Page,
): Promise<{ requests: () => number; canvas: { width: number; height: number }; massRange: { min: number; max: number } }> {
  for (let i = 0; i < 3; i++) await page.click("text=Add case");
  await page.waitForSelector("[data-testid=case-3]");
  await page.waitForLoadState("networkidle");
  let requests = 0;
  // Next's background prefetches of navigation links (marked by their header) are not the demo's.
  page.on("request", (r) => {
    if (!r.headers()["next-router-prefetch"]) requests++;
  });
  const info = await page.evaluate(() => {
    const slider = document.querySelector<HTMLInputElement>("[data-testid=mass-0]")!;
    const canvas = document.querySelector<HTMLCanvasElement>("[data-testid=curve-chart]")!;
    (canvas as unknown as { __benchMark: number }).__benchMark = 42;
    (window as unknown as { __benchChartId: string }).__benchChartId = canvas.dataset.chartId ?? "";
    return {
      canvas: { width: canvas.clientWidth, height: canvas.clientHeight },
      massRange: { min: Number(slider.min), max: Number(slider.max) },
    };
  });
  return { requests: () => requests, ...info };
}

/** One block of slider input events on the builder: input event → finished chart redraw. */
async function appBlock(page: Page, from: number, events: number, warmup: number): Promise<AppBlock> {
  await page.bringToFront();
  return page.evaluate(
    async ({ from, events, warmup, points }) => {
      const slider = document.querySelector<HTMLInputElement>("[data-testid=mass-0]")!;
      const canvas = document.querySelector<HTMLCanvasElement>("[data-testid=curve-chart]")!;
      const setValue = Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, "value")!.set!;
      const min = Number(slider.min);
      const max = Number(slider.max);
      const times: number[] = [];
      let oneRedrawEach = true;
      let pointsOk = true;
      for (let i = 0; i < events + warmup; i++) {
        const n = from + i;
        const v = min + ((n * 7) % (max - min));
        const before = Number(canvas.dataset.renders);
        const t0 = performance.now();
        setValue.call(slider, String(v === Number(slider.value) ? v + 1 : v));
        slider.dispatchEvent(new Event("input", { bubbles: true }));
        // React flushes the update in a microtask; the redraw is finished when the counter moves.
        for (let k = 0; k < 10000 && Number(canvas.dataset.renders) === before; k++) await Promise.resolve();
        const t1 = performance.now();
        if (Number(canvas.dataset.renders) !== before + 1) oneRedrawEach = false;
        const lengths = (canvas.dataset.points ?? "").split(",").map(Number);
        if (lengths.length !== 12 || lengths.some((x) => x !== points)) pointsOk = false;
        if (i >= warmup) times.push(t1 - t0);
        await new Promise((r) => requestAnimationFrame(() => r(null)));
        if (Number(canvas.dataset.renders) !== before + 1) oneRedrawEach = false; // nothing redrew again later
      }
      const sameInstance =
        document.querySelector("[data-testid=curve-chart]") === canvas &&
        (canvas as unknown as { __benchMark?: number }).__benchMark === 42 &&
        canvas.dataset.chartId === (window as unknown as { __benchChartId: string }).__benchChartId;
      return { times, oneRedrawEach, pointsOk, sameInstance };
    },
    { from, events, warmup, points: SAMPLE_POINTS },
  );
}

/** A blank page of the same size with chart.js alone and the same datasets, precomputed. */
async function prepareBaseline(
  page: Page,
  spec: DemoSpec,
  canvas: { width: number; height: number },
  massRange: { min: number; max: number },
): Promise<void> {
  const frames: number[][][] = [];
  const frame: Frame = newFrame();
  const cache: { set?: CurveSet<Float64Array> } = {};
  const distinct = 40;
  for (let f = 0; f < distinct; f++) {
    const mass = massRange.min + ((f * 7) % (massRange.max - massRange.min));
    const s: DemoSpec = { ...spec, cases: spec.cases.map((c, i) => (i === 0 ? { ...c, massKg: mass } : c)) };
    fillFrame(frame, s, cache);
    const sets: number[][] = [];
    for (let c = 0; c < 4; c++) {
      for (const k of CURVE_KEYS) {
        if (!s.curves[k]) continue;
        const flat: number[] = [];
        for (const p of frame.points[datasetIndex(c, k)]!) flat.push(p.x, p.y);
        sets.push(flat);
      }
    }
    frames.push(sets);
  }
  await page.setContent(
    `<!doctype html><html><body style="margin:0;background:#152033"><div style="position:relative;width:${canvas.width}px;height:${canvas.height}px"><canvas id="c"></canvas></div></body></html>`,
  );
  await page.addScriptTag({ path: path.join(ROOT, "node_modules/chart.js/dist/chart.umd.js") });
  await page.evaluate(
    ({ frames, yMax }) => {
      const ChartCtor = (window as unknown as { Chart: new (el: HTMLCanvasElement, cfg: unknown) => unknown }).Chart;
      const colours = ["#f4f1e8", "#7fd1ff", "#ffb3c7", "#c8f07a"];
      const dashes = [[10, 6], [3, 5], []];
      const datasets = frames[0]!.map((flat, d) => {
        const data: { x: number; y: number }[] = [];
        for (let i = 0; i < flat.length; i += 2) data.push({ x: flat[i]!, y: flat[i + 1]! });
        return {
          data,
          parsing: false,
          normalized: true,
          borderColor: colours[Math.floor(d / 3)],
          borderWidth: d % 3 === 2 ? 3.5 : 2.5,
          borderDash: dashes[d % 3],
          pointRadius: 0,
          tension: 0,
        };
      });
      const tick = { color: "#c9cdd6", font: { size: 13 } };
      const w = window as unknown as { __chart: unknown; __frames: number[][][] };
      w.__frames = frames;
      w.__chart = new ChartCtor(document.getElementById("c") as HTMLCanvasElement, {
        type: "line",
        data: { datasets },
        options: {
          animation: false,
          responsive: true,
          maintainAspectRatio: false,
          events: [],
          plugins: { legend: { display: false }, tooltip: { enabled: false } },
          scales: {
            x: { type: "linear", ticks: tick, title: { display: true, text: "EAS (kt)" } },
            y: { type: "linear", min: 0, max: yMax, ticks: tick, title: { display: true, text: "Drag (N)" } },
          },
        },
      });
    },
    { frames, yMax: frame.yMaxDragN },
  );
}

/** One block of the same redraws by chart.js alone: write the points, update("none"). */
async function baselineBlock(page: Page, from: number, events: number, warmup: number): Promise<number[]> {
  await page.bringToFront();
  return page.evaluate(
    async ({ from, events, warmup }) => {
      const w = window as unknown as {
        __chart: { data: { datasets: { data: { x: number; y: number }[] }[] }; update: (m: string) => void };
        __frames: number[][][];
      };
      const chart = w.__chart;
      const frames = w.__frames;
      const times: number[] = [];
      for (let i = 0; i < events + warmup; i++) {
        const sets = frames[(from + i) % frames.length]!;
        const t0 = performance.now();
        for (let d = 0; d < sets.length; d++) {
          const flat = sets[d]!;
          const pts = chart.data.datasets[d]!.data;
          for (let j = 0, p = 0; j < flat.length; j += 2, p++) {
            pts[p]!.x = flat[j]!;
            pts[p]!.y = flat[j + 1]!;
          }
        }
        chart.update("none");
        const t1 = performance.now();
        if (i >= warmup) times.push(t1 - t0);
        await new Promise((r) => requestAnimationFrame(() => r(null)));
      }
      return times;
    },
    { from, events, warmup },
  );
}

export async function runBrowserBench(): Promise<BenchSection> {
  const lines: string[] = [];
  let server: { url: string; stop: () => void } | null = null;
  let ctx: { context: BrowserContext; close: () => Promise<void> } | null = null;
  try {
    const given = process.env.CHALKWING_BENCH_URL;
    server = given ? { url: given.replace(/\/$/, ""), stop: () => undefined } : await startOwnServer();
    const cookie = await signInCookie(server.url);
    ctx = await freshContext(server.url, cookie);
    const page = await ctx.context.newPage();
    const js = await coldLoadJs(page);
    const airframe = await firstAirframe(server.url, cookie);
    const app = await prepareApp(page);
    const baselinePage = await ctx.context.newPage();
    await prepareBaseline(baselinePage, builderSpecAfterAddingCases(airframe), app.canvas, app.massRange);

    // Interleaved blocks, so a busy machine slows both sides alike.
    const appTimes: number[] = [];
    const baseTimes: number[] = [];
    const blockRatios: number[] = [];
    const checks = {
      "one redraw per input event": true,
      "every dataset holds 400 points": true,
      "same chart instance before and after": true,
      "no network request while dragging": true,
    };
    for (let blk = 0; blk < BLOCKS; blk++) {
      const r = await appBlock(page, blk * BLOCK_EVENTS, BLOCK_EVENTS, WARMUP);
      const bt = await baselineBlock(baselinePage, blk * BLOCK_EVENTS, BLOCK_EVENTS, WARMUP);
      appTimes.push(...r.times);
      baseTimes.push(...bt);
      blockRatios.push(
        quantile(
          [...r.times].sort((x, y) => x - y),
          0.5,
        ) /
          quantile(
            [...bt].sort((x, y) => x - y),
            0.5,
          ),
      );
      checks["one redraw per input event"] &&= r.oneRedrawEach;
      checks["every dataset holds 400 points"] &&= r.pointsOk;
      checks["same chart instance before and after"] &&= r.sameInstance;
    }
    const requests = app.requests();
    checks["no network request while dragging"] = requests === 0;

    const a = [...appTimes].sort((x, y) => x - y);
    const b = [...baseTimes].sort((x, y) => x - y);
    const ratio = quantile(a, 0.5) / quantile(b, 0.5);
    lines.push(
      `[browser] slider input → finished chart redraw, 4 cases × ${SAMPLE_POINTS} points (12 datasets), ${a.length} events in ${BLOCKS} blocks: median ${ms(quantile(a, 0.5))}, p95 ${ms(quantile(a, 0.95))}`,
    );
    lines.push(
      `[browser] chart.js alone redrawing the same datasets, same canvas size, interleaved: median ${ms(quantile(b, 0.5))}, p95 ${ms(quantile(b, 0.95))}`,
    );
    lines.push(
      `[browser] ratio (median, app / chart.js alone): ${ratio.toFixed(2)} (target ≤ ${RATIO_TARGET}) ${ratio <= RATIO_TARGET ? "PASS" : "FAIL"}; absolute p95 ${ms(quantile(a, 0.95))}`,
    );
    lines.push(`[browser] ratio per block (informative): ${blockRatios.map((x) => x.toFixed(2)).join(" ")}`);
    for (const [name, ok] of Object.entries(checks))
      lines.push(`[browser] check: ${name}: ${ok ? "yes" : `NO${name.startsWith("no network") ? ` (${requests} requests)` : ""}`}`);
    lines.push(
      `[browser] builder page cold load: ${(js.bytes / 1024).toFixed(1)} kB of compressed JavaScript in ${js.files} files (target ≤ ${JS_TARGET_BYTES / 1024} kB) ${js.bytes <= JS_TARGET_BYTES ? "PASS" : "FAIL"}`,
    );
    const pass = ratio <= RATIO_TARGET && Object.values(checks).every(Boolean) && js.bytes <= JS_TARGET_BYTES;
    return { name: "browser", lines, pass };
  } catch (e) {
    lines.push(`[browser] FAIL: ${e instanceof Error ? e.message : String(e)}`);
    return { name: "browser", lines, pass: false };
  } finally {
    await ctx?.close();
    server?.stop();
  }
}

/** The profile the new-demo builder starts from: the first of GET /api/airframes (the same list and order). */
async function firstAirframe(base: string, cookie: { name: string; value: string }): Promise<AirframeSnapshot> {
  const res = await fetch(`${base}/api/airframes`, { headers: { cookie: `${cookie.name}=${cookie.value}` } });
  if (!res.ok) throw new Error(`GET /api/airframes answered ${res.status}`);
  const rows = ((await res.json()) as { rows: (AirframeSnapshot & { notes: string })[] }).rows;
  const a = rows[0];
  if (!a) throw new Error("no aircraft profile in the database: seed it first");
  const { id, name, emptyMassKg, maxMassKg, wingAreaM2, wingSpanM, oswaldEfficiency, zeroLiftDragCoefficient, configurations } = a;
  return { id, name, emptyMassKg, maxMassKg, wingAreaM2, wingSpanM, oswaldEfficiency, zeroLiftDragCoefficient, configurations };
}

/** The builder's spec after three "Add case" clicks, as the builder computes it. */
function builderSpecAfterAddingCases(airframe: AirframeSnapshot): DemoSpec {
  let s = defaultSpec(airframe);
  for (let i = 0; i < 3; i++) {
    const last = s.cases[s.cases.length - 1]!;
    const massKg = Math.min(
      airframe.maxMassKg,
      Math.max(airframe.emptyMassKg, Math.round((airframe.emptyMassKg + airframe.maxMassKg) / 2)),
    );
    s = { ...s, cases: [...s.cases, { ...last, label: `Case ${s.cases.length + 1}`, massKg }] };
  }
  return s;
}
