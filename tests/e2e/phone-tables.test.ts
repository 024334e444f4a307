// Wide tables on a phone (components/ui/wide-table.tsx): at 390x844 the columns that matter show
// first and the rest wait behind "More columns"; at 1280x800 every column shows. Screenshots:
// tests/artifacts/screenshots/tables-<role>-<page>-<width>[-more].png.
import type { Page } from "playwright-core";
import { launchBrowser, screenshot, BASE_URL, type Browser } from "./helpers/browser";
import { signInOrThrow, SESSION_COOKIE } from "./helpers/http";
import { DEMO_ACCOUNTS } from "./helpers/accounts";

let browser: Browser;
let page: Page;
const tokens: Record<string, string> = {};

beforeAll(async () => {
  for (const who of ["student", "chief"] as const) {
    tokens[who] = (await signInOrThrow(DEMO_ACCOUNTS[who], "chalkwing-demo")).slice(SESSION_COOKIE.length + 1);
  }
  browser = await launchBrowser();
  page = await browser.context.newPage();
});
afterAll(async () => {
  await browser?.close();
});

async function actAs(who: "student" | "chief") {
  await browser.context.clearCookies();
  await browser.context.addCookies([{ name: SESSION_COOKIE, value: tokens[who]!, url: BASE_URL, httpOnly: true, sameSite: "Lax" }]);
}

const headers = async (p: Page, table: string) =>
  (
    await p
      .locator(table)
      .first()
      .locator("thead th")
      .evaluateAll((ths) => ths.filter((th) => (th as HTMLElement).offsetParent !== null).map((th) => th.textContent?.trim() ?? ""))
  ).map((t) => t.replace(/[↑↓]/g, "").trim());

const noSidewaysScroll = (p: Page) => p.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth);

describe.each(["student", "chief"] as const)("the %s's syllabus", (who) => {
  test("at 390 px: item, level and objective first; the completion standard on demand", async () => {
    await actAs(who);
    await page.setViewportSize({ width: 390, height: 844 });
    await page.goto("/syllabus");
    await page.waitForLoadState("networkidle");
    const first = page.locator(".wide-table").first();
    expect(await headers(page, ".wide-table")).toEqual(["Item", "Level", "Objective"]);
    // the level column is on screen, not off to the right
    const level = await first.locator("thead th", { hasText: "Level" }).boundingBox();
    expect(level!.x + level!.width).toBeLessThanOrEqual(390);
    expect(await noSidewaysScroll(page)).toBe(true);
    await screenshot(page, `tables-${who}-syllabus-390`);
    const more = first.locator("button[aria-controls]", { hasText: "More columns" });
    expect(await more.getAttribute("aria-expanded")).toBe("false");
    await more.click();
    expect(await first.locator("button[aria-controls]").getAttribute("aria-expanded")).toBe("true");
    expect(await headers(page, ".wide-table")).toEqual(["Item", "Level", "Objective", "Completion standard"]);
    await screenshot(page, `tables-${who}-syllabus-390-more`);
  });

  test("at 1280 px every column shows and no button is offered", async () => {
    await actAs(who);
    await page.setViewportSize({ width: 1280, height: 800 });
    await page.goto("/syllabus");
    await page.waitForLoadState("networkidle");
    expect(await headers(page, ".wide-table")).toEqual(["Item", "Level", "Objective", "Completion standard"]);
    expect(await page.locator(".wide-table button", { hasText: "More columns" }).first().isVisible()).toBe(false);
    await screenshot(page, `tables-${who}-syllabus-1280`);
  });
});

describe.each(["student", "chief"] as const)("the %s's Timetable list", (who) => {
  test("at 390 px: when, briefing and room first; instructor, cohort and status on demand; every column at 1280 px", async () => {
    await actAs(who);
    await page.setViewportSize({ width: 390, height: 844 });
    await page.goto("/timetable/list");
    await page.waitForSelector("[data-testid=sessions-table] tbody tr", { timeout: 15_000 });
    expect(await headers(page, "[data-testid=sessions-table]")).toEqual(["When", "Briefing", "Room"]);
    const room = await page.locator("[data-testid=sessions-table] thead th", { hasText: "Room" }).boundingBox();
    expect(room!.x + room!.width).toBeLessThanOrEqual(390);
    expect(await noSidewaysScroll(page)).toBe(true);
    await screenshot(page, `tables-${who}-timetable-list-390`);
    await page.locator("button", { hasText: "More columns (3)" }).click();
    expect(await headers(page, "[data-testid=sessions-table]")).toEqual(["When", "Briefing", "Room", "Instructor", "Cohort", "Status"]);
    await screenshot(page, `tables-${who}-timetable-list-390-more`);
    await page.setViewportSize({ width: 1280, height: 800 });
    await page.reload();
    await page.waitForSelector("[data-testid=sessions-table] tbody tr", { timeout: 15_000 });
    expect(await headers(page, "[data-testid=sessions-table]")).toEqual(["When", "Briefing", "Room", "Instructor", "Cohort", "Status"]);
    await screenshot(page, `tables-${who}-timetable-list-1280`);
  });
});

// headers without sort arrows or the screen-reader "sorted" note
const plainHeaders = async (p: Page, table: string) =>
  (await headers(p, table)).map((t) =>
    t
      .replace(/[▲▼]/g, "")
      .replace(/, sorted (ascending|descending)$/, "")
      .trim(),
  );

test("the chief's Sign-off register at 390 px: date, student and item first; signer, basis, state and watch notes on demand", async () => {
  await actAs("chief");
  await page.setViewportSize({ width: 390, height: 844 });
  await page.goto("/register");
  await page.waitForSelector("[data-testid=register-table] tbody tr", { timeout: 15_000 });
  expect(await headers(page, "[data-testid=register-table]")).toEqual(["Date", "Student", "Item or stage"]);
  const item = await page.locator("[data-testid=register-table] thead th", { hasText: "Item or stage" }).boundingBox();
  expect(item!.x + item!.width).toBeLessThanOrEqual(390);
  expect(await noSidewaysScroll(page)).toBe(true);
  await screenshot(page, "tables-chief-register-390");
  const wide = page.locator(".wide-table", { has: page.locator("[data-testid=register-table]") });
  await wide.locator("button[aria-controls]", { hasText: "More columns (4)" }).click();
  expect(await wide.locator("button[aria-controls]").getAttribute("aria-expanded")).toBe("true");
  expect(await headers(page, "[data-testid=register-table]")).toEqual([
    "Date",
    "Student",
    "Item or stage",
    "Signer / examiner",
    "Basis",
    "State",
    "Watch notes",
  ]);
  await screenshot(page, "tables-chief-register-390-more");
});

test("the student's Briefings list at 390 px: briefing and minutes first, the rest on demand, no reviser's name", async () => {
  await actAs("student");
  await page.setViewportSize({ width: 390, height: 844 });
  await page.goto("/briefings");
  await page.waitForSelector("[data-testid=briefings-table] tbody tr", { timeout: 15_000 });
  expect(await plainHeaders(page, "[data-testid=briefings-table]")).toEqual(["Briefing", "Minutes"]);
  expect(await noSidewaysScroll(page)).toBe(true);
  await screenshot(page, "tables-student-briefings-390");
  await page.locator("button[aria-controls]", { hasText: "More columns (4)" }).click();
  expect(await plainHeaders(page, "[data-testid=briefings-table]")).toEqual([
    "Briefing",
    "Minutes",
    "Revision",
    "Last revised",
    "Syllabus items",
    "Handouts · demos",
  ]);
  // who revised a briefing is staff information: the student's "Last revised" cells hold a date only
  const revised = await page.locator("[data-testid=briefings-table] tbody tr td:nth-child(4)").allTextContents();
  expect(revised.length).toBeGreaterThan(0);
  for (const cell of revised) expect(cell.trim()).toMatch(/^[A-Z][a-z]{2} \d{1,2} [A-Z][a-z]{2} \d{4}$/);
  await screenshot(page, "tables-student-briefings-390-more");
});
