// The accessibility crawler: every page in pages.ts, for every role allowed, loaded in headless
// Chromium after its data has arrived, checked with axe-core (no serious or critical violations),
// photographed at 1280x800 and 390x844 (tests/artifacts/screenshots/<role>-<name>-<width>.png),
// and checked for sideways scrolling at 390 px. To add a page, see the header of pages.ts.
import { mkdirSync, readFileSync } from "node:fs";
import path from "node:path";
import type { Page } from "playwright-core";
import type { Client } from "pg";
import { launchBrowser, BASE_URL, SCREENSHOT_DIR, type Browser } from "./helpers/browser";
import { signInOrThrow, SESSION_COOKIE } from "./helpers/http";
import { ownerClient } from "./helpers/db";
import { loadFixtures } from "./authz/fixtures";
import type { Caller, Fixtures } from "./authz/types";
import { PAGES } from "./pages";

const AXE = readFileSync(path.join(process.cwd(), "node_modules", "axe-core", "axe.min.js"), "utf8");
const ACCOUNTS: Record<Exclude<Caller, "signedOut">, string> = {
  chief: "chief@chalkwing.test",
  instructor: "instructor@chalkwing.test",
  student: "student@chalkwing.test",
  sponsor: "sponsor@chalkwing.test",
};
const VIEWPORTS = [
  { width: 1280, height: 800 },
  { width: 390, height: 844 },
] as const;

interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: unknown[]; failureSummary?: string }[];
}

let browser: Browser;
let page: Page;
let fx: Fixtures;
let db: Client;
const tokens: Partial<Record<Caller, string>> = {};

beforeAll(async () => {
  db = await ownerClient();
  fx = await loadFixtures(db);
  const roles = new Set(PAGES.flatMap((p) => p.roles));
  for (const role of roles) {
    if (role === "signedOut") continue;
    const cookie = await signInOrThrow(ACCOUNTS[role], "chalkwing-demo");
    tokens[role] = cookie.slice(SESSION_COOKIE.length + 1);
  }
  browser = await launchBrowser();
  page = await browser.context.newPage();
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
  await db?.end();
});

async function actAs(role: Caller) {
  await browser.context.clearCookies();
  const token = tokens[role];
  if (token) await browser.context.addCookies([{ name: SESSION_COOKIE, value: token, url: BASE_URL, httpOnly: true, sameSite: "Lax" }]);
}

/** Waits until the page's data is on screen: network idle, the page's selector, nothing aria-busy. */
async function settle(p: Page, waitFor?: string, network = true) {
  if (network) await p.waitForLoadState("networkidle");
  if (waitFor) await p.waitForSelector(waitFor, { state: "visible", timeout: 15_000 });
  await p.waitForFunction(() => document.querySelectorAll('[aria-busy="true"]').length === 0, undefined, { timeout: 15_000 });
}

async function axeSerious(p: Page): Promise<AxeViolation[]> {
  await p.addScriptTag({ content: AXE });
  const violations = await p.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: AxeViolation[] }> } }).axe;
    const r = await axe.run(document, { resultTypes: ["violations"] });
    return r.violations;
  });
  return violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => ({
      id: v.id,
      impact: v.impact,
      help: v.help,
      nodes: v.nodes.slice(0, 5).map((n) => ({ target: n.target, failureSummary: n.failureSummary })),
    }));
}

const runs = PAGES.flatMap((p) => p.roles.map((role) => [`${p.name} as ${role}`, p, role] as const));

describe("accessibility crawl", () => {
  test("the crawl list has the foundation's pages", () => {
    expect(PAGES.map((p) => p.name)).toEqual(expect.arrayContaining(["today", "people", "syllabus", "sign-in", "forbidden", "not-found"]));
  });

  test.each(runs)("%s", async (_label, spec, role) => {
    await actAs(role);
    const target = typeof spec.path === "function" ? spec.path(fx) : spec.path;
    // loaded once at the wide size, then narrowed: the layout reflows as on a phone held upright
    await page.setViewportSize(VIEWPORTS[0]);
    const res = await page.goto(target, { waitUntil: "load" });
    expect({ path: target, status: res?.status() }).toEqual({ path: target, status: spec.status ?? 200 });
    // a signed-in page must not have bounced to sign-in
    if (role !== "signedOut") expect(new URL(page.url()).pathname).not.toBe("/sign-in");
    for (const vp of VIEWPORTS) {
      await page.setViewportSize(vp);
      await settle(page, spec.waitFor, vp === VIEWPORTS[0]);
      const violations = await axeSerious(page);
      expect({ page: `${role} ${target} @${vp.width}`, violations }).toEqual({ page: `${role} ${target} @${vp.width}`, violations: [] });
      if (vp.width === 390) {
        const sizes = await page.evaluate(() => ({ scrollWidth: document.documentElement.scrollWidth, innerWidth: window.innerWidth }));
        const label = `${role} ${target} @390`;
        expect({ page: label, sidewaysScrollPx: Math.max(0, sizes.scrollWidth - sizes.innerWidth) }).toEqual({
          page: label,
          sidewaysScrollPx: 0,
        });
      }
      await page.screenshot({ path: path.join(SCREENSHOT_DIR, `${role}-${spec.name}-${vp.width}.png`), fullPage: true });
    }
  });
});
