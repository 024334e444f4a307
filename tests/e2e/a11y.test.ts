// The accessibility crawler: every page in pages.ts, for every role allowed, loaded in headless
// Chromium after its data has arrived, checked with axe-core (no serious or critical violations),
// photographed at 1280x800 and 390x844 (tests/artifacts/screenshots/<role>-<name>-<width>.jpg; JPEG
// saves the crawl about 40 s a run over PNG; CHALKWING_CRAWL_SHOTS=png takes PNG instead),
// and checked for sideways scrolling at 390 px. To add a page, see the header of pages.ts.
// The visits run in CONCURRENCY isolated browser contexts of one Chromium (each with its own
// session cookie) against the one production build; each jest test awaits its own visit and
// checks what it found, so every page and role still passes or fails on its own.
import { mkdirSync } from "node:fs";
import path from "node:path";
import type { BrowserContext, Page } from "playwright-core";
import type { Client } from "pg";
import { launchSharedBrowser, captureScreenshot, BASE_URL, SCREENSHOT_DIR, type SharedBrowser } from "./helpers/browser";
import { signInOrThrow, SESSION_COOKIE } from "./helpers/http";
import { ownerClient } from "./helpers/db";
import { loadFixtures } from "./authz/fixtures";
import type { Caller, Fixtures } from "./authz/types";
import { PAGES, type CrawlPage } from "./pages";
import { axeSerious, type AxeViolation } from "./helpers/axe";

const ACCOUNTS: Record<Exclude<Caller, "signedOut">, string> = {
  chief: "chief@chalkwing.test",
  instructor: "instructor@chalkwing.test",
  student: "student@chalkwing.test",
  sponsor: "sponsor@chalkwing.test",
};
/** The pictures' format: JPEG unless CHALKWING_CRAWL_SHOTS=png (PNG costs the crawl about 40 s a run). */
const SHOT_TYPE: "png" | "jpeg" = process.env.CHALKWING_CRAWL_SHOTS === "png" ? "png" : "jpeg";
/** Parallel visits: three contexts keep the 2-CPU test machine busy while each page waits for network idle. */
const CONCURRENCY = 3;
const VIEWPORTS = [
  { width: 1280, height: 800 },
  { width: 390, height: 844 },
] as const;

let browser: SharedBrowser;
let fx: Fixtures;
let db: Client;
const tokens: Partial<Record<Caller, string>> = {};
/** Each run's visit, in the order of `runs`; settled to an outcome so no rejection goes unhandled. */
let visits: Promise<Outcome>[] = [];
let workers: Promise<void>[] = [];

beforeAll(async () => {
  db = await ownerClient();
  fx = await loadFixtures(db);
  const roles = new Set(PAGES.flatMap((p) => p.roles));
  for (const role of roles) {
    if (role === "signedOut") continue;
    const cookie = await signInOrThrow(ACCOUNTS[role], "chalkwing-demo");
    tokens[role] = cookie.slice(SESSION_COOKIE.length + 1);
  }
  browser = await launchSharedBrowser();
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  startCrawl();
});
afterAll(async () => {
  await Promise.allSettled(workers);
  await browser?.close();
  await db?.end();
});

async function actAs(context: BrowserContext, role: Caller) {
  await context.clearCookies();
  const token = tokens[role];
  if (token) await context.addCookies([{ name: SESSION_COOKIE, value: token, url: BASE_URL, httpOnly: true, sameSite: "Lax" }]);
}

/** Waits until the page's data is on screen: network idle, the page's selector, nothing aria-busy. */
async function settle(p: Page, waitFor?: string, network = true) {
  if (network) await p.waitForLoadState("networkidle");
  if (waitFor) await p.waitForSelector(waitFor, { state: "visible", timeout: 15_000 });
  await p.waitForFunction(() => document.querySelectorAll('[aria-busy="true"]').length === 0, undefined, { timeout: 15_000 });
}

const runs = PAGES.flatMap((p) => p.roles.map((role) => [`${p.name} as ${role}`, p, role] as const));

/** What one visit found: the document's status and final path, then per width the axe findings and sideways scroll. */
interface Visit {
  target: string;
  status: number | undefined;
  pathname: string;
  widths: { width: number; violations: AxeViolation[]; sidewaysScrollPx?: number }[];
}
type Outcome = { ok: true; visit: Visit } | { ok: false; error: unknown };

async function visit(page: Page, spec: CrawlPage, role: Caller): Promise<Visit> {
  const target = typeof spec.path === "function" ? spec.path(fx) : spec.path;
  // loaded once at the wide size, then narrowed: the layout reflows as on a phone held upright
  await page.setViewportSize(VIEWPORTS[0]);
  const res = await page.goto(target, { waitUntil: "load" });
  const found: Visit = { target, status: res?.status(), pathname: new URL(page.url()).pathname, widths: [] };
  // the wrong page (status, or a signed-in page bounced to sign-in): the test reports that, nothing more to check
  if (found.status !== (spec.status ?? 200) || (role !== "signedOut" && found.pathname === "/sign-in")) return found;
  for (const vp of VIEWPORTS) {
    await page.setViewportSize(vp);
    await settle(page, spec.waitFor, vp === VIEWPORTS[0]);
    const checked: Visit["widths"][number] = { width: vp.width, violations: await axeSerious(page) };
    if (vp.width === 390) {
      const sizes = await page.evaluate(() => ({ scrollWidth: document.documentElement.scrollWidth, innerWidth: window.innerWidth }));
      checked.sidewaysScrollPx = Math.max(0, sizes.scrollWidth - sizes.innerWidth);
    }
    found.widths.push(checked);
    const file = path.join(SCREENSHOT_DIR, `${role}-${spec.name}-${vp.width}.${SHOT_TYPE === "png" ? "png" : "jpg"}`);
    await captureScreenshot(page, { path: file, fullPage: true, type: SHOT_TYPE, ...(SHOT_TYPE === "jpeg" ? { quality: 85 } : {}) });
  }
  return found;
}

/** CONCURRENCY workers, each with its own context and page, take the runs in order. */
function startCrawl() {
  const resolvers: ((o: Outcome) => void)[] = [];
  visits = runs.map(() => new Promise<Outcome>((resolve) => resolvers.push(resolve)));
  let next = 0;
  workers = Array.from({ length: Math.min(CONCURRENCY, runs.length) }, async () => {
    const context = await browser.newContext(VIEWPORTS[0]);
    const page = await context.newPage();
    try {
      while (next < runs.length) {
        const i = next++;
        const [, spec, role] = runs[i]!;
        try {
          await actAs(context, role);
          resolvers[i]!({ ok: true, visit: await visit(page, spec, role) });
        } catch (error) {
          resolvers[i]!({ ok: false, error });
        }
      }
    } finally {
      await context.close();
    }
  });
  // a worker that could not start leaves its runs to the others; if none could, say so instead of timing out
  void Promise.allSettled(workers).then((ended) => {
    const why = ended.find((w) => w.status === "rejected")?.reason ?? new Error("the crawl ended before this visit");
    for (const resolve of resolvers) resolve({ ok: false, error: why });
  });
}

describe("accessibility crawl", () => {
  test("the crawl list has the foundation's pages", () => {
    expect(PAGES.map((p) => p.name)).toEqual(expect.arrayContaining(["today", "people", "syllabus", "sign-in", "forbidden", "not-found"]));
  });

  test.each(runs.map((run, i) => [...run, i] as const))("%s", async (_label, spec, role, i) => {
    const outcome = await visits[i]!;
    if (!outcome.ok) throw outcome.error;
    const { target, status, pathname, widths } = outcome.visit;
    expect({ path: target, status }).toEqual({ path: target, status: spec.status ?? 200 });
    // a signed-in page must not have bounced to sign-in
    if (role !== "signedOut") expect(pathname).not.toBe("/sign-in");
    expect(widths.map((w) => w.width)).toEqual(VIEWPORTS.map((vp) => vp.width));
    for (const { width, violations, sidewaysScrollPx } of widths) {
      expect({ page: `${role} ${target} @${width}`, violations }).toEqual({ page: `${role} ${target} @${width}`, violations: [] });
      if (width === 390) {
        const label = `${role} ${target} @390`;
        expect({ page: label, sidewaysScrollPx }).toEqual({ page: label, sidewaysScrollPx: 0 });
      }
    }
  });
});
