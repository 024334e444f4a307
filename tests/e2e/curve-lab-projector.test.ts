// The Projector view at classroom projector sizes and the exported PNG, in headless Chromium against
// the production build: the view fits without scrolling at 1024x768, 1280x800 and 1920x1080, its key
// list opens on the first visit only and hides behind K; the chart names every case; the exported
// PNG is at least 1600 px wide and carries the title, the aircraft and the caution; on a phone the
// builder's chart keeps its "speed-unstable" label and the page never scrolls sideways.
import { readFileSync } from "node:fs";
import type { Client } from "pg";
import type { Page } from "playwright-core";
import { launchBrowser, signIn, screenshot, captureScreenshot, type Browser } from "./helpers/browser";
import { ownerClient } from "./helpers/db";

let db: Client;
const browsers: Browser[] = [];

beforeAll(async () => {
  db = await ownerClient();
});
afterAll(async () => {
  for (const b of browsers) await b.close();
  await db?.end();
});

async function bucketDemoId(): Promise<string> {
  const { rows } = await db.query<{ id: string }>(`SELECT id FROM demos WHERE name = 'Why drag has a bucket' AND deleted_at IS NULL`);
  if (rows.length !== 1) throw new Error("the seeded demo is missing");
  return rows[0]!.id;
}

async function open(viewport: { width: number; height: number }, email = "instructor@chalkwing.test"): Promise<Page> {
  const b = await launchBrowser(viewport);
  browsers.push(b);
  const page = await b.context.newPage();
  await signIn(page, email);
  return page;
}

/** What sticks out of the viewport: the page's scroll height, and every visible element whose bottom or right edge is past it. */
async function overflow(page: Page) {
  return page.evaluate(() => {
    const out: string[] = [];
    for (const el of Array.from(document.querySelectorAll<HTMLElement>("[data-testid=projector] *"))) {
      const r = el.getBoundingClientRect();
      if (r.width === 0 || r.height === 0) continue;
      if (r.bottom > window.innerHeight + 0.5 || r.right > window.innerWidth + 0.5)
        out.push(
          `${el.tagName.toLowerCase()}${el.dataset.testid ? `[${el.dataset.testid}]` : ""} bottom ${Math.round(r.bottom)} right ${Math.round(r.right)}`,
        );
    }
    const projector = document.querySelector<HTMLElement>("[data-testid=projector]")!;
    return {
      scrollHeight: document.scrollingElement!.scrollHeight,
      innerHeight: window.innerHeight,
      projectorScroll: projector.scrollHeight - projector.clientHeight,
      outside: out,
    };
  });
}

/** The labels the chart drew last (the chart writes their ids on its canvas). */
async function chartLabels(page: Page): Promise<string[]> {
  return (await page.getAttribute("[data-testid=curve-chart]", "data-labels"))?.split(",") ?? [];
}

describe("Projector view and export", () => {
  it.each([
    [1024, 768],
    [1280, 800],
    [1920, 1080],
  ])("at %ix%i the Projector view fits without scrolling, chart text 28 px, every case named on the chart", async (width, height) => {
    const id = await bucketDemoId();
    const page = await open({ width, height });
    await page.goto(`/curve-lab/demos/${id}/projector`);
    // first visit: the key list is open
    await page.waitForSelector("[data-testid=key-legend]");
    await page.waitForFunction(
      () => Number(document.querySelector<HTMLCanvasElement>("[data-testid=curve-chart]")?.dataset.renders ?? 0) > 0,
    );
    await screenshot(page, `curve-lab-projector-${width}x${height}-keys`);
    const withKeys = await overflow(page);
    expect(withKeys.outside).toEqual([]);
    expect(withKeys.scrollHeight).toBeLessThanOrEqual(withKeys.innerHeight);
    expect(withKeys.projectorScroll).toBeLessThanOrEqual(0);

    // K hides it; the view still fits, and the chart keeps a useful height
    await page.keyboard.press("k");
    await page.waitForSelector("[data-testid=key-legend]", { state: "detached" });
    const fit = await overflow(page);
    expect(fit.outside).toEqual([]);
    expect(fit.scrollHeight).toBeLessThanOrEqual(fit.innerHeight);
    const chartBox = (await page.locator("[data-testid=curve-chart]").boundingBox())!;
    expect(chartBox.height).toBeGreaterThanOrEqual(height * 0.4);
    // every case of the demo is labelled on the chart; the stability labels are drawn
    const { rows } = await db.query<{ n: number }>(
      `SELECT jsonb_array_length(r.spec->'cases') AS n FROM demos d JOIN demo_revisions r ON r.id = d.current_revision_id WHERE d.id = $1`,
      [id],
    );
    const labels = await chartLabels(page);
    for (let i = 0; i < rows[0]!.n; i++) expect(labels).toContain(`case-${i}`);
    expect(labels).toContain("unstable");
    // the thrust line can be drawn (H) and is labelled
    await page.keyboard.press("h");
    await page.waitForFunction(() =>
      document.querySelector("[data-testid=curve-chart]")?.getAttribute("data-labels")?.includes("thrust-0"),
    );
    await screenshot(page, `curve-lab-projector-${width}x${height}`);

    // the key list opened by itself only the first time
    await page.reload();
    await page.waitForSelector("[data-testid=projector]");
    await page.waitForFunction(
      () => Number(document.querySelector<HTMLCanvasElement>("[data-testid=curve-chart]")?.dataset.renders ?? 0) > 0,
    );
    expect(await page.locator("[data-testid=key-legend]").count()).toBe(0);
    await page.keyboard.press("k");
    await page.waitForSelector("[data-testid=key-legend]");
  });

  it("the exported PNG is at least 1600 px wide and carries the title, the aircraft, the cases and the caution", async () => {
    const id = await bucketDemoId();
    const page = await open({ width: 1280, height: 800 });
    await page.goto(`/curve-lab/demos/${id}`);
    await page.waitForSelector("[data-testid=curve-chart]");
    // record what is written on any canvas from now on
    await page.evaluate(() => {
      const seen: string[] = [];
      (window as unknown as { __drawn: string[] }).__drawn = seen;
      const original = CanvasRenderingContext2D.prototype.fillText;
      CanvasRenderingContext2D.prototype.fillText = function (text: string, x: number, y: number, maxWidth?: number) {
        seen.push(text);
        return maxWidth === undefined ? original.call(this, text, x, y) : original.call(this, text, x, y, maxWidth);
      };
    });
    await page.check("[data-testid=export-paper]");
    const [download] = await Promise.all([page.waitForEvent("download"), page.click("text=Export chart (PNG)")]);
    const png = readFileSync((await download.path())!);
    await download.saveAs("tests/artifacts/screenshots/curve-lab-export-paper.png");
    // PNG signature, then the IHDR chunk: width and height as big-endian 32-bit integers at bytes 16 and 20
    expect(png.subarray(1, 4).toString("latin1")).toBe("PNG");
    expect(png.subarray(12, 16).toString("latin1")).toBe("IHDR");
    expect(png.readUInt32BE(16)).toBeGreaterThanOrEqual(1600);
    expect(png.readUInt32BE(20)).toBeGreaterThan(900);
    expect(download.suggestedFilename()).toBe("Why drag has a bucket (paper).png");
    const drawn = await page.evaluate(() => (window as unknown as { __drawn: string[] }).__drawn);
    expect(drawn[0]).toBe("Why drag has a bucket");
    expect(drawn.some((t) => t.startsWith("Aircraft: "))).toBe(true);
    expect(drawn.some((t) => t.startsWith("Speed: "))).toBe(true);
    expect(drawn.join(" ")).toContain("For ground teaching only");
    await captureScreenshot(page, { path: "tests/artifacts/screenshots/curve-lab-export-page.png" });
  });

  it("on a phone the builder's chart keeps its speed-unstable label and the page does not scroll sideways", async () => {
    const id = await bucketDemoId();
    const page = await open({ width: 390, height: 844 });
    await page.goto(`/curve-lab/demos/${id}`);
    await page.waitForSelector("[data-testid=curve-chart]");
    await page.waitForFunction(
      () => Number(document.querySelector<HTMLCanvasElement>("[data-testid=curve-chart]")?.dataset.renders ?? 0) > 0,
    );
    expect(await chartLabels(page)).toContain("unstable");
    expect(await chartLabels(page)).toContain("case-0");
    const wide = await page.evaluate(() => document.scrollingElement!.scrollWidth - window.innerWidth);
    expect(wide).toBeLessThanOrEqual(0);
    await screenshot(page, "curve-lab-builder-390x844");
  });
});
