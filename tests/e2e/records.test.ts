// End to end in headless Chromium against the production build: an instructor records an oral
// check with a generated question on the tablet and signs the item off (re-entering the password);
// the chief sees it in the Sign-off register, exports the CSV and verifies the audit chain; the
// student sees the Progress map change. Screenshots of each Records page for each role.
import { readFileSync } from "node:fs";
import type { Client } from "pg";
import { launchBrowser, signIn, screenshot, DEMO_PASSWORD, type Browser } from "./helpers/browser";
import { ownerClient } from "./helpers/db";

let tablet: Browser;
let desk: Browser;
let phone: Browser;
let db: Client;
let adaId: string;

beforeAll(async () => {
  tablet = await launchBrowser({ width: 1024, height: 1366 });
  desk = await launchBrowser({ width: 1280, height: 900 });
  phone = await launchBrowser({ width: 390, height: 844 });
  db = await ownerClient();
  const { rows } = await db.query<{ id: string }>(`SELECT id FROM people WHERE email = 'student@chalkwing.test'`);
  adaId = rows[0]!.id;
});
afterAll(async () => {
  await tablet?.close();
  await desk?.close();
  await phone?.close();
  await db?.end();
});

describe("Records end to end", () => {
  it("a check with a generated question and a sign-off show in the register, the CSV, the chain and the student's Progress map", async () => {
    // the student's Progress map before: AER-03 not signed
    const student = await phone.context.newPage();
    await signIn(student, "student@chalkwing.test");
    await student.goto(`/progress/${adaId}`);
    await student.waitForSelector("[data-testid=progress-grid]");
    const before = await student.getAttribute("[data-testid=item-AER-03]", "data-status");
    expect(["not_started", "checked"]).toContain(before);

    // the instructor, on a tablet, records a check on AER-03 with a generated Vmd question
    const page = await tablet.context.newPage();
    await signIn(page, "instructor@chalkwing.test");
    await page.goto("/records");
    await screenshot(page, "records-e2e-instructor-list");
    await Promise.all([
      page.waitForURL(new RegExp(`/records/${adaId}$`)),
      page.click("a[data-testid=record-student]:has-text('Ada Quill')"),
    ]);
    await page.waitForSelector("form[aria-label='Oral check']");
    await page.uncheck("label:has-text('AER-01') input[name=itemIds]");
    await page.check("label:has-text('AER-03') input[name=itemIds]");
    await page.check("input[name=levelShown][value=application]");
    await page.selectOption("[id='questions.0.item']", { label: "AER-03 Total drag and the minimum-drag speed" });
    await page.selectOption("[id='questions.0.mode']", "generated");
    await page.selectOption("[id='questions.0.kind']", "vmd");
    await page.selectOption("[id='questions.0.aircraft']", { label: "Larkhollow LT-2 trainer (reference)" });
    await page.fill("[id='questions.0.massKg']", "1000");
    await page.fill("[id='questions.0.altitudeFt']", "4000");
    // the instructor accepts the trade's rule of thumb (TAS from IAS at 2 % per 1,000 ft: common practice)
    await page.selectOption("[id='questions.0.answerMode']", "rule_of_thumb");
    const preview = await page.textContent("[data-testid=generated-preview]");
    expect(preview).toContain("1,000 kg, 4,000 ft");
    expect(preview).toMatch(/Answer: \d+\.\d kt TAS/);
    await page.fill("[id='questions.0.figure']", "78");
    await page.fill("[id='questions.0.answer']", "Worked it from the EAS and the density ratio.");
    // nothing starts as a pass: the verdict waits for the outcome and the element kind (issue 12)
    expect(await page.textContent("[data-testid=outcome-verdict]")).toContain("not decided yet");
    await page.check("input[name='questions.0.outcome'][value=solid]");
    await page.check("input[name='questions.0.required'][value=required]");
    expect(await page.textContent("[data-testid=outcome-verdict]")).toContain("Meets the standard");
    await screenshot(page, "records-e2e-check-form");
    await page.click("button[type=submit]:has-text('Record the check')");
    await page.waitForSelector("[data-testid=check-message]:has-text('Check recorded: Meets the standard')", { timeout: 20_000 });
    // the record shows the instructor's answer mode with its tolerance beside the computed answer
    // (the seeded check on AER-03 asked the exact answer)
    const mode = "[data-testid=check-history] [data-testid=answer-mode]";
    await page.waitForSelector(`${mode}:has-text('Rule of thumb accepted')`, { timeout: 20_000 });
    expect(await page.textContent(`${mode}:has-text('Rule of thumb accepted')`)).toMatch(
      /^Rule of thumb accepted \(TAS = IAS \+ 2 % per 1,000 ft: \d+\.\d kt\): accepted \d+\.\d to \d+\.\d kt/,
    );
    expect(await page.textContent(`${mode}:has-text('Exact answer asked')`)).toMatch(/^Exact answer asked: accepted within 3 %, /);

    // the stored question keeps the library's answer, inputs, aircraft snapshot and version
    const { rows: stored } = await db.query<{
      generated: { kind: string; inputs: { massKg: number }; libraryVersion: string; aircraft: { name: string } };
    }>(
      `SELECT q.generated FROM oral_check_questions q JOIN oral_checks c ON c.id = q.check_id WHERE c.student_id = $1 AND q.generated IS NOT NULL ORDER BY c.recorded_at DESC LIMIT 1`,
      [adaId],
    );
    expect(stored[0]!.generated).toMatchObject({ kind: "vmd", inputs: { massKg: 1000 }, aircraft: { name: "Larkhollow LT-2 trainer" } });
    expect(stored[0]!.generated.libraryVersion).toMatch(/^\d+\.\d+\.\d+$/);

    // sign AER-03 off: the statement is shown; a wrong password is refused, the right one signs
    await page.waitForSelector("[data-testid=sign-AER-03]");
    await page.click("[data-testid=sign-AER-03]");
    const statement = await page.textContent("[data-testid=statement]");
    expect(statement).toContain("Ada Quill");
    expect(statement).toContain("AER-03");
    await page.fill("form[aria-label='Sign off AER-03'] input[type=password]", "not-my-password");
    await page.click("form[aria-label='Sign off AER-03'] button[type=submit]");
    await page.waitForSelector("form[aria-label='Sign off AER-03'] [role=alert]:has-text('does not match')");
    await page.fill("form[aria-label='Sign off AER-03'] input[type=password]", DEMO_PASSWORD);
    await screenshot(page, "records-e2e-sign-off");
    await page.click("form[aria-label='Sign off AER-03'] button[type=submit]");
    await page.waitForSelector("tr:has-text('AER-03') :text('Signed for')", { timeout: 20_000 });
    await screenshot(page, "records-e2e-student-record-instructor");

    // the chief sees it in the register, exports the CSV and verifies the chain
    const chief = await desk.context.newPage();
    await signIn(chief, "chief@chalkwing.test");
    await chief.goto("/register");
    await chief.waitForSelector("[data-testid=register-row]:has-text('Ada Quill'):has-text('AER-03')");
    await screenshot(chief, "records-e2e-register-chief");
    const [download] = await Promise.all([chief.waitForEvent("download"), chief.click("[data-testid=export-csv]")]);
    const csv = readFileSync((await download.path())!, "utf8");
    expect(csv).toMatch(/Ada Quill,Kestrel cohort,AER,AER-03,Total drag and the minimum-drag speed,Tomasz Varga/);
    const headInCsv = /audit chain head hash,([0-9a-f]{64})/.exec(csv)?.[1];
    expect(headInCsv).toBeDefined();
    await chief.goto("/register/chain");
    await chief.waitForSelector("[data-testid=chain-result]");
    expect(await chief.textContent("[data-testid=chain-result] h2")).toBe("The chain verifies");
    expect(await chief.textContent("[data-testid=chain-result]")).toContain(headInCsv!);
    await screenshot(chief, "records-e2e-chain-chief");
    // a full walk is asked for and runs in the background worker; the page shows its progress and result
    await chief.getByRole("button", { name: "Walk the whole chain now" }).click();
    await chief.waitForSelector("[data-testid=full-walk][data-state=ok]", { timeout: 60_000 });
    expect(await chief.textContent("[data-testid=walk-status]")).toMatch(/every link holds[\s\S]*Checked ([\d,]+) of \1 events/);
    await chief.goto("/today");
    await chief.waitForSelector("[data-testid=records-today]");
    expect(await chief.textContent("[data-testid=records-today]")).toContain("Verifies");
    await screenshot(chief, "records-e2e-today-chief");

    // a bad filter is refused naming the field; the API says 400
    await chief.goto("/register?from=yesterday");
    expect(await chief.textContent("[data-testid=filter-error]")).toContain("from");
    const bad = await chief.request.get("/api/register/export?to=2026-13-45");
    expect(bad.status()).toBe(400);
    expect((await bad.json()).error.field).toBe("to");

    // the student sees the Progress map change, and acknowledges the debrief
    await student.goto(`/progress/${adaId}`);
    await student.waitForSelector("[data-testid=progress-grid]");
    expect(await student.getAttribute("[data-testid=item-AER-03]", "data-status")).toBe("signed");
    expect(await student.textContent("[data-testid=item-AER-03]")).toContain("Tomasz Varga");
    expect(await student.textContent("main")).not.toContain("Remarks (internal)");
    const studentModes = await student.locator("[data-testid=progress-check] [data-testid=answer-mode]").allTextContents();
    expect(studentModes).toEqual(
      expect.arrayContaining([expect.stringMatching(/^Rule of thumb accepted \(TAS = IAS \+ 2 % per 1,000 ft/)]),
    );
    await screenshot(student, "records-e2e-progress-student");
    const width = await student.evaluate(() => document.documentElement.scrollWidth);
    expect(width).toBeLessThanOrEqual(390);
  });

  it("screens for each role: Progress map for the sponsor and staff, the records list for the chief", async () => {
    // fresh browsers: the first test's are signed in as others
    await phone.close();
    await desk.close();
    phone = await launchBrowser({ width: 390, height: 844 });
    desk = await launchBrowser({ width: 1280, height: 900 });
    const sponsor = await phone.context.newPage();
    await signIn(sponsor, "sponsor@chalkwing.test");
    await sponsor.goto(`/progress/${adaId}`);
    await sponsor.waitForSelector("[data-testid=progress-grid]");
    expect(await sponsor.textContent("main")).not.toContain("Remarks (internal)");
    await screenshot(sponsor, "records-e2e-progress-sponsor");
    const other = await sponsor.goto(
      `/progress/${(await db.query<{ id: string }>(`SELECT id FROM people WHERE email = 'noor.brandt@chalkwing.test'`)).rows[0]!.id}`,
    );
    expect(other?.status()).toBe(404);
    expect(await sponsor.textContent("body")).not.toContain("Noor");

    const chief = await desk.context.newPage();
    await signIn(chief, "chief@chalkwing.test");
    await chief.goto("/records");
    await chief.waitForSelector("[data-testid=record-student]");
    await screenshot(chief, "records-e2e-records-chief");
    const mateo = (await db.query<{ id: string }>(`SELECT id FROM people WHERE email = 'mateo.ferreira@chalkwing.test'`)).rows[0]!.id;
    await chief.goto(`/records/${mateo}`);
    await chief.waitForSelector("#stages");
    await screenshot(chief, "records-e2e-student-record-chief");
    await chief.goto(`/progress/${adaId}`);
    await chief.waitForSelector("[data-testid=progress-grid]");
    await screenshot(chief, "records-e2e-progress-chief");
  });
});
