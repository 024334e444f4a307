// The chief's instructor files (issue 12): from People to an instructor's file, a change recorded
// through the form becomes version 2 while version 1 stays in the history; the page has no serious
// or critical axe-core findings. Screenshot: tests/artifacts/screenshots/instructor-file-chief.png.
import { readFileSync } from "node:fs";
import path from "node:path";
import type { Page } from "playwright-core";
import { launchBrowser, screenshot, BASE_URL, type Browser } from "./helpers/browser";
import { signInOrThrow, SESSION_COOKIE } from "./helpers/http";
import { DEMO_ACCOUNTS } from "./helpers/accounts";

const AXE = readFileSync(path.join(process.cwd(), "node_modules", "axe-core", "axe.min.js"), "utf8");

let browser: Browser;
let page: Page;

beforeAll(async () => {
  const token = (await signInOrThrow(DEMO_ACCOUNTS.chief, "chalkwing-demo")).slice(SESSION_COOKIE.length + 1);
  browser = await launchBrowser();
  await browser.context.addCookies([{ name: SESSION_COOKIE, value: token, url: BASE_URL, httpOnly: true, sameSite: "Lax" }]);
  page = await browser.context.newPage();
});
afterAll(async () => {
  await browser?.close();
});

async function seriousFindings(p: Page): Promise<string[]> {
  await p.addScriptTag({ content: AXE });
  const violations = await p.evaluate(async () => {
    const axe = (
      window as unknown as { axe: { run: (ctx: Document, o: object) => Promise<{ violations: { id: string; impact: string }[] }> } }
    ).axe;
    return (await axe.run(document, { resultTypes: ["violations"] })).violations;
  });
  return violations.filter((v) => v.impact === "serious" || v.impact === "critical").map((v) => v.id);
}

test("the chief records a change to an instructor's qualification and both versions stay in the file", async () => {
  await page.goto(`${BASE_URL}/people`);
  await page.getByRole("link", { name: "Priya Okonjo-Hale" }).click();
  await page.waitForURL(/\/people\/[0-9a-f-]{36}$/);
  await page.getByRole("heading", { level: 1, name: "Instructor file: Priya Okonjo-Hale" }).waitFor();
  const history = page.locator("[data-testid=qualification-history] tbody tr");
  const before = await history.count();
  expect(before).toBeGreaterThan(0);
  // versions of this qualification already on file (the authorisation harness may have recorded one)
  const versionsBefore = (await history.allTextContents()).filter((r) => r.includes("LHV-GI-0188")).length;
  expect(versionsBefore).toBeGreaterThan(0);
  expect(await seriousFindings(page)).toEqual([]);

  await page.getByText("Record a change to LHV-GI-0188").click();
  const form = page.locator("[data-testid=qualification-change-form]");
  // a change without its reason is refused on the form, naming the field
  await form.getByRole("button", { name: "Record the change" }).click();
  await form.locator(".field-error", { hasText: "Say what changed and why" }).waitFor();
  await form.getByLabel("Ratings (separated by commas)").fill("Principles of flight, Meteorology, Navigation, Human performance");
  await form.getByLabel("What changed and why").fill("Human performance rating added");
  await form.getByRole("button", { name: "Record the change" }).click();
  // the page refreshes after the save (its confirmation may be replaced at once): check the file itself
  await page.waitForFunction((n) => document.querySelectorAll("[data-testid=qualification-history] tbody tr").length === n + 1, before);
  const rows = await history.allTextContents();
  expect(rows.filter((r) => r.includes("LHV-GI-0188"))).toHaveLength(versionsBefore + 1);
  expect(rows.some((r) => r.includes("Human performance rating added"))).toBe(true);
  await screenshot(page, "instructor-file-chief");
});
