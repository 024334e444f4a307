// The student's week on a phone (390x844): This week answers "am I on track?" in one line with its
// reasons, lists what to do next with links and the open make-ups; the practice page scores a
// question at once with the worked answer and shows the practice test with the pass mark and the
// date of the knowledge test. The instructor sees the practice readiness on the record page.
import type { Client } from "pg";
import type { Page } from "playwright-core";
import { sequelize } from "@/db/index";
import { launchBrowser, screenshot, signIn, type Browser } from "./helpers/browser";
import { ownerClient } from "./helpers/db";
import { DEMO_ACCOUNTS } from "./helpers/accounts";

jest.setTimeout(180_000);

const PHONE = { width: 390, height: 844 };
let db: Client;
let phone: Browser;
let desk: Browser;
let studentId: string;

beforeAll(async () => {
  db = await ownerClient();
  const { rows } = await db.query<{ id: string }>(`SELECT id FROM people WHERE email = $1`, [DEMO_ACCOUNTS.student]);
  studentId = rows[0]!.id;
  phone = await launchBrowser(PHONE);
  desk = await launchBrowser({ width: 1280, height: 800 });
});
afterAll(async () => {
  await phone?.close();
  await desk?.close();
  await db?.end();
  await sequelize.close();
});

async function fitsThePhone(p: Page) {
  const wide = await p.evaluate(() => document.documentElement.scrollWidth);
  expect(wide).toBeLessThanOrEqual(PHONE.width);
}

test("the student's This week says whether they are on track and why, what to do next, and the open make-ups", async () => {
  const p = await phone.context.newPage();
  await signIn(p, DEMO_ACCOUNTS.student);
  await p.goto("/today");
  const line = p.locator("[data-testid=on-track]");
  await line.waitFor();
  const text = await line.innerText();
  // one line: the standing and the pace to the planned end with its figures
  expect(text).toMatch(/^(On track|Behind): .*\d+(\.\d)? h credited.*(needed by now|needs [\d.]+ h by now)/);
  expect(await line.getAttribute("data-standing")).toBe(text.startsWith("Behind") ? "behind" : "on-track");
  // what to do next: every step is a link
  const steps = p.locator("[data-testid=next-steps] li a");
  expect(await steps.count()).toBeGreaterThan(0);
  for (const href of await steps.evaluateAll((as) => as.map((a) => a.getAttribute("href")))) expect(href).toMatch(/^\//);
  // the open make-ups are on Today, as the cancellation mail promises
  const makeups = p.locator("[data-testid=today-makeups]");
  await expect(makeups.innerText()).resolves.toMatch(/Open make-ups/);
  const { rows } = await db.query<{ n: number }>(
    `SELECT count(*)::int AS n FROM makeup_items WHERE student_id = $1 AND state IN ('open', 'scheduled')`,
    [studentId],
  );
  expect(await makeups.locator("li").count()).toBe(rows[0]!.n);
  await fitsThePhone(p);
  await screenshot(p, "student-week-today-390");
  const d = await desk.context.newPage();
  await signIn(d, DEMO_ACCOUNTS.student);
  await d.goto("/today");
  await d.locator("[data-testid=on-track]").waitFor();
  await screenshot(d, "student-week-today-1280");
});

test("practice: a question is scored at once with the worked answer; the practice test shows the pass mark and the knowledge test date", async () => {
  const p = await phone.context.newPage();
  await signIn(p, DEMO_ACCOUNTS.student);
  await p.goto("/practice");
  await p.locator("[data-testid=caution]").first().waitFor();
  await expect(p.locator("[data-testid=practice-test-terms]").innerText()).resolves.toMatch(
    /pass mark of 80 %\. Your knowledge test is on \w{3} \d{1,2} \w{3} \d{4}\./,
  );
  const before = await db.query<{ n: number }>(`SELECT count(*)::int AS n FROM practice_attempts WHERE student_id = $1`, [studentId]);
  const q = p.locator("[data-testid=practice-question]").first();
  const number = q.locator("input[inputmode=decimal]");
  if ((await number.count()) > 0) await number.fill("1");
  else await q.locator("input[type=radio]").first().check();
  await q.getByRole("button", { name: "Check my answer" }).click();
  const result = q.locator("[data-testid=practice-result]");
  await result.waitFor();
  await expect(result.innerText()).resolves.toMatch(/(Right|Not right this time)\s+Worked answer: /);
  const after = await db.query<{ n: number }>(`SELECT count(*)::int AS n FROM practice_attempts WHERE student_id = $1`, [studentId]);
  expect(after.rows[0]!.n).toBe(before.rows[0]!.n + 1);
  await expect(p.locator("[data-testid=practice-history] li").count()).resolves.toBeGreaterThan(0);
  await fitsThePhone(p);
  await screenshot(p, "student-week-practice-390");
  const d = await desk.context.newPage();
  await signIn(d, DEMO_ACCOUNTS.student);
  await d.goto("/practice");
  await d.locator("[data-testid=practice-test]").waitFor();
  await screenshot(d, "student-week-practice-1280");
});

test("the lead instructor sees the student's practice readiness per item on the record page", async () => {
  const d = await desk.context.newPage();
  await signIn(d, DEMO_ACCOUNTS.instructor);
  await d.goto(`/records/${studentId}`);
  const table = d.locator("[data-testid=practice-readiness]");
  await table.waitFor();
  expect(await table.locator("tbody tr").count()).toBeGreaterThan(0);
  await expect(table.innerText()).resolves.toMatch(/\d+ \(\d+ %\)/);
});
