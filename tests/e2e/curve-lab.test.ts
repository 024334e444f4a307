// End to end in headless Chromium against the production build: an instructor builds a demo from
// a seeded aircraft profile, saves it and opens the Projector view; a student opens the demo
// assigned to their cohort, makes a Call it first prediction and sees the reveal; a student's call
// of the save action over HTTP is refused by the server (403).
import { readFileSync } from "node:fs";
import type { Client } from "pg";
import { launchBrowser, signIn, screenshot, type Browser } from "./helpers/browser";
import { ownerClient } from "./helpers/db";
import { callAction, actionResultFromRsc, signInOrThrow } from "./helpers/http";
import { deriveActions } from "./authz/derive";
import { demoSpecSchema } from "@/lib/curve-lab/schema";
import { ktToMs } from "@/lib/aero";

let instructorBrowser: Browser;
let studentBrowser: Browser;
let db: Client;

beforeAll(async () => {
  instructorBrowser = await launchBrowser({ width: 1280, height: 900 });
  studentBrowser = await launchBrowser({ width: 390, height: 844 });
  db = await ownerClient();
});
afterAll(async () => {
  await instructorBrowser?.close();
  await studentBrowser?.close();
  await db?.end();
});

async function bucketDemo(): Promise<{ id: string; revisionId: string }> {
  const { rows } = await db.query<{ id: string; revisionId: string }>(
    `SELECT id, current_revision_id AS "revisionId" FROM demos WHERE name = 'Why drag has a bucket' AND deleted_at IS NULL`,
  );
  if (rows.length !== 1) throw new Error("the seeded demo is missing");
  return rows[0]!;
}

describe("Curve Lab end to end", () => {
  it("an instructor builds a demo from a seeded aircraft, saves it and opens the Projector view", async () => {
    const page = await instructorBrowser.context.newPage();
    const requests: string[] = [];
    await signIn(page, "instructor@chalkwing.test");
    await page.goto("/curve-lab/demos/new");
    await page.waitForSelector("[data-testid=curve-chart]");
    await page.selectOption("#demo-airframe", { label: "Tern T4 (four-seat tourer)" });
    await page.fill("#demo-name", "E2E: gear and mass");
    const vmdBefore = await page.textContent("[data-testid=readout-vmd]");

    // Dragging the slider redraws in place: no request leaves the page while it moves (Next's
    // background prefetches of navigation links, marked by their header, are not the demo's).
    await page.waitForLoadState("networkidle");
    page.on("request", (r) => {
      if (!r.headers()["next-router-prefetch"]) requests.push(r.url());
    });
    const slider = page.locator("[data-testid=mass-0]");
    await slider.focus();
    for (let i = 0; i < 30; i++) await page.keyboard.press("ArrowLeft");
    await page.keyboard.press("Home"); // to the empty mass
    expect(requests).toEqual([]);
    const vmdAfter = await page.textContent("[data-testid=readout-vmd]");
    expect(vmdAfter).not.toEqual(vmdBefore);

    await page.click("text=Add case");
    await page.selectOption("#conf-1", "gearDown");
    await page.click("[data-testid=save-demo]");
    await page.waitForURL(/\/curve-lab\/demos\/[0-9a-f-]{36}$/);
    const demoId = page.url().split("/").pop()!;
    await page.waitForSelector("h1:has-text('E2E: gear and mass')");
    expect(await page.locator("[data-testid=caution]").first().isVisible()).toBe(true);
    await screenshot(page, "curve-lab-builder");

    // Handouts: the chart as PNG, the sampled data as CSV (through lib/csv.ts).
    const [png] = await Promise.all([page.waitForEvent("download"), page.click("text=Export chart (PNG)")]);
    expect(png.suggestedFilename()).toBe("E2E_ gear and mass.png");
    expect(
      readFileSync((await png.path())!)
        .subarray(1, 4)
        .toString("latin1"),
    ).toBe("PNG");
    const [csv] = await Promise.all([page.waitForEvent("download"), page.click("text=Export data (CSV)")]);
    const lines = readFileSync((await csv.path())!, "utf8")
      .trim()
      .split("\r\n");
    expect(lines).toHaveLength(401); // a header and 400 sampled speeds
    expect(lines[0]).toMatch(/^EAS \(kt\),Max mass: zero-lift drag \(N\),/);
    expect(lines[0]!.split(",")).toHaveLength(1 + 2 * 8); // seven figures and the model validity words per case

    // What was saved is the spec the builder showed: two cases, the second with the gear down.
    const { rows } = await db.query<{ spec: unknown; number: number }>(
      `SELECT r.spec, r.number FROM demos d JOIN demo_revisions r ON r.id = d.current_revision_id WHERE d.id = $1`,
      [demoId],
    );
    const spec = demoSpecSchema.parse(rows[0]!.spec);
    expect(rows[0]!.number).toBe(1);
    expect(spec.airframe.name).toBe("Tern T4 (four-seat tourer)");
    expect(spec.cases.map((c) => c.configuration)).toEqual(["clean", "gearDown"]);
    expect(spec.cases[0]!.massKg).toBe(780); // the Tern's empty mass, where Home took the slider

    await page.click("text=Projector view");
    await page.waitForSelector("[data-testid=key-legend]");
    const fontPx = await page.$eval("[data-testid=projector-readout]", (el) => parseFloat(getComputedStyle(el).fontSize));
    expect(fontPx).toBeGreaterThanOrEqual(28);
    // no editing chrome: no Save button, no sliders
    expect(await page.locator("[data-testid=save-demo]").count()).toBe(0);
    expect(await page.locator("input[type=range]").count()).toBe(0);
    const readout = await page.textContent("[data-testid=projector-readout]");
    await page.keyboard.press("ArrowRight");
    await page.waitForFunction((before) => document.querySelector("[data-testid=projector-readout]")?.textContent !== before, readout);
    expect(await page.locator("[data-testid=key-legend]").textContent()).toContain("Total drag on");
    await page.keyboard.press("t");
    await page.waitForSelector("[data-testid=key-legend] >> text=Total drag off");
    await page.keyboard.press("t");
    await screenshot(page, "curve-lab-projector");
  });

  it("a student opens the assigned demo, calls Vmd first and sees the reveal; the call is stored with its error", async () => {
    const demo = await bucketDemo();
    // one call per student and revision: clear a call an earlier test file made on this demo (the
    // authorisation harness calls it as the student), so this walk starts before the call
    await db.query(
      `DELETE FROM demo_calls c USING demo_revisions r, demos d, people p
        WHERE r.id = c.demo_revision_id AND d.id = r.demo_id AND d.name = $1 AND p.id = c.student_id AND p.email = $2`,
      ["Why drag has a bucket", "student@chalkwing.test"],
    );
    const page = await studentBrowser.context.newPage();
    await signIn(page, "student@chalkwing.test");
    await page.goto("/curve-lab");
    await page.click("text=Why drag has a bucket");
    await page.waitForSelector("[data-testid=call-it-first]");
    expect(await page.locator("[data-testid=save-demo]").count()).toBe(0);
    // before the call: no Vmd readout
    expect(await page.locator("[data-testid=readout-vmd]").count()).toBe(0);
    await screenshot(page, "curve-lab-student-call");

    await page.fill("#call-number", "65");
    await page.click("[data-testid=make-call]");
    await page.waitForSelector("[data-testid=call-result] >> text=answer");
    expect(await page.locator("[data-testid=readout-vmd]").isVisible()).toBe(true);
    const vmdText = (await page.textContent("[data-testid=readout-vmd]"))!;
    expect(await page.locator("[data-testid=call-result]").textContent()).toContain(vmdText);
    await screenshot(page, "curve-lab-student-reveal");
    // one call per revision: a reload after the reveal shows the result and the student's own calls, not a new prompt
    await page.reload();
    await page.waitForSelector("[data-testid=call-result] >> text=answer");
    expect(await page.locator("[data-testid=make-call]").isDisabled()).toBe(true);
    expect(await page.locator("[data-testid=own-calls]").textContent()).toContain("Revision 1, Vmd: your call 65 kt");

    const { rows } = await db.query<{ predicted: number; actual: number; error: number; kind: string }>(
      `SELECT c.predicted_ms AS predicted, c.actual_ms AS actual, c.error_ms AS error, c.marker_kind AS kind
         FROM demo_calls c JOIN people p ON p.id = c.student_id
        WHERE p.email = 'student@chalkwing.test' AND c.demo_revision_id = $1 ORDER BY c.created_at DESC LIMIT 1`,
      [demo.revisionId],
    );
    expect(rows[0]!.kind).toBe("vmd");
    expect(rows[0]!.predicted).toBeCloseTo(ktToMs(65), 6);
    expect(rows[0]!.error).toBeCloseTo(rows[0]!.predicted - rows[0]!.actual, 9);
    expect(vmdText).toBe(`${Math.round(rows[0]!.actual / ktToMs(1))} kt`);

    // their instructor sees the call on the demo page
    const instructor = await instructorBrowser.context.newPage();
    await instructor.goto(`/curve-lab/demos/${demo.id}`);
    expect(await instructor.locator("[data-testid=calls-table]").textContent()).toContain("Ada Quill");
  });

  it("refuses a student's call of the save action with 403 from the server, and changes nothing", async () => {
    const demo = await bucketDemo();
    const save = deriveActions().find((a) => a.key === "action app/(app)/curve-lab/actions.ts#saveDemoAction");
    expect(save).toBeDefined();
    const { rows: before } = await db.query<{ spec: unknown; n: number }>(
      `SELECT (SELECT spec FROM demo_revisions WHERE id = $1) AS spec, (SELECT count(*)::int FROM demo_revisions WHERE demo_id = $2) AS n`,
      [demo.revisionId, demo.id],
    );
    const spec = demoSpecSchema.parse(before[0]!.spec);
    const cookie = await signInOrThrow("student@chalkwing.test", "chalkwing-demo");
    const res = await callAction({
      actionId: save!.id,
      pagePath: `/curve-lab/demos/${demo.id}`,
      args: [{ demoId: demo.id, name: "Mine now", spec: { ...spec, notes: "overwritten" } }],
      cookie,
    });
    expect(actionResultFromRsc(await res.text())).toMatchObject({ ok: false, status: 403 });
    const { rows: after } = await db.query<{ name: string; n: number; notes: string }>(
      `SELECT d.name, (SELECT count(*)::int FROM demo_revisions WHERE demo_id = d.id) AS n, r.spec->>'notes' AS notes
         FROM demos d JOIN demo_revisions r ON r.id = d.current_revision_id WHERE d.id = $1`,
      [demo.id],
    );
    expect(after[0]).toEqual({ name: "Why drag has a bucket", n: before[0]!.n, notes: spec.notes });
  });
});
