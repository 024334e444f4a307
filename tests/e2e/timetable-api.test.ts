// The Timetable's and rosters' HTTP edges against the production build: query validation naming
// the parameter, the roster upload's size and type checks, and a refused import writing nothing.
import { BASE_URL } from "./helpers/browser";
import { signInOrThrow } from "./helpers/http";
import { ownerClient } from "./helpers/db";
import type { Client } from "pg";

let chief: string;
let db: Client;
beforeAll(async () => {
  chief = await signInOrThrow("chief@chalkwing.test", "chalkwing-demo");
  db = await ownerClient();
});
afterAll(async () => {
  await db?.end();
});

const get = (path: string) => fetch(`${BASE_URL}${path}`, { headers: { cookie: chief, accept: "application/json" } });
const upload = (mode: string, body: string | Buffer, type = "text/csv") =>
  fetch(`${BASE_URL}/api/roster/import?mode=${mode}`, {
    method: "POST",
    headers: { cookie: chief, origin: BASE_URL, "content-type": type },
    body: typeof body === "string" ? body : new Uint8Array(body),
  });

describe("GET /api/sessions query validation", () => {
  it.each([
    ["page=0", "page", /^page: at least 1$/],
    ["pageSize=500", "pageSize", /^pageSize: at most 100$/],
    ["sort=colour", "sort", /^sort: one of starts_at, briefing, room, instructor, cohort$/],
    ["from=2026-13-40", "from", /^from: /],
    ["cohort=kestrel", "cohort", /^cohort: not a valid id$/],
    ["colour=blue", "colour", /^colour: unknown parameter$/],
    ["from=2026-12-10&to=2026-12-01", "to", /^to: must not be before from$/],
  ])("?%s is a 400 naming %s", async (qs, field, message) => {
    const res = await get(`/api/sessions?${qs}`);
    expect(res.status).toBe(400);
    const body = (await res.json()) as { error: { field: string; message: string } };
    expect(body.error.field).toBe(field);
    expect(body.error.message).toMatch(message);
  });

  it("pages and sorts on the server", async () => {
    const a = (await (await get("/api/sessions?pageSize=3&page=1&sort=starts_at&dir=asc")).json()) as {
      rows: { startsAt: string }[];
      total: number;
      pages: number;
    };
    const b = (await (await get("/api/sessions?pageSize=3&page=2&sort=starts_at&dir=asc")).json()) as { rows: { startsAt: string }[] };
    expect(a.rows).toHaveLength(3);
    expect(a.pages).toBe(Math.ceil(a.total / 3));
    expect(a.rows[2]!.startsAt <= b.rows[0]!.startsAt).toBe(true);
    const desc = (await (await get("/api/sessions?pageSize=1&sort=starts_at&dir=desc")).json()) as { rows: { startsAt: string }[] };
    const last = (await (await get(`/api/sessions?pageSize=1&page=${a.total}&sort=starts_at&dir=asc`)).json()) as {
      rows: { startsAt: string }[];
    };
    expect(desc.rows[0]!.startsAt).toBe(last.rows[0]!.startsAt);
  });
});

describe("POST /api/roster/import", () => {
  it("one byte over the cap is 413, a non-CSV type 415, non-UTF-8 bytes 415, a bad mode 400: nothing written", async () => {
    const people = async () => Number((await db.query(`SELECT count(*) FROM people`)).rows[0].count);
    const before = await people();
    const big = Buffer.alloc(256 * 1024 + 1, "a");
    expect((await upload("preview", big)).status).toBe(413);
    expect((await upload("preview", "name,email,cohort\n", "application/json")).status).toBe(415);
    expect((await upload("preview", Buffer.from([0x6e, 0x61, 0xff, 0xfe, 0x0a]))).status).toBe(415);
    const bad = await upload("publish", "name,email,cohort\n");
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { field: string } }).error.field).toBe("mode");
    expect(await people()).toBe(before);
  });

  it("a commit with a problem row is refused with the line named, and writes no row and no mail", async () => {
    const good = "import.good@chalkwing.test";
    const csv = `name;e-mail;cohort\nGood Row;${good};Kestrel cohort\nNo Mail;not-an-address;Kestrel cohort\n`;
    const res = await upload("commit", csv);
    expect(res.status).toBe(422);
    expect(((await res.json()) as { error: { message: string } }).error.message).toBe("line 3: e-mail: not a valid address");
    expect((await db.query(`SELECT count(*)::int AS n FROM people WHERE email = $1`, [good])).rows[0].n).toBe(0);
    expect((await db.query(`SELECT count(*)::int AS n FROM outbox WHERE to_address = $1`, [good])).rows[0].n).toBe(0);
  });

  it("a clean file (BOM, semicolons, quoted commas) imports and queues invitations", async () => {
    const email = "quoted.comma@chalkwing.test";
    const csv = `\uFEFFName;E-mail;Cohort\n"Solberg, Ingrid";${email};Merlin cohort\n`;
    const res = await upload("commit", csv);
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ created: 1, invitations: 1, sponsorsLinked: 0 });
    const row = (
      await db.query(
        `SELECT p.name, c.name AS cohort FROM people p JOIN cohort_memberships m ON m.student_id = p.id JOIN cohorts c ON c.id = m.cohort_id WHERE p.email = $1`,
        [email],
      )
    ).rows[0];
    expect(row).toEqual({ name: "Solberg, Ingrid", cohort: "Merlin cohort" });
    expect((await db.query(`SELECT kind FROM outbox WHERE to_address = $1`, [email])).rows).toEqual([{ kind: "invitation" }]);
  });
});
