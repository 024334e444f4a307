// Cross-site and failure behaviour against the production build: Origin checks on
// state-changing calls that carry a session cookie, security headers on every response,
// /api/health up and down (a second server of the same build whose database is unreachable),
// and error pages without stack traces.
import { spawn, type ChildProcess } from "node:child_process";
import net from "node:net";
import type { Client } from "pg";
import { launchBrowser, BASE_URL, DEMO_PASSWORD, screenshot, type Browser } from "./helpers/browser";
import { callAction, signInOrThrow, SESSION_COOKIE } from "./helpers/http";
import { ownerClient } from "./helpers/db";
import { DEMO_ACCOUNTS, demoSchoolId } from "./helpers/accounts";
import { deriveActions } from "./authz/derive";

let db: Client;
let chief: string;

beforeAll(async () => {
  db = await ownerClient();
  chief = await signInOrThrow(DEMO_ACCOUNTS.chief, DEMO_PASSWORD);
});
afterAll(async () => {
  await db?.end();
});

/** A person of the demo school with a sign-in lock, made directly in the database. */
async function lockedTarget(label: string): Promise<{ id: string; email: string }> {
  const email = `e2e.${label}.${Date.now()}@chalkwing.test`;
  const { rows } = await db.query<{ id: string }>(
    `INSERT INTO people (school_id, name, email, roles) VALUES ($1, $2, $3, ARRAY['student']) RETURNING id`,
    [await demoSchoolId(db), `E2E ${label}`, email],
  );
  await db.query(
    `INSERT INTO sign_in_throttle (email, address, failures, locked_until) VALUES ($1, '192.0.2.1', 10, now() + interval '15 minutes')`,
    [email],
  );
  return { id: rows[0]!.id, email };
}
async function lockCount(email: string): Promise<number> {
  return (await db.query(`SELECT 1 FROM sign_in_throttle WHERE email = $1`, [email])).rowCount ?? -1;
}

describe("cross-site requests carrying a session cookie", () => {
  test.each([
    ["a foreign Origin", "https://evil.example"],
    ["Origin: null", "null"],
    ["no Origin", undefined],
  ])("POST /api/people/[personId]/unlock with %s is refused with 403 and changes nothing", async (_label, origin) => {
    const target = await lockedTarget("origin");
    const headers: Record<string, string> = { cookie: chief, "content-type": "application/json" };
    if (origin !== undefined) headers.origin = origin;
    const res = await fetch(`${BASE_URL}/api/people/${target.id}/unlock`, { method: "POST", headers, body: "{}" });
    expect(res.status).toBe(403);
    expect(await res.json()).toMatchObject({ error: { status: 403, field: "origin" } });
    expect(await lockCount(target.email)).toBe(1);
    // the same call from the app's own origin goes through: the refusal was the Origin's doing
    const ok = await fetch(`${BASE_URL}/api/people/${target.id}/unlock`, {
      method: "POST",
      headers: { ...headers, origin: BASE_URL },
      body: "{}",
    });
    expect(ok.status).toBe(200);
    expect(await lockCount(target.email)).toBe(0);
  });

  test("the unlock action called with a foreign Origin does not run", async () => {
    const target = await lockedTarget("origin-action");
    const action = deriveActions().find((a) => a.exportedName === "unlockAccountAction");
    expect(action).toBeDefined();
    const res = await callAction({
      actionId: action!.id,
      pagePath: "/today",
      args: [{ personId: target.id }],
      cookie: chief,
      origin: "https://evil.example",
    });
    expect(res.status).not.toBe(200);
    expect(await res.text()).not.toContain(target.id);
    expect(await lockCount(target.email)).toBe(1);
  });
});

describe("security headers", () => {
  const expectHeaders = (res: Response, what: string) => {
    const h = Object.fromEntries(
      ["content-security-policy", "x-content-type-options", "referrer-policy"].map((k) => [k, res.headers.get(k)]),
    );
    expect({ what, ...h }).toEqual({
      what,
      "content-security-policy": expect.stringContaining("frame-ancestors 'none'"),
      "x-content-type-options": "nosniff",
      "referrer-policy": expect.stringMatching(/^(no-referrer|same-origin|strict-origin|strict-origin-when-cross-origin)$/),
    });
    expect(res.headers.get("content-security-policy")).toContain("default-src 'self'");
  };

  test.each([
    ["the sign-in page", "/sign-in", undefined],
    ["a signed-in page", "/today", "chief"],
    ["the 403 page", "/people", "student"],
    ["the 404 page", "/no-such-page-here", "chief"],
    ["an API answer", "/api/health", undefined],
    ["an API refusal", "/api/today", undefined],
    ["next-auth's session endpoint", "/api/auth/session", undefined],
    ["a redirect of a signed-out visitor", "/people", undefined],
  ])("%s (%s)", async (what, path, who) => {
    const cookie = who === "chief" ? chief : who === "student" ? await signInOrThrow(DEMO_ACCOUNTS.student, DEMO_PASSWORD) : undefined;
    const res = await fetch(`${BASE_URL}${path}`, { headers: cookie ? { cookie } : {}, redirect: "manual" });
    expectHeaders(res, `${what} ${res.status}`);
  });

  test("a static asset of the build", async () => {
    const html = await (await fetch(`${BASE_URL}/sign-in`)).text();
    const asset = html.match(/\/_next\/static\/[^"']+\.(?:js|css)/)?.[0];
    expect(asset).toBeDefined();
    expectHeaders(await fetch(`${BASE_URL}${asset}`), "asset");
  });

  test("robots.txt (keeps search engines out) and the favicon reach signed-out visitors; the pages' CSP lets the icon load", async () => {
    const robots = await fetch(`${BASE_URL}/robots.txt`, { redirect: "manual" });
    expect({ status: robots.status, type: robots.headers.get("content-type") }).toEqual({
      status: 200,
      type: expect.stringContaining("text/plain"),
    });
    expect((await robots.text()).split(/\r?\n/)).toEqual(expect.arrayContaining(["User-agent: *", "Disallow: /"]));
    const icon = await fetch(`${BASE_URL}/favicon.ico`, { redirect: "manual" });
    expect(icon.status).toBe(200);
    expect([...new Uint8Array(await icon.arrayBuffer()).slice(0, 4)]).toEqual([0, 0, 1, 0]); // ICO file header
    for (const res of [robots, icon]) expect(res.headers.get("x-content-type-options")).toBe("nosniff");
    const page = await fetch(`${BASE_URL}/sign-in`);
    expect(page.headers.get("content-security-policy")).toMatch(/(^|; )img-src 'self'/);
  });
});

describe("a second server of the same build whose database is unreachable", () => {
  let server: ChildProcess | undefined;
  let base = "";
  let browser: Browser | undefined;
  let log = "";

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

  beforeAll(async () => {
    const [webPort, deadDbPort] = [await freePort(), await freePort()];
    base = `http://127.0.0.1:${webPort}`;
    server = spawn(process.execPath, ["node_modules/next/dist/bin/next", "start", "-p", String(webPort), "-H", "127.0.0.1"], {
      env: {
        ...process.env,
        NODE_ENV: "production",
        NEXTAUTH_URL: base,
        DATABASE_URL: `postgres://chalkwing_app:x@127.0.0.1:${deadDbPort}/nowhere`,
      },
      stdio: ["ignore", "pipe", "pipe"],
    });
    server.stdout?.on("data", (d: Buffer) => (log += d.toString()));
    server.stderr?.on("data", (d: Buffer) => (log += d.toString()));
    for (let i = 0; i < 300; i++) {
      try {
        await fetch(`${base}/api/health`);
        return;
      } catch {
        await new Promise((r) => setTimeout(r, 200));
      }
    }
    throw new Error(`the second server did not answer:\n${log}`);
  });
  afterAll(async () => {
    await browser?.close();
    if (server && server.exitCode === null) {
      const exited = new Promise((r) => server!.once("exit", r));
      server.kill("SIGTERM");
      await exited;
    }
  });

  test("/api/health answers 503 with database unreachable; the main server answers ok", async () => {
    const down = await fetch(`${base}/api/health`);
    expect(down.status).toBe(503);
    expect(await down.json()).toMatchObject({ database: "unreachable" });
    const up = await fetch(`${BASE_URL}/api/health`);
    expect(up.status).toBe(200);
    expect(await up.json()).toEqual({ status: "ok", database: "ok" });
  });

  const noStack = (text: string) => {
    expect(text).not.toMatch(/\n\s+at .+\(/); // stack frames
    expect(text).not.toMatch(/ECONNREFUSED|SequelizeConnection|node_modules|\.tsx?:\d+/);
  };

  test("an API call there fails with a plain 500, no stack trace", async () => {
    const res = await fetch(`${base}/api/today`, { headers: { cookie: chief } });
    expect(res.status).toBe(500);
    const text = await res.text();
    expect(JSON.parse(text)).toEqual({ error: { status: 500, message: "Something went wrong on our side" } });
    noStack(text);
  });

  test("a page there shows the error page without a stack trace", async () => {
    browser = await launchBrowser();
    const page = await browser.context.newPage();
    await browser.context.addCookies([{ name: SESSION_COOKIE, value: chief.slice(SESSION_COOKIE.length + 1), url: base }]);
    const res = await page.goto(`${base}/today`);
    expect(res?.status()).toBe(500);
    await page.getByRole("heading", { name: "Something went wrong" }).waitFor({ timeout: 15_000 });
    noStack(await page.content());
    await screenshot(page, "security-error-page");
  });
});
