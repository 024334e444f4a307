// End to end, on a phone (390x844) in headless Chromium against the production build: the chief
// enrols one new student on the Roster, the student's items are checked and signed off (the first
// sign-off on the student's record page, re-entering the password; the rest through the same server
// actions over HTTP, as the pages call them), each stage check is passed; the End of training screen
// then lists what is still missing (the course's 35 h minimum of ground training, 14 CFR 141.95(a)),
// the student attends ground sessions for it (scheduled and their attendance recorded through the
// Timetable's server actions over HTTP), and the chief graduates the student on the End of training
// screen (a missing reason is named beside its field first),
// then downloads the graduation certificate and reads its text with pdftotext (Debian's
// poppler-utils, installed by the test command when missing).
import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { randomUUID } from "node:crypto";
import { tmpdir } from "node:os";
import path from "node:path";
import type { Client } from "pg";
import type { Page } from "playwright-core";
import { launchBrowser, signIn, screenshot, DEMO_PASSWORD, type Browser } from "./helpers/browser";
import { ownerClient } from "./helpers/db";
import { callAction, actionResultFromRsc, signInOrThrow } from "./helpers/http";
import { deriveActions } from "./authz/derive";

let phone: Browser;
let db: Client;
let page: Page;
const tag = randomUUID().slice(0, 8);
const name = `Rowan Ellery ${tag}`;
const email = `rowan.ellery.${tag}@chalkwing.test`;

beforeAll(async () => {
  phone = await launchBrowser({ width: 390, height: 844 });
  db = await ownerClient();
  page = await phone.context.newPage();
});
afterAll(async () => {
  await phone?.close();
  await db?.end();
});

function actionId(key: string): string {
  const a = deriveActions().find((x) => x.key === `action ${key}`);
  if (!a) throw new Error(`no action ${key} in the build`);
  return a.id;
}

async function act(cookie: string, key: string, pagePath: string, input: Record<string, unknown>) {
  const res = await callAction({ actionId: actionId(key), pagePath, args: [input], cookie });
  const r = actionResultFromRsc(await res.text()) as { ok: boolean; message?: string; data?: Record<string, unknown> };
  if (!r?.ok) throw new Error(`${key}: ${JSON.stringify(r)}`);
  return r;
}

async function noSidewaysScroll() {
  expect(await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)).toBeLessThanOrEqual(0);
}

describe("from enrolment to graduation", () => {
  it("enrols a student, records and signs every item, passes every stage, graduates them and hands out the certificate", async () => {
    // ---- enrolment: the chief adds the student on the Roster
    await signIn(page, "chief@chalkwing.test");
    await page.goto("/roster");
    await page.fill("#add-name", name);
    await page.fill("#add-email", email);
    await page.click("form[aria-labelledby=add-title] button[type=submit]");
    await page.waitForSelector(`p[role=status]:has-text("${name} added")`);
    const { rows: enrolled } = await db.query<{ id: string; revision_id: string }>(
      `SELECT p.id, e.revision_id FROM people p JOIN enrolments e ON e.student_id = p.id AND e.status = 'active' WHERE p.email = $1`,
      [email],
    );
    expect(enrolled).toHaveLength(1);
    const studentId = enrolled[0]!.id;
    const { rows: invitation } = await db.query(`SELECT 1 FROM outbox WHERE kind = 'invitation' AND recipient_id = $1`, [studentId]);
    expect(invitation).toHaveLength(1);

    const { rows: items } = await db.query<{ id: string; code: string; stage_id: string }>(
      `SELECT i.id, i.code, i.stage_id FROM syllabus_items i JOIN syllabus_stages s ON s.id = i.stage_id
        WHERE i.revision_id = $1 ORDER BY s.position, i.position`,
      [enrolled[0]!.revision_id],
    );
    expect(items.length).toBeGreaterThan(1);
    const stages = [...new Set(items.map((i) => i.stage_id))];
    const cookie = await signInOrThrow("chief@chalkwing.test", DEMO_PASSWORD);
    const record = `/records/${studentId}`;
    const minuteAgo = () => new Date(Date.now() - 60_000).toISOString();

    for (const [n, stageId] of stages.entries()) {
      const own = items.filter((i) => i.stage_id === stageId);
      for (const [k, item] of own.entries()) {
        // ---- an oral check on the item, Solid on a required element
        await act(cookie, "app/(app)/records/actions.ts#recordCheckAction", record, {
          studentId,
          itemIds: [item.id],
          levelShown: "correlation",
          remarks: "",
          durationMinutes: 12,
          occurredAt: minuteAgo(),
          questions: [{ syllabusItemId: item.id, questionText: `Explain ${item.code}`, outcome: "solid", required: true }],
          idempotencyKey: `grad-${tag}-check-${item.code}`,
        });
        if (n === 0 && k === 0) {
          // ---- the first sign-off on the student's record page, with the password re-entered
          await page.goto(record);
          // on a phone the Sign-off column waits behind "More columns"
          await page.click("section[aria-labelledby=signoffs] button:has-text('More columns')");
          await page.click(`[data-testid=sign-${item.code}]`);
          const form = page.locator(`form[aria-label='Sign off ${item.code}']`);
          await form.locator("input[type=password]").fill(DEMO_PASSWORD);
          await form.locator("button[type=submit]").click();
          await page.waitForSelector(`tr:has-text("${item.code}") >> text=Signed for`);
          await screenshot(page, "graduation-e2e-first-sign-off-phone");
        } else {
          await act(cookie, "app/(app)/records/actions.ts#signOffAction", record, { studentId, itemId: item.id, password: DEMO_PASSWORD });
        }
      }
      // ---- the stage check, passed
      await act(cookie, "app/(app)/records/actions.ts#conductStageCheckAction", record, {
        studentId,
        stageId,
        result: "pass",
        oralOutcomes: own.map((i) => ({ itemId: i.id, outcome: "solid" })),
        writtenScorePercent: 90,
        remarks: "",
        occurredAt: minuteAgo(),
        password: DEMO_PASSWORD,
      });
    }

    // ---- items and stages done, but no ground training time yet: the End of training screen says so
    await page.goto(`/completion/${studentId}`);
    expect(await page.textContent("[data-testid=graduation-gaps]")).toContain("Credited ground time 0 h of the course's 35 h minimum");
    await noSidewaysScroll();
    await screenshot(page, "graduation-e2e-gaps-phone");

    // ---- the course's minimum of ground training (35 h, 14 CFR 141.95(a)), attended in five 7-hour sessions on past days
    // free in the demo timetable (db/seed/timetable.ts), attendance recorded after each as the Timetable records it
    const { rows: setup } = await db.query<{ briefing: string; room: string; chief: string }>(
      `SELECT (SELECT b.id FROM briefings b WHERE b.school_id = p.school_id ORDER BY b.created_at, b.id LIMIT 1) AS briefing,
              (SELECT r.id FROM rooms r WHERE r.school_id = p.school_id AND r.name = 'Briefing room 2') AS room, p.id AS chief
         FROM people p WHERE p.email = 'chief@chalkwing.test'`,
    );
    const londonDay = (daysAgo: number) =>
      new Intl.DateTimeFormat("en-CA", { timeZone: "Europe/London" }).format(new Date(Date.now() - daysAgo * 86_400_000));
    for (const daysAgo of [1, 4, 5, 8, 9]) {
      const scheduled = await act(cookie, "app/(app)/timetable/actions.ts#scheduleSessionAction", "/timetable/new", {
        briefingId: setup[0]!.briefing,
        date: londonDay(daysAgo),
        time: "08:00",
        durationMinutes: 420,
        roomId: setup[0]!.room,
        instructorId: setup[0]!.chief,
        studentIds: [studentId],
        idempotencyKey: `grad-${tag}-session-${daysAgo}`,
      });
      const sessionId = scheduled.data!.id as string;
      await act(cookie, "app/(app)/timetable/actions.ts#recordAttendanceAction", `/timetable/${sessionId}`, {
        sessionId,
        lines: [{ studentId, status: "attended" }],
        idempotencyKey: `grad-${tag}-attendance-${daysAgo}`,
      });
    }
    const { rows: credited } = await db.query<{ minutes: number }>(
      `SELECT COALESCE(sum(credited_minutes), 0)::int AS minutes FROM ground_log_current WHERE student_id = $1`,
      [studentId],
    );
    expect(credited[0]!.minutes).toBe(35 * 60);

    // ---- graduation on the End of training screen, reached from the student's record page
    await page.goto(record);
    await Promise.all([page.waitForURL(new RegExp(`/completion/${studentId}$`)), page.click("a:has-text('End training')")]);
    await page.waitForSelector("form[aria-label^='End the training']");
    expect(await page.textContent("[data-testid=graduation-ready]")).toContain("Every condition of graduation is met");
    expect(await page.locator("[data-testid=graduation-gaps]").count()).toBe(0);
    await noSidewaysScroll();
    expect(await page.isChecked("input[name=kind][value=graduated]")).toBe(true);
    expect(await page.inputValue("#et-statement")).toContain(`${name} completed every stage of the course`);
    // no reason given: refused in the form, the message beside the Reason field
    await page.fill("#et-password", DEMO_PASSWORD);
    await page.click("form[aria-label^='End the training'] button[type=submit]");
    await page.waitForSelector("#et-reason-error");
    expect(await page.textContent("#et-reason-error")).toMatch(/reason/i);
    expect(await page.getAttribute("#et-reason", "aria-invalid")).toBe("true");
    await screenshot(page, "graduation-e2e-missing-reason-phone");
    const { rows: stillActive } = await db.query(`SELECT 1 FROM enrolments WHERE student_id = $1 AND status = 'active'`, [studentId]);
    expect(stillActive).toHaveLength(1);

    await page.fill("#et-reason", "Completed the course");
    await page.click("form[aria-label^='End the training'] button[type=submit]");
    await page.waitForSelector("[data-testid=certificate-link]", { timeout: 20_000 });
    expect(await page.textContent("[data-testid=training-ended]")).toContain("Graduated");
    await noSidewaysScroll();
    await screenshot(page, "graduation-e2e-graduated-phone");
    const { rows: ended } = await db.query<{ status: string; end_kind: string; end_reason: string }>(
      `SELECT status, end_kind, end_reason FROM enrolments WHERE student_id = $1`,
      [studentId],
    );
    expect(ended).toEqual([{ status: "completed", end_kind: "graduated", end_reason: "Completed the course" }]);

    // ---- the certificate: a PDF whose text names the graduate, the course and the completion statement
    const href = await page.getAttribute("[data-testid=certificate-link]", "href");
    expect(href).toBe(`/api/records/${studentId}/certificate`);
    const res = await page.context().request.get(href!);
    expect(res.status()).toBe(200);
    expect(res.headers()["content-type"]).toBe("application/pdf");
    const pdf = await res.body();
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    expect(pdf.length).toBeGreaterThan(1000);
    const dir = mkdtempSync(path.join(tmpdir(), "grad-e2e-"));
    try {
      writeFileSync(path.join(dir, "c.pdf"), pdf);
      const text = execFileSync("pdftotext", ["-enc", "UTF-8", path.join(dir, "c.pdf"), "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
      expect(text).toContain("Larkhollow Flying School");
      expect(text).toContain(name);
      expect(text).toContain("has satisfactorily completed every stage");
      expect(text).toContain("Imogen Farrant");
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }

    // ---- the End of training list shows the graduate with the certificate
    await page.goto("/completion");
    const row = page.locator("[data-testid=ended] tr", { hasText: name });
    expect(await row.textContent()).toContain("Graduated");
    expect(await row.locator("a:has-text('Graduation certificate')").getAttribute("href")).toBe(`/api/records/${studentId}/certificate`);
    await noSidewaysScroll();
    await screenshot(page, "completion-list-phone");
  });
});
