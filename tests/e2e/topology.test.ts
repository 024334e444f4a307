// More than one machine, on loopback: lib/ops/topology.sh starts two production servers of the
// one build behind nginx (round-robin, no stickiness), PgBouncer in transaction mode in front of
// PostgreSQL, the mail worker and a mail sink, on a database of its own (never the e2e database
// the other tests use). Through the proxy: a sign-in on one server carries on at the other, a
// form served by one is submitted to the other, an idempotency key, a lock, a queued mail and an
// uploaded handout are shared. nginx names the server that answered in X-Chalkwing-Upstream
// (the topology's own configuration adds it; the app sends nothing of the kind).
import { spawn, type ChildProcess } from "node:child_process";
import { createHash, randomUUID } from "node:crypto";
import { existsSync, readFileSync, rmSync } from "node:fs";
import net from "node:net";
import path from "node:path";
import { Client } from "pg";
import { PDFDocument, StandardFonts } from "pdf-lib";
import { QueryTypes, type Transaction } from "sequelize";
import type { Response as PwResponse } from "playwright-core";
import { launchBrowser, DEMO_PASSWORD, screenshot, type Browser } from "./helpers/browser";
import { cookiesFrom, cookieHeader, actionResultFromRsc, SESSION_COOKIE } from "./helpers/http";
import { DEMO_ACCOUNTS } from "./helpers/accounts";
import { deriveActions } from "./authz/derive";
import { letterWeek } from "@/lib/mail/letter-week";

jest.setTimeout(180_000);

const UPSTREAM = "x-chalkwing-upstream";

interface Topology {
  proxy: string;
  servers: [string, string];
  pgbouncer: number;
  mailSinkDir: string;
  database: string;
  directUrl: string;
  pooledUrl: string;
  ownerUrl: string;
  dir: string;
}

let proc: ChildProcess | undefined;
let topo: Topology;
let log = "";
let db: Client | undefined;
let browser: Browser | undefined;

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const a = srv.address();
      srv.close(() => (a && typeof a === "object" ? resolve(a.port) : reject(new Error("no port"))));
    });
  });
}

/** Starts lib/ops/topology.sh and waits for its "ready" line (migrating, seeding and two servers take a while). */
function startTopology(port: number): Promise<Topology> {
  const name = (process.env.CHALKWING_TEST_NAME ?? "t").toLowerCase().replace(/[^a-z0-9_]/g, "_");
  proc = spawn("bash", ["lib/ops/topology.sh"], {
    env: {
      ...process.env,
      TOPOLOGY_PORT: String(port),
      TOPOLOGY_DB: `chalkwing_${name}_topology`,
      TOPOLOGY_DROP_DB: "1",
      // the seeded outbox holds some eighty mails the worker sends first, one a poll
      CHALKWING_MAIL_TICK_SECONDS: "0.5",
      // the worker writes no Weekly letters by the clock here: the two clicks below are the only writers of this week's letter
      CHALKWING_MAIL_PRODUCERS: "off",
    },
    stdio: ["ignore", "pipe", "pipe"],
    detached: true, // its own process group, so afterAll can end everything it started even if its trap did not run
  });
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`the topology did not get ready in 5 minutes:\n${log}`)), 300_000);
    let buffered = "";
    proc!.stdout!.on("data", (d: Buffer) => {
      log += d.toString();
      buffered += d.toString();
      const m = /^\[topology\] ready (\{.*\})$/m.exec(buffered);
      if (m) {
        clearTimeout(timer);
        resolve(JSON.parse(m[1]!) as Topology);
      }
    });
    proc!.stderr!.on("data", (d: Buffer) => (log += d.toString()));
    proc!.once("exit", (code) => {
      clearTimeout(timer);
      reject(new Error(`the topology script ended (${code}) before it was ready:\n${log}`));
    });
  });
}

async function stopTopology() {
  const p = proc;
  if (!p || p.exitCode !== null || p.pid === undefined) return;
  const exited = new Promise<void>((r) => p.once("exit", () => r()));
  p.kill("SIGTERM"); // its trap stops nginx, both servers, the worker, the sink and PgBouncer, drops its database, removes its folder
  let timer: NodeJS.Timeout | undefined;
  const inTime = await Promise.race([exited.then(() => true), new Promise<boolean>((r) => (timer = setTimeout(() => r(false), 60_000)))]);
  clearTimeout(timer);
  if (!inTime) {
    try {
      process.kill(-p.pid, "SIGKILL");
    } catch {
      // the group is gone already
    }
    if (topo?.dir?.startsWith("/")) rmSync(topo.dir, { recursive: true, force: true });
  }
}

beforeAll(async () => {
  try {
    topo = await startTopology(await freePort());
    db = new Client({ connectionString: topo.ownerUrl });
    await db.connect();
    browser = await launchBrowser();
  } catch (e) {
    await stopTopology();
    throw e;
  }
}, 360_000);

afterAll(async () => {
  await browser?.close().catch(() => undefined);
  await db?.end().catch(() => undefined);
  await stopTopology();
}, 120_000);

// ------------------------------------------------------------------ HTTP through the proxy

/** A request through nginx; the answer and the server that gave it. */
async function via(pathname: string, init: RequestInit = {}): Promise<{ res: Response; server: string }> {
  const res = await fetch(`${topo.proxy}${pathname}`, { redirect: "manual", ...init });
  return { res, server: res.headers.get(UPSTREAM) ?? "(none)" };
}

/**
 * Round-robin with one nginx worker hands requests to the two servers in turn: asks /api/health
 * until the answer comes from the other server, so the next request goes to `server`. (A browser
 * request slipping in between can spoil the turn; the tests check where each request really went.)
 */
async function nextGoesTo(server: string) {
  for (let i = 0; i < 4; i++) {
    const { res, server: s } = await via("/api/health");
    await res.arrayBuffer();
    if (s !== server) return;
  }
}

const other = (server: string) => (server === topo.servers[0] ? topo.servers[1] : topo.servers[0]);

async function signInVia(email: string): Promise<{ cookie: string; server: string }> {
  const csrf = await via("/api/auth/csrf");
  const jar = cookiesFrom(csrf.res);
  const { csrfToken } = (await csrf.res.json()) as { csrfToken: string };
  const { res, server } = await via("/api/auth/callback/credentials", {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: cookieHeader(jar), origin: topo.proxy },
    body: new URLSearchParams({ csrfToken, email, password: DEMO_PASSWORD, callbackUrl: `${topo.proxy}/today`, json: "true" }).toString(),
  });
  const token = cookiesFrom(res).get(SESSION_COOKIE);
  if (!token) throw new Error(`sign-in as ${email} through the proxy failed (${res.status})`);
  return { cookie: `${SESSION_COOKIE}=${token}`, server };
}

function actionId(name: string): string {
  const a = deriveActions().find((x) => x.exportedName === name);
  if (!a) throw new Error(`no server action ${name} in the build`);
  return a.id;
}

async function callActionVia(id: string, pagePath: string, args: unknown[], cookie: string) {
  const { res, server } = await via(pagePath, {
    method: "POST",
    headers: { "Next-Action": id, "Content-Type": "text/plain;charset=UTF-8", Accept: "text/x-component", Origin: topo.proxy, cookie },
    body: JSON.stringify(args),
  });
  const text = await res.text();
  return {
    status: res.status,
    server,
    result: actionResultFromRsc(text) as { ok: boolean; replayed?: boolean; data?: Record<string, unknown>; message?: string },
  };
}

async function until<T>(what: string, fn: () => Promise<T | null | undefined | false>, ms = 60_000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await fn();
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

// ------------------------------------------------------------------ the walk

test("the topology is what it claims: two servers behind nginx, every database client of the app behind PgBouncer in transaction mode", async () => {
  expect(topo.servers[0]).not.toBe(topo.servers[1]);
  const seen = new Set<string>();
  for (let i = 0; i < 4; i++) {
    const { res, server } = await via("/api/health");
    expect({ status: res.status, body: await res.json() }).toEqual({ status: 200, body: { status: "ok", database: "ok" } });
    seen.add(server);
  }
  expect([...seen].sort()).toEqual([...topo.servers].sort());

  // PgBouncer's console: pool mode, and the app role's clients (both servers and the mail worker)
  const console_ = new Client({ connectionString: topo.ownerUrl.replace(/@[^/]+\/[^?]+/, `@127.0.0.1:${topo.pgbouncer}/pgbouncer`) });
  await console_.connect();
  try {
    const pools = (await console_.query(`SHOW POOLS`)).rows as { database: string; user: string; pool_mode: string }[];
    expect(pools.filter((p) => p.database === topo.database).map((p) => p.pool_mode)).toContain("transaction");
    const clients = (await console_.query(`SHOW CLIENTS`)).rows as { database: string; user: string; application_name?: string }[];
    const appClients = clients.filter((c) => c.database === topo.database && c.user === "chalkwing_app");
    expect(appClients.map((c) => c.application_name)).toContain("chalkwing-mail-worker");
    expect(appClients.length).toBeGreaterThanOrEqual(3);
  } finally {
    await console_.end();
  }
});

test("through PgBouncer, the app's database module keeps its session time zone on every statement, though the database's default zone is not UTC", async () => {
  // what a connection without Sequelize's SET sees (lib/ops/topology.sh gives the database a zone far from UTC) ...
  const direct = new Client({ connectionString: topo.directUrl });
  await direct.connect();
  const dbDefault = (await direct.query<{ TimeZone: string }>(`SHOW TimeZone`)).rows[0]!.TimeZone;
  // ... and what the SET Sequelize sends when it connects gives (node_modules/sequelize/lib/dialects/postgres/connection-manager.js)
  await direct.query(`SET TIME ZONE INTERVAL '+00:00' HOUR TO MINUTE`);
  const sequelizeZone = (await direct.query<{ TimeZone: string }>(`SHOW TimeZone`)).rows[0]!.TimeZone;
  await direct.end();
  expect(dbDefault).toBe("Pacific/Chatham");
  expect(sequelizeZone).not.toBe(dbDefault);

  // db/index.ts as the servers run it, pointed at PgBouncer; many statements at once, so PgBouncer
  // runs them on server connections other than the ones the SETs ran on
  // (a fresh copy of the module and of lib/env, whose settings are read once: the helpers' imports
  // made one already, for the e2e database)
  const g = globalThis as { __chalkwingSequelize?: unknown };
  const [saved, savedInstance] = [process.env.DATABASE_URL, g.__chalkwingSequelize];
  process.env.DATABASE_URL = topo.pooledUrl;
  g.__chalkwingSequelize = undefined;
  jest.resetModules();
  const { sequelize } = await import("@/db/index");
  try {
    expect(String(sequelize.config.port)).toBe(String(topo.pgbouncer));
    const show = (t?: Transaction) =>
      sequelize.query<{ TimeZone: string }>(`SHOW TimeZone`, { type: QueryTypes.SELECT, plain: true, transaction: t });
    const zones = await Promise.all(Array.from({ length: 40 }, (_, i) => (i % 2 ? show() : sequelize.transaction((t) => show(t)))));
    expect(new Set(zones.map((z) => z?.TimeZone))).toEqual(new Set([sequelizeZone]));
  } finally {
    await sequelize.close();
    process.env.DATABASE_URL = saved;
    g.__chalkwingSequelize = savedInstance;
  }
});

test("a user signed in on one server carries on at the other, signed in", async () => {
  const { cookie, server: signedInAt } = await signInVia(DEMO_ACCOUNTS.chief);
  const { rows } = await db!.query<{ id: string }>(`SELECT id FROM people WHERE email = $1`, [DEMO_ACCOUNTS.chief]);
  const answers: { server: string; status: number; id?: string }[] = [];
  for (let i = 0; i < 4; i++) {
    const { res, server } = await via("/api/auth/session", { headers: { cookie } });
    const body = (await res.json()) as { user?: { id?: string } };
    answers.push({ server, status: res.status, id: body.user?.id });
  }
  expect(answers.filter((a) => a.server === other(signedInAt)).length).toBeGreaterThan(0);
  for (const a of answers) expect(a).toEqual({ server: a.server, status: 200, id: rows[0]!.id });
  // a signed-in page on each server: no redirect to /sign-in
  for (const s of topo.servers) {
    await nextGoesTo(s);
    const { res, server } = await via("/today", { headers: { cookie } });
    await res.arrayBuffer();
    expect({ server, status: res.status, location: res.headers.get("location") }).toEqual({ server: s, status: 200, location: null });
  }
});

test("in a browser: sign in through the proxy, walk pages on both servers, and a form served by one server is submitted to the other", async () => {
  const page = await browser!.context.newPage();
  const documents: { path: string; server: string }[] = [];
  const actions: { server: string; status: number }[] = [];
  page.on("response", (r: PwResponse) => {
    const req = r.request();
    const server = r.headers()[UPSTREAM] ?? "(none)";
    if (req.resourceType() === "document") documents.push({ path: new URL(r.url()).pathname, server });
    else if (req.method() === "POST" && req.headers()["next-action"]) actions.push({ server, status: r.status() });
  });

  await page.goto(`${topo.proxy}/sign-in`);
  await page.fill("#email", DEMO_ACCOUNTS.chief);
  await page.fill("#password", DEMO_PASSWORD);
  await Promise.all([page.waitForURL((u) => !u.pathname.startsWith("/sign-in"), { timeout: 30_000 }), page.click("button[type=submit]")]);

  const walk = ["/today", "/timetable", "/records", "/rooms"];
  for (const [i, p] of walk.entries()) {
    await page.waitForLoadState("networkidle");
    await nextGoesTo(topo.servers[i % 2]!);
    await page.goto(`${topo.proxy}${p}`);
    expect(new URL(page.url()).pathname).toBe(p); // not sent to /sign-in: still signed in, whichever server answered
    await expect(page.getByRole("button", { name: /sign out/i }).count()).resolves.toBeGreaterThan(0);
  }
  const walked = documents.filter((d) => walk.includes(d.path));
  expect(new Set(walked.map((d) => d.server)).size).toBe(2);

  // the Rooms form, served by one server, submitted (a server action) to the other; if a
  // background request of the page took the other server's turn, the form is tried again afresh
  let crossed: { formFrom: string; actionAt: string; name: string } | null = null;
  const names: string[] = [];
  for (let attempt = 0; attempt < 4 && !crossed; attempt++) {
    if (attempt > 0) await page.goto(`${topo.proxy}/rooms`);
    await page.waitForLoadState("networkidle");
    const formFrom = documents.at(-1)!.server;
    const name = `Topology room ${randomUUID().slice(0, 8)}`;
    names.push(name);
    await page.fill("#room-name", name);
    await nextGoesTo(other(formFrom));
    const before = actions.length;
    await page.click("button:has-text('Add the room')");
    await page.getByTestId("rooms-message").getByText(`${name} added.`, { exact: true }).waitFor();
    const action = actions[before]!;
    expect(action.status).toBe(200);
    if (action.server !== formFrom) crossed = { formFrom, actionAt: action.server, name };
  }
  expect(crossed).not.toBeNull();
  await screenshot(page, "topology-rooms-across-servers");
  for (const name of names) {
    const { rows } = await db!.query(`SELECT count(*)::int AS n FROM rooms WHERE name = $1`, [name]);
    expect({ name, n: rows[0].n }).toEqual({ name, n: 1 });
  }
  await page.close();
});

test("one idempotency key sent to both servers at once creates one room; both answers name it", async () => {
  const { cookie } = await signInVia(DEMO_ACCOUNTS.chief);
  const id = actionId("createRoomAction");
  const input = { name: `Topology twin ${randomUUID().slice(0, 8)}`, capacity: "12", idempotencyKey: randomUUID() };
  const [a, b] = await Promise.all([callActionVia(id, "/rooms", [input], cookie), callActionVia(id, "/rooms", [input], cookie)]);
  expect(new Set([a.server, b.server]).size).toBe(2); // consecutive requests: one to each server
  expect([a.status, b.status]).toEqual([200, 200]);
  expect(a.result).toMatchObject({ ok: true, data: { name: input.name } });
  // the one that waited for the other's lock got the first one's answer back
  expect(b.result?.data).toEqual(a.result.data);
  expect([a.result, b.result].filter((r) => r.replayed).length).toBe(1);
  const { rows } = await db!.query(`SELECT count(*)::int AS n FROM rooms WHERE name = $1`, [input.name]);
  expect(rows[0].n).toBe(1);
});

test("'send now' of a Weekly letter clicked on both servers at once writes one letter, and the worker (through PgBouncer) delivers it once", async () => {
  const { cookie } = await signInVia(DEMO_ACCOUNTS.chief);
  // a pair whose letter of this week (the key sendLetterNow writes under) is not written yet
  const { rows: schools } = await db!.query<{ time_zone: string; day: number | null }>(
    `SELECT time_zone, (settings->>'weeklyLetterDay')::int AS day FROM schools WHERE name = 'Larkhollow Flying School'`,
  );
  expect(schools[0]?.day).toEqual(expect.any(Number));
  const { weekStart } = letterWeek(new Date(), schools[0]!.time_zone, schools[0]!.day!);
  const { rows: links } = await db!.query<{ sponsor_id: string; student_id: string }>(
    `SELECT l.sponsor_id, l.student_id FROM sponsor_links l
       JOIN people sp ON sp.id = l.sponsor_id AND sp.active JOIN people st ON st.id = l.student_id AND st.active
      WHERE l.weekly_letter
        AND NOT EXISTS (SELECT 1 FROM mail_unsubscribes u WHERE u.sponsor_id = l.sponsor_id AND u.student_id = l.student_id AND u.kind = 'weekly.letter')
        AND NOT EXISTS (SELECT 1 FROM outbox o WHERE o.idempotency_key = 'weekly.letter:' || l.sponsor_id || ':' || l.student_id || ':' || $1)
      ORDER BY l.created_at LIMIT 1`,
    [weekStart],
  );
  expect(links.length).toBe(1);
  const pair = { sponsorId: links[0]!.sponsor_id, studentId: links[0]!.student_id };
  const id = actionId("sendLetterNowAction");
  // two separate clicks (two keys), one on each server, at the same moment
  const [a, b] = await Promise.all([
    callActionVia(id, "/mail/letters", [{ ...pair, idempotencyKey: randomUUID() }], cookie),
    callActionVia(id, "/mail/letters", [{ ...pair, idempotencyKey: randomUUID() }], cookie),
  ]);
  expect(new Set([a.server, b.server]).size).toBe(2);
  expect([a.result?.ok, b.result?.ok]).toEqual([true, true]);
  const outboxId = a.result!.data!.outboxId as string;
  expect(b.result!.data!.outboxId).toBe(outboxId);
  expect([a.result!.data!.written, b.result!.data!.written].sort()).toEqual([false, true]);

  const sent = await until(
    "the letter to be sent",
    async () => {
      const { rows } = await db!.query<{ state: string; message_id: string }>(`SELECT state, message_id FROM outbox WHERE id = $1`, [
        outboxId,
      ]);
      return rows[0]?.state === "sent" ? rows[0] : null;
    },
    150_000,
  );
  const { rows: deliveries } = await db!.query(`SELECT count(*)::int AS n FROM mail_deliveries WHERE outbox_id = $1`, [outboxId]);
  expect(deliveries[0].n).toBe(1);
  const index = path.join(topo.mailSinkDir, "index.jsonl");
  await until("the sink to store it", async () => existsSync(index) && readFileSync(index, "utf8").includes(sent.message_id));
  const lines = readFileSync(index, "utf8")
    .split("\n")
    .filter((l) => l.trim())
    .map((l) => JSON.parse(l) as { messageId: string });
  expect(lines.filter((l) => l.messageId === sent.message_id).length).toBe(1);
});

/** A small real PDF (ISO 32000-1) with a unique line of text, so each upload is a new file. */
async function pdf(text: string): Promise<Buffer> {
  const doc = await PDFDocument.create();
  const p = doc.addPage([300, 200]);
  p.drawText(text, { x: 20, y: 150, size: 14, font: await doc.embedFont(StandardFonts.Helvetica) });
  return Buffer.from(await doc.save());
}

test("a handout uploaded on one server downloads, byte for byte, from the other", async () => {
  const { cookie } = await signInVia(DEMO_ACCOUNTS.instructor);
  const { rows } = await db!.query<{ id: string }>(
    `SELECT b.id FROM briefings b JOIN people p ON p.id = b.owner_id WHERE p.email = $1 ORDER BY b.created_at LIMIT 1`,
    [DEMO_ACCOUNTS.instructor],
  );
  expect(rows.length).toBe(1);
  const bytes = await pdf(`Topology ${randomUUID()}`);
  const up = await via(`/api/briefings/${rows[0]!.id}/handouts?name=${encodeURIComponent("topology-notes.pdf")}`, {
    method: "POST",
    headers: { "content-type": "application/pdf", origin: topo.proxy, cookie },
    body: new Uint8Array(bytes),
  });
  expect(up.res.status).toBe(201);
  const saved = (await up.res.json()) as { handoutId: string };
  await nextGoesTo(other(up.server));
  const down = await via(`/api/handouts/${saved.handoutId}`, { headers: { cookie } });
  expect(down.server).toBe(other(up.server));
  expect(down.res.status).toBe(200);
  const got = Buffer.from(await down.res.arrayBuffer());
  const sha = (b: Buffer) => createHash("sha256").update(b).digest("hex");
  expect(sha(got)).toBe(sha(bytes));
});
