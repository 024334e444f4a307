// The shell's navigation in headless Chromium: on a phone (390x844) one bar with a menu button
// that opens every link over the page (no layout shift), closes on Escape and on navigation, and
// marks the current page; on a wide screen (1280x800) the chief's links fit on one row in groups.
// Screenshots: tests/artifacts/screenshots/nav-<role>-<width>[-open].png.
import type { Page } from "playwright-core";
import { launchBrowser, screenshot, BASE_URL, type Browser } from "./helpers/browser";
import { signInOrThrow, SESSION_COOKIE } from "./helpers/http";
import { DEMO_ACCOUNTS } from "./helpers/accounts";

type Who = "chief" | "student" | "instructor" | "sponsor";
/** The links each demo account is given (by its permissions in lib/auth/permissions.ts). */
const LINKS: Record<Who, string[]> = {
  chief: [
    "Today",
    "Syllabus",
    "Curve Lab",
    "Briefings",
    "Assignments",
    "Timetable",
    "Ground log",
    "Records",
    "Progress map",
    "Sign-off register",
    "Endorsements",
    "Pass rate",
    "Transfers in",
    "Retention",
    "People",
    "Roster",
    "Rooms",
    "Cohorts",
    "Mail tray",
    "Notes for sponsors",
    "Weekly letters",
    "Settings",
  ],
  instructor: [
    "Today",
    "Syllabus",
    "Curve Lab",
    "Briefings",
    "Assignments",
    "Timetable",
    "Ground log",
    "Records",
    "Progress map",
    "Endorsements",
    "People",
    "Roster",
    "Notes for sponsors",
  ],
  student: ["Today", "Syllabus", "Curve Lab", "Briefings", "Assignments", "Timetable", "Practice", "Ground log", "Progress map", "Sharing"],
  sponsor: ["Today", "Ground log", "Progress map", "Weekly letters"],
};

let browser: Browser;
let page: Page;
const tokens: Partial<Record<Who, string>> = {};

beforeAll(async () => {
  for (const who of Object.keys(LINKS) as Who[]) {
    const cookie = await signInOrThrow(DEMO_ACCOUNTS[who], "chalkwing-demo");
    tokens[who] = cookie.slice(SESSION_COOKIE.length + 1);
  }
  browser = await launchBrowser();
  page = await browser.context.newPage();
});
afterAll(async () => {
  await browser?.close();
});

async function actAs(who: Who) {
  await browser.context.clearCookies();
  await browser.context.addCookies([{ name: SESSION_COOKIE, value: tokens[who]!, url: BASE_URL, httpOnly: true, sameSite: "Lax" }]);
}

const labelsFor = (who: Who) => LINKS[who];

async function barHeight(p: Page): Promise<number> {
  const box = await p.locator("[data-testid=app-bar]").boundingBox();
  if (!box) throw new Error("no app bar");
  return box.height;
}

const mainTop = (p: Page) => p.locator("main#main").evaluate((el) => el.getBoundingClientRect().top);

describe("on a phone (390x844)", () => {
  beforeAll(async () => {
    await page.setViewportSize({ width: 390, height: 844 });
  });

  test.each(["chief", "student"] as const)("the %s's navigation is one bar until opened, then shows every link", async (who) => {
    await actAs(who);
    await page.goto("/timetable");
    await page.waitForLoadState("networkidle");
    expect(await barHeight(page)).toBeLessThan(64);
    const button = page.locator("button[aria-controls=main-menu]");
    expect(await button.getAttribute("aria-expanded")).toBe("false");
    expect(await page.locator("#main-menu").isVisible()).toBe(false);
    await screenshot(page, `nav-${who}-390`);

    const before = await mainTop(page);
    await button.click();
    expect(await button.getAttribute("aria-expanded")).toBe("true");
    const menu = page.locator("#main-menu");
    expect(await menu.isVisible()).toBe(true);
    // opening lays the list over the page: nothing below moves
    expect(await mainTop(page)).toBe(before);
    const shown = await menu.locator("nav a").allTextContents();
    expect(new Set(shown.map((s) => s.trim()))).toEqual(new Set(labelsFor(who)));
    for (const a of await menu.locator("nav a").all()) expect(await a.isVisible()).toBe(true);
    // the current page is marked for screen readers and by more than colour (a bar under it and bold type)
    const current = menu.locator("a[aria-current=page]");
    expect(await current.count()).toBe(1);
    expect((await current.textContent())?.trim()).toBe("Timetable");
    const mark = await current.evaluate((el) => {
      const s = getComputedStyle(el);
      return { border: parseFloat(s.borderBottomWidth), weight: Number(s.fontWeight) };
    });
    expect(mark.border).toBeGreaterThanOrEqual(3);
    expect(mark.weight).toBeGreaterThanOrEqual(600);
    await screenshot(page, `nav-${who}-390-open`);

    // Escape closes and gives focus back to the button
    await page.keyboard.press("Escape");
    expect(await button.getAttribute("aria-expanded")).toBe("false");
    expect(await menu.isVisible()).toBe(false);
    expect(await button.evaluate((el) => el === document.activeElement)).toBe(true);

    // following a link closes the menu, and the new page is the current one
    await button.click();
    await menu.locator("a", { hasText: "Today" }).click();
    await page.waitForURL((u) => u.pathname === "/today");
    await page.waitForLoadState("networkidle");
    expect(await button.getAttribute("aria-expanded")).toBe("false");
    expect(await barHeight(page)).toBeLessThan(64);
    expect((await page.locator("a[aria-current=page]", { hasText: "Today" }).count()) >= 1).toBe(true);
  });
});

describe("on a wide screen", () => {
  test("at 1280x800 the chief's links are grouped on one row, every link one click away", async () => {
    await page.setViewportSize({ width: 1280, height: 800 });
    await actAs("chief");
    await page.goto("/register");
    await page.waitForLoadState("networkidle");
    expect(await barHeight(page)).toBeLessThan(64);
    expect(await page.locator("button[aria-controls=main-menu]").isVisible()).toBe(false);
    const nav = page.locator("header nav[aria-label=Main]").first();
    expect(await nav.isVisible()).toBe(true);
    const tops = await nav.locator(":scope > ul > li").evaluateAll((lis) => lis.map((li) => Math.round(li.getBoundingClientRect().top)));
    expect(tops.length).toBeGreaterThan(1);
    expect(new Set(tops).size).toBe(1);

    // the group holding the current page is marked; its link carries aria-current
    const groups = nav.locator("button[aria-expanded]");
    const names = (await groups.allTextContents()).map((s) => s.trim());
    expect(names).toEqual(["Teaching", "Records", "School"]);
    const seen: string[] = (await nav.locator(":scope > ul > li > a").allTextContents()).map((s) => s.trim());
    for (const g of await groups.all()) {
      await g.click();
      expect(await g.getAttribute("aria-expanded")).toBe("true");
      const list = page.locator(`#${(await g.getAttribute("aria-controls"))!.replace(/:/g, "\\:")}`);
      expect(await list.isVisible()).toBe(true);
      seen.push(...(await list.locator("a").allTextContents()).map((s) => s.trim()));
      if ((await g.textContent())?.includes("Records")) {
        expect((await list.locator("a[aria-current=page]").textContent())?.trim()).toBe("Sign-off register");
        await screenshot(page, "nav-chief-1280-open");
      }
      await page.keyboard.press("Escape");
      expect(await list.isVisible()).toBe(false);
    }
    expect(new Set(seen)).toEqual(new Set(labelsFor("chief")));
    await screenshot(page, "nav-chief-1280");
  });

  test.each(["chief", "instructor", "student", "sponsor"] as const)("at 1024x768 and 1280x800 the %s's bar is one row", async (who) => {
    await actAs(who);
    for (const width of [1024, 1280]) {
      await page.setViewportSize({ width, height: width === 1024 ? 768 : 800 });
      await page.goto("/today");
      await page.waitForLoadState("networkidle");
      expect(await barHeight(page)).toBeLessThan(64);
      await screenshot(page, `nav-${who}-${width}`);
    }
    await page.setViewportSize({ width: 390, height: 844 });
    await page.goto("/today");
    await page.waitForLoadState("networkidle");
    expect(await barHeight(page)).toBeLessThan(64);
    await screenshot(page, `nav-${who}-390-today`);
  });
});
