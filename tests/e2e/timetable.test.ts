// End to end in headless Chromium against the production build: an instructor schedules a session
// of a briefing for the Kestrel cohort and records attendance; a student of that cohort sees the
// session in their week and sees their ground hours grow.
import type { Page } from "playwright-core";
import { launchBrowser, signIn, screenshot, type Browser } from "./helpers/browser";
import { dateInZone, formatDay } from "@/lib/time";

const ZONE = "Europe/London"; // the demo school's time zone (db/seed/scenario.ts)

let instructorBrowser: Browser;
let studentBrowser: Browser;

beforeAll(async () => {
  instructorBrowser = await launchBrowser({ width: 1280, height: 900 });
  studentBrowser = await launchBrowser({ width: 390, height: 844 });
});
afterAll(async () => {
  await instructorBrowser?.close();
  await studentBrowser?.close();
});

/** "12.5 of 35 h" → 12.5 */
function hoursOf(label: string | null): number {
  const m = /^([\d.,]+) of ([\d.,]+) h$/.exec((label ?? "").trim());
  if (!m) throw new Error(`not an hours label: ${label}`);
  return Number(m[1]!.replace(/,/g, ""));
}

async function studentHours(page: Page): Promise<number> {
  await page.goto("/today");
  return hoursOf(await page.textContent("[data-testid=ground-hours]"));
}

describe("Timetable end to end", () => {
  it("an instructor schedules a briefing for a cohort and records attendance; a student of the cohort sees it in their week and their hours grow", async () => {
    const student = await studentBrowser.context.newPage();
    await signIn(student, "student@chalkwing.test");
    const before = await studentHours(student);

    const page = await instructorBrowser.context.newPage();
    await signIn(page, "instructor@chalkwing.test");
    await page.goto("/timetable/new");
    await page.waitForSelector("form[aria-label='Schedule a session']");
    // yesterday in the school's time zone, early, so the session has ended and attendance can be recorded
    const yesterday = dateInZone(new Date(Date.now() - 24 * 3600_000), ZONE);
    // a briefing of the demo seed (other tests may add "Harness …" ones)
    const [briefingValue, briefingText] = await page.$eval("#briefingId", (el) => {
      const o = [...(el as HTMLSelectElement).options].find((x) => x.value && !x.text.startsWith("Harness"))!;
      return [o.value, o.text] as const;
    });
    const briefingTitle = briefingText.replace(/ \(revision.*$/, "");
    await page.selectOption("#briefingId", briefingValue);
    await page.fill("#date", yesterday);
    await page.fill("#time", "06:30");
    await page.fill("#durationMinutes", "90");
    await page.selectOption("#roomId", { label: "Hangar classroom (24 seats)" });
    await page.selectOption("#cohortId", { label: "Kestrel cohort" });
    await screenshot(page, "timetable-e2e-schedule-form");
    await Promise.all([
      page.waitForURL(/\/timetable\/[0-9a-f-]{36}$/, { timeout: 20_000 }),
      page.click("button[type=submit]:has-text('Schedule the session')"),
    ]);
    const sessionUrl = page.url();
    await page.waitForSelector("form[aria-label='Record attendance']");
    expect(await page.textContent("main h1")).toBe(briefingTitle);

    // Ada Quill (student@) arrives 30 minutes late; everyone else keeps the default "Attended"
    const adaLine = page.locator("[data-testid=attendance-line]", { hasText: "Ada Quill" });
    await adaLine.locator("select").selectOption("late");
    await adaLine.locator("input[id^=late-]").fill("30");
    await screenshot(page, "timetable-e2e-attendance-form");
    await page.click("button:has-text('Record attendance')");
    await page.waitForSelector("[data-testid=attendance-recorded]");
    const adaRow = page.locator("[data-testid=attendance-recorded] tr", { hasText: "Ada Quill" });
    expect(await adaRow.textContent()).toContain("Late (30 min)60 min");
    await screenshot(page, "timetable-e2e-attendance-recorded");

    // the student sees the session in their week, and 60 more credited minutes
    await student.goto(`/timetable?week=${yesterday}`);
    const card = student.locator("[data-testid=session-card]", { hasText: briefingTitle }).filter({ hasText: "06:30–08:00" });
    await card.first().waitFor({ timeout: 10_000 });
    expect(await card.count()).toBe(1);
    await screenshot(student, "timetable-e2e-student-week-390");
    const after = await studentHours(student);
    expect(Math.round((after - before) * 10) / 10).toBe(1); // 90 min less 30 late = 60 min = 1.0 h
    await student.goto("/ground-log");
    // on a phone the logbook is a list; printed, it is the full table without the app's navigation
    const line = student.locator("ol[aria-label='Logbook lines'] li", { hasText: formatDay(yesterday) }).filter({ hasText: briefingTitle });
    expect(await line.first().isVisible()).toBe(true);
    expect(await line.first().textContent()).toContain("Tomasz Varga, certificate LHV-GI-0142");
    await screenshot(student, "timetable-e2e-student-ground-log-390");
    await student.emulateMedia({ media: "print" });
    // no navigation on paper: neither the wide-screen row nor the phone menu
    expect(
      await student.locator("nav[aria-label=Main]").evaluateAll((navs) => navs.some((n) => (n as HTMLElement).offsetParent !== null)),
    ).toBe(false);
    expect(
      await student
        .locator("[data-testid=logbook] tr", { hasText: formatDay(yesterday) })
        .first()
        .isVisible(),
    ).toBe(true);
    await screenshot(student, "timetable-e2e-student-ground-log-print");
    await student.emulateMedia({ media: "screen" });

    // the session's page is the student's too, without the instructor's forms
    await student.goto(sessionUrl);
    expect(await student.textContent("main h1")).toBe(briefingTitle);
    expect(await student.locator("form[aria-label='Record attendance']").count()).toBe(0);
  });

  it("a double-booking through the form shows the 409 message naming the instructor", async () => {
    const page = await instructorBrowser.context.newPage();
    await page.goto("/timetable/new");
    const yesterday = dateInZone(new Date(Date.now() - 24 * 3600_000), ZONE);
    await page.selectOption("#briefingId", { index: 1 });
    await page.fill("#date", yesterday);
    await page.fill("#time", "07:00");
    await page.fill("#durationMinutes", "30");
    await page.selectOption("#roomId", { label: "Briefing room 2 (10 seats)" });
    await page.selectOption("#studentIds", { label: "Maren Tofte" });
    await page.click("button[type=submit]:has-text('Schedule the session')");
    const msg = await page.waitForSelector("[data-testid=form-message]");
    expect(await msg.textContent()).toMatch(/^Instructor: Tomasz Varga already teaches ".+" \w{3} \d{1,2} \w{3} \d{4}, 06:30–08:00$/);
  });
});
