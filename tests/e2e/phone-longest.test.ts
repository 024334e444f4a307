// Nothing scrolls sideways on a phone (390x844) with the longest data: the student's, the sponsor's
// and the instructor's main pages, with the demo student's name, an assigned demo's name, the
// briefing title and the room of the student's sessions, and the sponsor's latest Weekly letter
// made as long as a person could write them (names of many words, a demo name at its limit of 120
// characters, a briefing title at its limit of 200, a room name at its limit of 100). The values are
// set for this file only and put back after it (the end-to-end layer runs its files one by one).
// Each page is checked to show the long values it should, so a page that lost them cannot pass.
import type { Client } from "pg";
import type { Page } from "playwright-core";
import { launchBrowser, screenshot, signIn, type Browser } from "./helpers/browser";
import { ownerClient } from "./helpers/db";
import { DEMO_ACCOUNTS } from "./helpers/accounts";

jest.setTimeout(300_000);

const PHONE = { width: 390, height: 844 };

const STUDENT = "Anastasia Wilhelmina Featherstonehaugh-Montgomery Abernethy";
const DEMO =
  "Why drag has a bucket, and where Vmd, Vmp and the stall move when the aircraft is heavy, the day is hot and the field is high".slice(
    0,
    120,
  );
const TITLE = (
  "Slower than the minimum drag speed: speed stability, the back of the drag curve and why a glider pilot, a tug pilot " +
  "and a light-aircraft pilot on a long final approach all meet the same runaway in different ways"
).slice(0, 200);
const ROOM = "Hangar classroom, north end of the airfield, past the fuel bay and the glider trailers, upstairs".slice(0, 100);

let db: Client;
const ids: Record<string, string> = {};
const before: Record<string, string> = {};
let letter: { id: string; subject: string; body: string } | null = null;

beforeAll(async () => {
  expect(DEMO).toHaveLength(120);
  expect(TITLE).toHaveLength(200);
  expect(ROOM.length).toBeGreaterThan(90);
  db = await ownerClient();
  const one = async (sql: string, params: unknown[] = []) => {
    const { rows } = await db.query<Record<string, string>>(sql, params);
    if (!rows[0]) throw new Error(`fixture not found: ${sql}`);
    return rows[0];
  };
  const student = await one(`SELECT id, name FROM people WHERE email = $1`, [DEMO_ACCOUNTS.student]);
  ids.student = student.id!;
  before.student = student.name!;
  ids.sponsor = (await one(`SELECT id FROM people WHERE email = $1`, [DEMO_ACCOUNTS.sponsor])).id!;
  // an assigned demo the student may open
  const demo = await one(
    `SELECT d.id, d.name FROM demos d JOIN assignment_students a ON a.demo_id = d.id
      WHERE a.student_id = $1 AND d.deleted_at IS NULL ORDER BY d.name LIMIT 1`,
    [ids.student],
  );
  ids.demo = demo.id!;
  before.demo = demo.name!;
  // the student's next session: its briefing (current revision) and its room
  const session = await one(
    `SELECT s.id, s.briefing_id, b.current_revision_id, r.title, s.room_id, rm.name AS room
       FROM training_sessions s JOIN session_attendees a ON a.session_id = s.id JOIN briefings b ON b.id = s.briefing_id
       JOIN briefing_revisions r ON r.id = b.current_revision_id JOIN rooms rm ON rm.id = s.room_id
      WHERE a.student_id = $1 AND s.status = 'scheduled' AND s.starts_at > now() ORDER BY s.starts_at LIMIT 1`,
    [ids.student],
  );
  ids.session = session.id!;
  ids.briefing = session.briefing_id!;
  ids.briefingRevision = session.current_revision_id!;
  ids.room = session.room_id!;
  before.title = session.title!;
  before.room = session.room!;
  // the sponsor's latest Weekly letter, written about the student with the long name
  const { rows } = await db.query<{ id: string; subject: string; body_text: string }>(
    `SELECT o.id, o.subject, o.body_text FROM outbox o JOIN mail_deliveries d ON d.outbox_id = o.id
      WHERE o.recipient_id = $1 AND o.kind = 'weekly.letter' AND o.state = 'sent' ORDER BY d.delivered_at DESC LIMIT 1`,
    [ids.sponsor],
  );
  letter = rows[0] ? { id: rows[0].id, subject: rows[0].subject, body: rows[0].body_text } : null;
  expect(letter).not.toBeNull(); // the demo ships with letters already sent

  await db.query(`UPDATE people SET name = $2 WHERE id = $1`, [ids.student, STUDENT]);
  await db.query(`UPDATE demos SET name = $2 WHERE id = $1`, [ids.demo, DEMO]);
  await setTitle(TITLE);
  await db.query(`UPDATE rooms SET name = $2 WHERE id = $1`, [ids.room, ROOM]);
  const long = (s: string) => s.replaceAll(before.student!, STUDENT).replaceAll(before.title!, TITLE).replaceAll(before.room!, ROOM);
  await db.query(`UPDATE outbox SET subject = $2, body_text = $3 WHERE id = $1`, [
    letter!.id,
    long(letter!.subject),
    `${long(letter!.body)}\n\nNext: ${TITLE} in ${ROOM}.`,
  ]);
});

afterAll(async () => {
  if (!db) return;
  // every value is put back (one after the other on the one connection), even if one of them fails
  const errors: unknown[] = [];
  const putBack = async (run: () => Promise<unknown>) => {
    try {
      await run();
    } catch (e) {
      errors.push(e);
    }
  };
  if (before.student) await putBack(() => db.query(`UPDATE people SET name = $2 WHERE id = $1`, [ids.student, before.student]));
  if (before.demo) await putBack(() => db.query(`UPDATE demos SET name = $2 WHERE id = $1`, [ids.demo, before.demo]));
  if (before.room) await putBack(() => db.query(`UPDATE rooms SET name = $2 WHERE id = $1`, [ids.room, before.room]));
  if (letter)
    await putBack(() =>
      db.query(`UPDATE outbox SET subject = $2, body_text = $3 WHERE id = $1`, [letter!.id, letter!.subject, letter!.body]),
    );
  if (before.title) await putBack(() => setTitle(before.title!));
  await db.end();
  if (errors.length) throw errors[0];
});

/**
 * Briefing revisions are append-only (a trigger refuses any change): for this file only, the
 * title of the current revision is changed with the table's own triggers held off, in one
 * transaction, and put back the same way after.
 */
async function setTitle(title: string) {
  await db.query("BEGIN");
  try {
    await db.query("ALTER TABLE briefing_revisions DISABLE TRIGGER USER");
    await db.query(`UPDATE briefing_revisions SET title = $2 WHERE id = $1`, [ids.briefingRevision, title]);
    await db.query("ALTER TABLE briefing_revisions ENABLE TRIGGER USER");
    await db.query("COMMIT");
  } catch (e) {
    await db.query("ROLLBACK");
    throw e;
  }
}

/** The page at 390 px: no sideways scrolling, and the long values it should show are there. */
async function fitsThePhone(page: Page, path: string, shows: string[], shot: string) {
  const res = await page.goto(path);
  expect(res?.status()).toBe(200);
  await page.waitForLoadState("networkidle");
  const text = (await page.locator("main").innerText()).replace(/\s+/g, " ");
  for (const s of shows) expect({ path, shows: text.includes(s) ? s : `missing: ${s}` }).toEqual({ path, shows: s });
  const wide = await page.evaluate(() => document.documentElement.scrollWidth);
  expect({ path, scrollWidth: wide <= PHONE.width ? "fits" : wide }).toEqual({ path, scrollWidth: "fits" });
  await screenshot(page, `longest-${shot}-390`);
}

async function asPhone(email: string, walk: (page: Page) => Promise<void>) {
  const browser: Browser = await launchBrowser(PHONE);
  try {
    const page = await browser.context.newPage();
    await signIn(page, email);
    await walk(page);
  } finally {
    await browser.close();
  }
}

test("the student's main pages fit the phone with the longest name, demo, briefing title and room", async () => {
  await asPhone(DEMO_ACCOUNTS.student, async (p) => {
    await fitsThePhone(p, "/today", [], "student-today");
    await fitsThePhone(p, "/timetable", [TITLE], "student-timetable");
    await fitsThePhone(p, `/timetable/${ids.session}`, [TITLE, ROOM], "student-session");
    await fitsThePhone(p, "/ground-log", [], "student-ground-log");
    await fitsThePhone(p, "/curve-lab", [DEMO], "student-curve-lab");
    await fitsThePhone(p, `/curve-lab/demos/${ids.demo}`, [DEMO], "student-demo");
    await fitsThePhone(p, `/briefings/${ids.briefing}`, [TITLE], "student-briefing");
    await fitsThePhone(p, "/progress", [], "student-progress");
    await fitsThePhone(p, "/sharing", [], "student-sharing");
  });
});

test("the sponsor's main pages fit the phone, the Weekly letter included", async () => {
  await asPhone(DEMO_ACCOUNTS.sponsor, async (p) => {
    await fitsThePhone(p, "/today", [STUDENT], "sponsor-today");
    await fitsThePhone(p, `/progress/${ids.student}`, [STUDENT], "sponsor-progress");
    await fitsThePhone(p, "/letters", [STUDENT], "sponsor-letters");
    await fitsThePhone(p, `/letters/${letter!.id}`, [STUDENT, TITLE, ROOM], "sponsor-letter");
  });
});

test("the instructor's main pages fit the phone", async () => {
  await asPhone(DEMO_ACCOUNTS.instructor, async (p) => {
    await fitsThePhone(p, "/today", [STUDENT], "instructor-today");
    await fitsThePhone(p, "/timetable", [TITLE], "instructor-timetable");
    await fitsThePhone(p, `/timetable/${ids.session}`, [TITLE, ROOM, STUDENT], "instructor-session");
    await fitsThePhone(p, "/records", [STUDENT], "instructor-records");
    await fitsThePhone(p, `/records/${ids.student}`, [STUDENT], "instructor-record");
    await fitsThePhone(p, "/curve-lab", [DEMO], "instructor-curve-lab");
    await fitsThePhone(p, `/curve-lab/demos/${ids.demo}`, [DEMO], "instructor-demo");
    await fitsThePhone(p, "/briefings", [TITLE], "instructor-briefings");
    await fitsThePhone(p, `/briefings/${ids.briefing}`, [TITLE], "instructor-briefing");
    await fitsThePhone(p, `/sharing/${ids.student}`, [STUDENT], "instructor-sharing");
  });
});
