import { existsSync, mkdtempSync, rmSync, mkdirSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";

export const BASE_URL = process.env.E2E_BASE_URL ?? "http://127.0.0.1:3000";
export const DEMO_PASSWORD = "chalkwing-demo";
export const SCREENSHOT_DIR = path.join(process.cwd(), "tests", "artifacts", "screenshots");

/**
 * The browser: CHROMIUM_PATH, else Debian's chromium-headless-shell (the Chromium engine without
 * the desktop browser around it, about a sixth less CPU per page than the full browser run
 * headless, measured on the accessibility crawl), else Debian's full Chromium.
 */
export const CHROMIUM_PATH =
  process.env.CHROMIUM_PATH ?? (existsSync("/usr/bin/chromium-headless-shell") ? "/usr/bin/chromium-headless-shell" : "/usr/bin/chromium");

const FLAGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];

export interface Browser {
  context: BrowserContext;
  close(): Promise<void>;
}

/** Debian's Chromium (see CHROMIUM_PATH), driven by playwright-core, with a fresh profile each time. */
export async function launchBrowser(viewport = { width: 1280, height: 800 }): Promise<Browser> {
  const dir = mkdtempSync(path.join(tmpdir(), "chalkwing-chromium-"));
  const context = await chromium.launchPersistentContext(dir, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    args: FLAGS,
    viewport,
    baseURL: BASE_URL,
  });
  return {
    context,
    async close() {
      await context.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

export interface SharedBrowser {
  /** A fresh context of the one browser: its own cookies and storage, like a separate visitor. */
  newContext(viewport?: { width: number; height: number }): Promise<BrowserContext>;
  close(): Promise<void>;
}

/** One Debian Chromium for several isolated contexts at once (e.g. a crawl that visits pages in parallel). */
export async function launchSharedBrowser(): Promise<SharedBrowser> {
  const browser = await chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: FLAGS });
  return {
    newContext: (viewport = { width: 1280, height: 800 }) => browser.newContext({ viewport, baseURL: BASE_URL }),
    close: () => browser.close(),
  };
}

/**
 * Signs in afresh: a session already in the page's context is dropped first (a signed-in visitor is
 * sent on from /sign-in). Returns once the browser has left the sign-in page or the form shows its
 * refusal, whichever comes first; the caller checks which.
 */
export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.context().clearCookies();
  await page.goto("/sign-in");
  await page.fill("#email", email);
  await page.fill("#password", password);
  const left = page.waitForURL((u) => !u.pathname.startsWith("/sign-in"), { timeout: 15_000 });
  const refused = page.waitForSelector("[data-testid=sign-in-error]", { state: "visible", timeout: 15_000 });
  await Promise.all([Promise.any([left, refused]).catch(() => undefined), page.click("button[type=submit]")]);
}

/**
 * page.screenshot, tried again when Chromium's compositor answers "Unable to capture screenshot".
 * That answer is transient (the frame was being replaced while the capture was asked for: seen once in
 * CI on a 390 x 3,283 px page that captures fine on every other run); it says nothing about the page.
 * Any other error, or the same one three times running, fails the test as before.
 */
export async function captureScreenshot(page: Page, options: Parameters<Page["screenshot"]>[0]): Promise<Buffer> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await page.screenshot(options);
    } catch (err) {
      if (attempt >= 3 || !/Unable to capture screenshot/.test(String(err))) throw err;
      // let the page draw two more frames before asking again
      await page.evaluate(() => new Promise<void>((done) => requestAnimationFrame(() => requestAnimationFrame(() => done()))));
    }
  }
}

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  const file = path.join(SCREENSHOT_DIR, `${name}.png`);
  await captureScreenshot(page, { path: file, fullPage: true });
  return file;
}
