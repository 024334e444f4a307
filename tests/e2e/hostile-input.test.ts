// Hostile input against the production build: server-action requests refused in proxy.ts
// before the framework sees them (missing/foreign/null Origin 403, oversized body 413, a body
// that is not JSON or nests too deeply 400), the nonce-based Content-Security-Policy (pages
// still hydrate; an injected inline script does not run), sign-in's `next` kept on this site,
// /api/auth/session after sign-out, and handout downloads (404 out of reach, own headers).
import type { Client } from "pg";
import type { Page } from "playwright-core";
import { launchBrowser, signIn, BASE_URL, DEMO_PASSWORD, type Browser } from "./helpers/browser";
import { callAction, signInOrThrow, signOutHttp } from "./helpers/http";
import { ownerClient } from "./helpers/db";
import { DEMO_ACCOUNTS, demoSchoolId, makeAccount } from "./helpers/accounts";
import { deriveActions } from "./authz/derive";

let db: Client;
let chief: string;
let browser: Browser;
let page: Page;

beforeAll(async () => {
  db = await ownerClient();
  chief = await signInOrThrow(DEMO_ACCOUNTS.chief, DEMO_PASSWORD);
  browser = await launchBrowser();
  page = await browser.context.newPage();
});
afterAll(async () => {
  await browser?.close();
  await db?.end();
});

/** A person of the demo school with a sign-in lock, made directly in the database. */
async function lockedTarget(label: string): Promise<{ id: string; email: string }> {
  const email = `e2e.hostile.${label}.${Date.now()}@chalkwing.test`;
  const { rows } = await db.query<{ id: string }>(
    `INSERT INTO people (school_id, name, email, roles) VALUES ($1, $2, $3, ARRAY['student']) RETURNING id`,
    [await demoSchoolId(db), `E2E hostile ${label}`, email],
  );
  await db.query(
    `INSERT INTO sign_in_throttle (email, address, failures, locked_until) VALUES ($1, '192.0.2.7', 10, now() + interval '15 minutes')`,
    [email],
  );
  return { id: rows[0]!.id, email };
}
const lockCount = async (email: string) => (await db.query(`SELECT 1 FROM sign_in_throttle WHERE email = $1`, [email])).rowCount ?? -1;

function unlockActionId(): string {
  const action = deriveActions().find((a) => a.exportedName === "unlockAccountAction");
  if (!action) throw new Error("unlockAccountAction is not in the build's action manifest");
  return action.id;
}

/** Posts a raw body as a server action of /today, as the chief, from our own origin unless told otherwise. */
function rawAction(body: string, headers: Record<string, string> = {}): Promise<Response> {
  return fetch(`${BASE_URL}/today`, {
    method: "POST",
    redirect: "manual",
    headers: {
      "Next-Action": unlockActionId(),
      "Content-Type": "text/plain;charset=UTF-8",
      Accept: "text/x-component",
      Origin: BASE_URL,
      cookie: chief,
      ...headers,
    },
    body,
  });
}

describe("server-action requests are checked before the framework runs them", () => {
  test.each([
    ["no Origin", null],
    ["Origin: null", "null"],
    ["a foreign Origin", "https://evil.example"],
  ])("with the session cookie and %s: 403 naming origin, and the action does not run", async (_label, origin) => {
    const target = await lockedTarget("origin");
    const res = await callAction({
      actionId: unlockActionId(),
      pagePath: "/today",
      args: [{ personId: target.id }],
      cookie: chief,
      origin,
    });
    expect(res.status).toBe(403);
    expect(await res.json()).toEqual({ error: { status: 403, message: "Cross-site request refused", field: "origin" } });
    expect(await lockCount(target.email)).toBe(1);
  });

  test("the same call from our own origin runs (the refusals above were the Origin's doing)", async () => {
    const target = await lockedTarget("own-origin");
    const res = await callAction({ actionId: unlockActionId(), pagePath: "/today", args: [{ personId: target.id }], cookie: chief });
    expect(res.status).toBe(200);
    expect(await lockCount(target.email)).toBe(0);
  });

  test("a body over 1 MB is a 413 naming body", async () => {
    const res = await rawAction(JSON.stringify([{ personId: "x".repeat(1024 * 1024 + 10) }]));
    expect(res.status).toBe(413);
    expect(await res.json()).toMatchObject({ error: { status: 413, field: "body" } });
  });

  test("a body that is not JSON is a 400 naming body", async () => {
    const res = await rawAction("this is not JSON {");
    expect(res.status).toBe(400);
    expect(await res.json()).toEqual({ error: { status: 400, message: "body: not valid JSON", field: "body" } });
  });

  test("deeply nested arrays are a 400 naming body", async () => {
    const res = await rawAction(`${"[".repeat(50_000)}${"]".repeat(50_000)}`);
    expect(res.status).toBe(400);
    expect(await res.json()).toEqual({ error: { status: 400, message: "body: nested more than 32 levels deep", field: "body" } });
  });

  test("a content type no form sends is a 400 naming body", async () => {
    const res = await rawAction("a=1", { "Content-Type": "application/x-www-form-urlencoded" });
    expect(res.status).toBe(400);
    expect(await res.json()).toMatchObject({ error: { status: 400, field: "body" } });
  });
});

describe("Content-Security-Policy with a nonce per request", () => {
  const scriptSrc = (csp: string) =>
    csp
      .split(";")
      .find((d) => d.trim().startsWith("script-src"))!
      .trim();

  test("a page's CSP allows scripts by nonce only, every script tag carries that nonce, and the nonce changes per request", async () => {
    const first = await fetch(`${BASE_URL}/today`, { headers: { cookie: chief } });
    const second = await fetch(`${BASE_URL}/today`, { headers: { cookie: chief } });
    expect(first.status).toBe(200);
    const csp = first.headers.get("content-security-policy")!;
    expect(first.headers.get("content-security-policy")).not.toContain(",");
    const src = scriptSrc(csp);
    expect(src).not.toContain("'unsafe-inline'");
    expect(src).toContain("'strict-dynamic'");
    const nonce = /'nonce-([^']+)'/.exec(src)![1]!;
    const html = await first.text();
    const tags = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
    expect(tags.length).toBeGreaterThan(0);
    for (const tag of tags) expect(tag).toContain(`nonce="${nonce}"`);
    const other = /'nonce-([^']+)'/.exec(scriptSrc(second.headers.get("content-security-policy")!))![1];
    expect(other).not.toBe(nonce);
  });

  test("the sign-in page gets a nonce too", async () => {
    const res = await fetch(`${BASE_URL}/sign-in`);
    expect(scriptSrc(res.headers.get("content-security-policy")!)).toMatch(/'nonce-[^']+'/);
  });

  test("in the browser the page hydrates (sign-in works through its form) and a script injected into the page does not run", async () => {
    await browser.context.clearCookies();
    const violations: string[] = [];
    page.on("console", (m) => {
      if (m.type() === "error" && /Content Security Policy/i.test(m.text())) violations.push(m.text());
    });
    await signIn(page, DEMO_ACCOUNTS.instructor);
    expect(new URL(page.url()).pathname).toBe("/today");
    expect(violations).toEqual([]); // the app's own scripts all ran under the policy
    // what a stored script injection would look like: an inline script in the served HTML,
    // under the response's own headers (and so its nonce policy)
    await page.route("**/timetable", async (route) => {
      const response = await route.fetch();
      const body = (await response.text()).replace("</body>", "<script>window.__injected = 1</script></body>");
      await route.fulfill({ response, body });
    });
    await page.goto("/timetable");
    await page.waitForLoadState("networkidle");
    expect(await page.evaluate(() => (window as unknown as { __injected?: number }).__injected ?? null)).toBeNull();
    expect(violations.length).toBeGreaterThan(0);
    // the page's own (nonce-carrying) scripts still ran: Next.js's bootstrap sets window.next
    expect(await page.evaluate(() => typeof (window as unknown as { next?: { version?: unknown } }).next?.version)).toBe("string");
    await page.unroute("**/timetable");
  });
});

describe("sign-in's next stays on this site", () => {
  test("signed in, /sign-in?next=/%5Cevil.example/x goes to /today, not off-site", async () => {
    const res = await fetch(`${BASE_URL}/sign-in?next=/%5Cevil.example/x`, { headers: { cookie: chief }, redirect: "manual" });
    expect([303, 307, 308]).toContain(res.status);
    expect(new URL(res.headers.get("location")!, BASE_URL).href).toBe(`${BASE_URL}/today`);
  });

  test("through the form, next=/%5Cevil.example/x lands on /today of this site", async () => {
    await browser.context.clearCookies();
    await page.goto("/sign-in?next=/%5Cevil.example/x");
    await page.fill("#email", DEMO_ACCOUNTS.student);
    await page.fill("#password", DEMO_PASSWORD);
    await Promise.all([page.waitForURL((u) => !u.pathname.startsWith("/sign-in"), { timeout: 15_000 }), page.click("button[type=submit]")]);
    expect(new URL(page.url()).origin).toBe(new URL(BASE_URL).origin);
    expect(new URL(page.url()).pathname).toBe("/today");
  });

  test("a same-site next is kept", async () => {
    const res = await fetch(`${BASE_URL}/sign-in?next=${encodeURIComponent("/timetable?x=1")}`, {
      headers: { cookie: chief },
      redirect: "manual",
    });
    expect(new URL(res.headers.get("location")!, BASE_URL).href).toBe(`${BASE_URL}/timetable?x=1`);
  });
});

test("after sign-out, /api/auth/session with the old cookie returns no identity", async () => {
  const acct = await makeAccount(db, "session-end", "hostile-input-pass-1");
  const cookie = await signInOrThrow(acct.email, acct.password);
  const before = await (await fetch(`${BASE_URL}/api/auth/session`, { headers: { cookie } })).json();
  expect(before).toMatchObject({ user: { id: acct.id } });
  await signOutHttp(cookie);
  const after = await (await fetch(`${BASE_URL}/api/auth/session`, { headers: { cookie } })).json();
  expect(after).toEqual({});
});

describe("handout downloads", () => {
  const handoutId = async () =>
    (
      await db.query<{ id: string }>(`SELECT id FROM handouts WHERE file_name = 'drag-curve-and-vmd.pdf' AND school_id = $1`, [
        await demoSchoolId(db),
      ])
    ).rows[0]!.id;

  test("out of the caller's reach answers 404 with the same body as an unknown id", async () => {
    const outsider = await makeAccount(db, "no-cohort", "hostile-input-pass-2", ["student"]);
    const cookie = await signInOrThrow(outsider.email, outsider.password);
    const hidden = await fetch(`${BASE_URL}/api/handouts/${await handoutId()}`, { headers: { cookie } });
    const unknown = await fetch(`${BASE_URL}/api/handouts/00000000-0000-4000-8000-000000000000`, { headers: { cookie } });
    expect(hidden.status).toBe(404);
    expect(unknown.status).toBe(404);
    expect(await hidden.text()).toBe(await unknown.text());
  });

  test("a download keeps its own sandbox CSP and Referrer-Policy, not the site-wide ones", async () => {
    const res = await fetch(`${BASE_URL}/api/handouts/${await handoutId()}`, { headers: { cookie: chief } });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-security-policy")).toBe("sandbox; default-src 'none'");
    expect(res.headers.get("referrer-policy")).toBe("no-referrer");
    expect(res.headers.get("x-content-type-options")).toBe("nosniff");
  });
});
