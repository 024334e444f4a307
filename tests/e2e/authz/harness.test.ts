// The authorisation harness: every endpoint derived from the code (derive.ts) is called over
// HTTP against the production build by every caller (signed out, chief, instructor, student,
// sponsor) and must answer what table.ts says. Refused calls must change no rows and leak no
// identifiers of the target. To add a row, see the header of table.ts.
import type { Client } from "pg";
import { BASE_URL } from "../helpers/browser";
import { callAction, actionResultFromRsc, signInOrThrow } from "../helpers/http";
import { ownerClient, fingerprint, changedTables } from "../helpers/db";
import { deriveEndpoints, fillPath, type Endpoint } from "./derive";
import { loadFixtures, prepareHarnessTargets } from "./fixtures";
import { TABLE } from "./table";
import { CALLERS, type Caller, type EndpointCase, type EndpointRequest, type Fixtures, type HarnessResponse } from "./types";

const ACCOUNTS: Record<Exclude<Caller, "signedOut">, string> = {
  chief: "chief@chalkwing.test",
  instructor: "instructor@chalkwing.test",
  student: "student@chalkwing.test",
  sponsor: "sponsor@chalkwing.test",
};
const CALLER_FIXTURE: Record<Exclude<Caller, "signedOut">, string> = {
  chief: "chief",
  instructor: "instructor",
  student: "student",
  sponsor: "sponsor",
};
const PLACEHOLDER_ID = "00000000-0000-4000-8000-000000000000";
const UUID = /[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/gi;

const endpoints = deriveEndpoints();
const cases = endpoints
  .map((e) => ({ e, row: TABLE[e.key] }))
  .filter((x): x is { e: Endpoint; row: EndpointCase } => !!x.row && !("skip" in x.row));

let db: Client;
let fx: Fixtures;
const cookies: Partial<Record<Caller, string>> = {};

beforeAll(async () => {
  db = await ownerClient();
  await prepareHarnessTargets(db);
  fx = await loadFixtures(db);
  for (const [caller, email] of Object.entries(ACCOUNTS)) cookies[caller as Caller] = await signInOrThrow(email, "chalkwing-demo");
});
afterAll(async () => {
  await db?.end();
});

async function send(e: Endpoint, req: EndpointRequest, cookie: string | undefined): Promise<HarnessResponse> {
  if (e.kind === "route") {
    const url = `${BASE_URL}${fillPath(e.path, req.params)}${req.query ? `?${req.query}` : ""}`;
    const headers: Record<string, string> = { accept: "application/json" };
    if (cookie) headers.cookie = cookie;
    let body: string | Blob | undefined;
    if (!["GET", "HEAD"].includes(e.method)) {
      headers.origin = BASE_URL; // the app's own pages are the only legitimate senders
      if (req.rawBody !== undefined) {
        body = typeof req.rawBody === "string" ? req.rawBody : new Blob([new Uint8Array(req.rawBody)]);
        headers["content-type"] = req.contentType ?? "application/octet-stream";
      } else if (req.body !== undefined) {
        body = JSON.stringify(req.body);
        headers["content-type"] = "application/json";
      }
    }
    const res = await fetch(url, { method: e.method, headers, body, redirect: "manual" });
    const text = await res.text();
    let json: unknown;
    if (res.headers.get("content-type")?.includes("json")) {
      try {
        json = JSON.parse(text);
      } catch {
        json = undefined;
      }
    }
    return { status: res.status, json, text, headers: res.headers };
  }
  const page = e.pages.find((p) => !p.includes("[")) ?? e.pages[0];
  if (!page) throw new Error(`${e.key}: no page in the build uses this action, so it cannot be called`);
  // the page only routes the POST to the code that holds the action; segments the row does not give get a placeholder
  const res = await callAction({ actionId: e.id, pagePath: fillPath(page, req.params, PLACEHOLDER_ID), args: req.args ?? [], cookie });
  const text = await res.text();
  // proxy.ts sends signed-out visitors of signed-in pages to sign-in before the action runs: that is the 401 of an action
  const location = res.headers.get("location") ?? "";
  if (res.status >= 300 && res.status < 400 && new URL(location, BASE_URL).pathname === "/sign-in")
    return { status: 401, json: undefined, text, headers: res.headers };
  if (res.status !== 200) return { status: res.status, json: undefined, text, headers: res.headers };
  const json = actionResultFromRsc(text);
  const r = json as { ok?: boolean; status?: number } | undefined;
  const status = r?.ok === true ? 200 : typeof r?.status === "number" ? r.status : 500;
  return { status, json, text, headers: res.headers };
}

function expected(c: EndpointCase, caller: Caller) {
  const x = c.expect[caller];
  return typeof x === "number" ? { status: x, check: undefined } : x;
}

describe("the authorisation table matches the code", () => {
  test("every endpoint derived from the code has a row", () => {
    const missing = endpoints.map((e) => e.key).filter((k) => !(k in TABLE));
    expect(missing).toEqual([]);
  });
  test("every row names an endpoint that exists", () => {
    const known = new Set(endpoints.map((e) => e.key));
    expect(Object.keys(TABLE).filter((k) => !known.has(k))).toEqual([]);
  });
  test("the derivation found the foundation's endpoints", () => {
    // a guard against the derivation silently finding nothing
    const keys = endpoints.map((e) => e.key);
    expect(keys).toEqual(
      expect.arrayContaining(["GET /api/health", "GET /api/today", "action app/(app)/today/actions.ts#unlockAccountAction"]),
    );
  });
  test("the row fingerprint sees a change in any table (checked inside a rolled-back transaction)", async () => {
    await db.query("BEGIN");
    try {
      const before = await fingerprint(db);
      await db.query(`UPDATE people SET name = name || ' ' WHERE lower(email) = 'student@chalkwing.test'`);
      await db.query(`UPDATE sign_in_throttle SET failures = failures + 1 WHERE email = 'locked.harness@chalkwing.test'`);
      expect(changedTables(before, await fingerprint(db))).toEqual(["public.people", "public.sign_in_throttle"]);
    } finally {
      await db.query("ROLLBACK");
    }
  });
  test("skipped rows give a reason", () => {
    for (const [k, row] of Object.entries(TABLE))
      if ("skip" in row) expect(`${k}: ${row.skip.trim()}`.length).toBeGreaterThan(k.length + 10);
  });
});

describe.each(cases.map(({ e, row }) => [e.key, e, row] as const))("%s", (_key, e, row) => {
  test.each(CALLERS)("as %s", async (caller) => {
    const want = expected(row, caller);
    const req = row.request?.(fx, caller) ?? {};
    const allowed = want.status >= 200 && want.status < 300;
    const watchRows = !(allowed && row.mutates);
    const before = watchRows ? await fingerprint(db) : null;
    const res = await send(e, req, cookies[caller]);
    const after = watchRows ? await fingerprint(db) : null;

    expect({ caller, status: res.status, body: res.status === want.status ? "" : res.text.slice(0, 300) }).toEqual({
      caller,
      status: want.status,
      body: "",
    });
    if (before && after) expect({ caller, changed: changedTables(before, after) }).toEqual({ caller, changed: [] });
    if (!allowed) {
      // no identifier of the target: no secret string and no uuid the caller did not send or own
      const given = new Set<string>(
        JSON.stringify(req)
          .match(UUID)
          ?.map((u) => u.toLowerCase()) ?? [],
      );
      given.add(PLACEHOLDER_ID);
      if (caller !== "signedOut") given.add(fx[CALLER_FIXTURE[caller]]!.toLowerCase());
      const leaked = (res.text.match(UUID) ?? []).map((u) => u.toLowerCase()).filter((u) => !given.has(u));
      expect({ caller, leakedIds: leaked }).toEqual({ caller, leakedIds: [] });
      for (const s of row.secrets?.(fx) ?? []) {
        if (s) expect({ caller, leaked: res.text.toLowerCase().includes(s.toLowerCase()) ? s : null }).toEqual({ caller, leaked: null });
      }
    }
    await want.check?.(res, fx);
  });
});
