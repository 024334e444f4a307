/**
 * One size of the scale part of `npm run bench` (lib/ops/bench-scale.sh starts the server and
 * runs this): signs in as each demo account, then loads every signed-in page and API that lists
 * or summarises with autocannon on loopback, after `/api/health` on the same server, and writes
 * the figures to a JSON file (lib/bench/scale-report.ts prints them). A page that answers
 * anything but 200, or errors under load, is recorded as an error with its status; it never
 * stops the run.
 *
 * Environment: BENCH_URL (the server), BENCH_OUT (JSON file), BENCH_STUDENTS (the size, for the
 * report), BENCH_STUDENT_ID (the demo student's id), CHALKWING_BENCH_SECONDS (per endpoint,
 * default 10), CHALKWING_BENCH_CONNECTIONS (default 32).
 */
import { writeFileSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import autocannon from "autocannon";
import { ENDPOINTS, type Role } from "./endpoints";
import type { Figure, SizeRun } from "./figures";

const PASSWORD = "chalkwing-demo"; // demo accounts only (README)
const ACCOUNTS: Record<Role, string> = {
  chief: "chief@chalkwing.test",
  instructor: "instructor@chalkwing.test",
  student: "student@chalkwing.test",
  sponsor: "sponsor@chalkwing.test",
};

function env(name: string): string {
  const v = process.env[name];
  if (!v) throw new Error(`${name} is not set (lib/ops/bench-scale.sh sets it)`);
  return v;
}

function cookiePairs(res: Response): string[] {
  return res.headers.getSetCookie().map((l) => l.split(";")[0] ?? "");
}

/** next-auth credentials sign-in: CSRF token, then the callback; returns the session cookie. */
async function signIn(base: string, email: string): Promise<string> {
  const csrf = await fetch(`${base}/api/auth/csrf`);
  const jar = cookiePairs(csrf).join("; ");
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await fetch(`${base}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: jar, origin: base },
    body: new URLSearchParams({ csrfToken, email, password: PASSWORD, callbackUrl: `${base}/today`, json: "true" }).toString(),
  });
  const token = cookiePairs(res).find((p) => p.startsWith("next-auth.session-token="));
  if (!token) throw new Error(`sign-in as ${email} failed (status ${res.status})`);
  return token;
}

/** One request alone: its status, size and time. */
async function probe(url: string, cookie: string | null): Promise<{ status: number; bytes: number; ms: number; error?: string }> {
  const t0 = performance.now();
  try {
    const res = await fetch(url, { redirect: "manual", headers: cookie ? { cookie } : {}, signal: AbortSignal.timeout(120_000) });
    const body = await res.arrayBuffer();
    return { status: res.status, bytes: body.byteLength, ms: performance.now() - t0 };
  } catch (e) {
    return { status: 0, bytes: 0, ms: performance.now() - t0, error: e instanceof Error ? e.message : String(e) };
  }
}

/**
 * autocannon counts only requests that finish within its duration: when one request alone takes
 * so long that 32 at once could not finish in a third of it (on this many CPUs), the endpoint is
 * loaded by count instead (two requests per connection), so slow pages still get their figures.
 */
async function load(url: string, cookie: string | null, seconds: number, connections: number, singleMs: number) {
  const headers = cookie ? { cookie } : {};
  const byCount = (singleMs * connections) / cpus().length > (seconds * 1000) / 3;
  const result = byCount
    ? await autocannon({ url, connections, amount: 2 * connections, timeout: 300, headers })
    : await autocannon({ url, connections, duration: seconds, timeout: 60, headers });
  return { result, mode: byCount ? (`${2 * connections} requests` as const) : (`${seconds} s` as const) };
}

async function measure(
  name: string,
  role: Role | null,
  base: string,
  path: string,
  cookie: string | null,
  seconds: number,
  connections: number,
): Promise<Figure> {
  const url = `${base}${path}`;
  await probe(url, cookie); // warm-up: the first request of a route compiles and caches more than later ones
  const first = await probe(url, cookie);
  const fig: Figure = { name, role, path, status: first.status, bytes: first.bytes, singleMs: first.ms, error: null, load: null };
  if (first.status !== 200) {
    fig.error = first.error ?? `status ${first.status}`;
    return fig;
  }
  try {
    const { result: r, mode } = await load(url, cookie, seconds, connections, first.ms);
    fig.load = {
      connections,
      mode,
      requests: r.requests.total,
      rps: r.requests.average,
      p50: r.latency.p50,
      p97_5: r.latency.p97_5,
      p99: r.latency.p99,
      non2xx: r.non2xx,
      errors: r.errors,
      timeouts: r.timeouts,
    };
    if (r.non2xx || r.errors || r.timeouts) fig.error = `${r.non2xx} non-2xx, ${r.errors} errors, ${r.timeouts} timeouts under load`;
    else if (r.requests.total === 0) fig.error = "no request completed under load";
  } catch (e) {
    fig.error = `autocannon: ${e instanceof Error ? e.message : String(e)}`;
  }
  return fig;
}

/** The mean of the two health figures (either alone when the other failed). */
function averageHealth(a: Figure, b: Figure): Figure {
  if (!a.load || a.error) return b;
  if (!b.load || b.error) return a;
  const mean = (x: number, y: number) => (x + y) / 2;
  return {
    ...a,
    name: "/api/health (mean of before and after)",
    singleMs: mean(a.singleMs, b.singleMs),
    load: {
      ...a.load,
      requests: a.load.requests + b.load.requests,
      rps: mean(a.load.rps, b.load.rps),
      p50: mean(a.load.p50, b.load.p50),
      p97_5: mean(a.load.p97_5, b.load.p97_5),
      p99: mean(a.load.p99, b.load.p99),
    },
  };
}

async function main() {
  const base = env("BENCH_URL");
  const out = env("BENCH_OUT");
  const students = Number(env("BENCH_STUDENTS"));
  const studentId = env("BENCH_STUDENT_ID");
  const seconds = Number(process.env.CHALKWING_BENCH_SECONDS ?? 10);
  const connections = Number(process.env.CHALKWING_BENCH_CONNECTIONS ?? 32);
  const cookies = new Map<Role, string>();
  const signInErrors: string[] = [];
  for (const role of Object.keys(ACCOUNTS) as Role[]) {
    try {
      cookies.set(role, await signIn(base, ACCOUNTS[role]));
    } catch (e) {
      signInErrors.push(e instanceof Error ? e.message : String(e));
    }
  }
  const log = (f: Figure) =>
    console.log(
      `[scale ${students}] ${f.name.padEnd(34)} ${f.error ? `ERROR ${f.error}` : `p97.5 ${f.load?.p97_5} ms, ${f.load?.rps.toFixed(1)} req/s`}`,
    );
  const loadBefore = loadavg()[0]!;
  const health = await measure("/api/health", null, base, "/api/health", null, seconds, connections);
  log(health);
  // the floor under every page: the smallest page the framework renders, signed out, no database read
  const floor = await measure("sign-in page, signed out (the smallest page)", null, base, "/sign-in", null, seconds, connections);
  log(floor);
  const figures: Figure[] = [];
  for (const e of ENDPOINTS) {
    const cookie = cookies.get(e.role);
    const path = e.path.replace("{student}", studentId);
    const name = `${e.role} ${e.label}`;
    const f = cookie
      ? await measure(name, e.role, base, path, cookie, seconds, connections)
      : ({ name, role: e.role, path, status: 0, bytes: 0, singleMs: 0, error: "not signed in", load: null } satisfies Figure);
    log(f);
    figures.push(f);
  }
  // health again at the end: on a shared machine the load drifts, so the ratios use both figures
  const healthAfter = await measure("/api/health (after)", null, base, "/api/health", null, seconds, connections);
  log(healthAfter);
  const run: SizeRun = {
    students,
    measuredAt: new Date().toISOString(),
    seconds,
    connections,
    loadAverage: [loadBefore, loadavg()[0]!],
    signInErrors,
    health: averageHealth(health, healthAfter),
    healthRuns: [health, healthAfter],
    floor,
    figures,
  };
  writeFileSync(out, JSON.stringify(run, null, 2));
}

main().catch((e: unknown) => {
  console.error(e);
  process.exitCode = 1;
});
