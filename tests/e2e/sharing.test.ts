// Consent and sponsors on a phone (390x844): the student changes what their sponsor sees and the
// sponsor's Today follows at once; the sponsor finds the demo's Weekly letters already sent, reads
// one, opens its unsubscribe page, and after stopping the letter sees it is off and turns it back on.
import type { Client } from "pg";
import type { Page } from "playwright-core";
import { sequelize } from "@/db/index";
import { launchBrowser, screenshot, signIn, type Browser } from "./helpers/browser";
import { ownerClient } from "./helpers/db";
import { DEMO_ACCOUNTS } from "./helpers/accounts";

jest.setTimeout(180_000);

const PHONE = { width: 390, height: 844 };
let db: Client;
let student: Browser;
let sponsor: Browser;
let ids: { student: string; sponsor: string };

beforeAll(async () => {
  db = await ownerClient();
  const { rows } = await db.query<{ email: string; id: string }>(`SELECT email, id FROM people WHERE email = ANY($1)`, [
    [DEMO_ACCOUNTS.student, DEMO_ACCOUNTS.sponsor],
  ]);
  ids = {
    student: rows.find((r) => r.email === DEMO_ACCOUNTS.student)!.id,
    sponsor: rows.find((r) => r.email === DEMO_ACCOUNTS.sponsor)!.id,
  };
  student = await launchBrowser(PHONE);
  sponsor = await launchBrowser(PHONE);
});
afterAll(async () => {
  await db.query(`UPDATE sponsor_links SET shares_outcomes = true, shares_progress = true, weekly_letter = true WHERE sponsor_id = $1`, [
    ids.sponsor,
  ]);
  await db.query(`DELETE FROM mail_unsubscribes WHERE sponsor_id = $1`, [ids.sponsor]);
  await student?.close();
  await sponsor?.close();
  await db?.end();
  await sequelize.close();
});

async function fitsThePhone(p: Page) {
  const wide = await p.evaluate(() => document.documentElement.scrollWidth);
  expect(wide).toBeLessThanOrEqual(PHONE.width);
}

test("the student withdraws check results and milestones; the sponsor's Today loses them at once, and gets them back", async () => {
  const sp = await sponsor.context.newPage();
  await signIn(sp, DEMO_ACCOUNTS.sponsor);
  await sp.goto("/today");
  const entry = sp.locator("[data-testid=sponsored-student]").first();
  await entry.waitFor();
  await expect(entry.innerText()).resolves.toMatch(/syllabus items signed off/);
  // names link to the Progress map, and codes come with their titles
  await expect(entry.locator(`a[href="/progress/${ids.student}"]`).count()).resolves.toBe(1);
  const before = await entry.innerText();
  expect(before).not.toMatch(/\b[A-Z]{3}-\d\d\b(?![ ][A-Z])/);
  await fitsThePhone(sp);
  await screenshot(sp, "sharing-sponsor-today-390");

  const st = await student.context.newPage();
  await signIn(st, DEMO_ACCOUNTS.student);
  await st.goto("/sharing");
  const card = st.locator("[data-testid=sponsor-consent]").first();
  await card.waitFor();
  await fitsThePhone(st);
  await screenshot(st, "sharing-student-390");
  await card.getByLabel("Milestones").uncheck();
  await card.getByLabel("Check results").uncheck();
  await card.getByRole("button", { name: /^Save for/ }).click();
  await card.getByText("Saved.").waitFor();

  await sp.reload();
  const after = await sp.locator("[data-testid=sponsored-student]").first().innerText();
  expect(after).not.toMatch(/syllabus items signed off/);
  expect(after).not.toMatch(/Latest oral check/);
  await expect(sp.locator(`a[href="/progress/${ids.student}"]`).count()).resolves.toBe(0);

  await card.getByLabel("Milestones").check();
  await card.getByLabel("Check results").check();
  await card.getByRole("button", { name: /^Save for/ }).click();
  await card.getByText("Saved.").waitFor();
  await sp.reload();
  await expect(sp.locator("[data-testid=sponsored-student]").first().innerText()).resolves.toMatch(/syllabus items signed off/);
});

test("the sponsor finds the demo's letters, reads one, opens its unsubscribe page; after stopping, Today says it is off", async () => {
  const sp = await sponsor.context.newPage();
  await sp.goto("/letters");
  const items = sp.locator("[data-testid=letter-history] li");
  await items.first().waitFor();
  expect(await items.count()).toBeGreaterThanOrEqual(2);
  await fitsThePhone(sp);
  await screenshot(sp, "sharing-letters-390");
  await items.first().locator("a").click();
  const body = sp.locator("[data-testid=letter-body]");
  await body.waitFor();
  const text = await body.innerText();
  expect(text).toMatch(/^Dear /m);
  expect(text).not.toMatch(/A strong week/);
  await fitsThePhone(sp);
  await screenshot(sp, "sharing-letter-390");
  const unsubscribe = /(https?:\/\/\S+\/unsubscribe\/[\w.-]+)/.exec(text)![1]!;
  await sp.goto(new URL(unsubscribe).pathname);
  await sp.locator("h1").waitFor();
  await expect(sp.locator("main").innerText()).resolves.toMatch(/Weekly letter/);
  await screenshot(sp, "sharing-unsubscribe-390");

  // the sponsor stops the letter (the unsubscribe button's effect), then Today says so
  await db.query(`INSERT INTO mail_unsubscribes (sponsor_id, student_id, kind) VALUES ($1, $2, 'weekly.letter') ON CONFLICT DO NOTHING`, [
    ids.sponsor,
    ids.student,
  ]);
  await sp.goto("/today");
  const status = sp.locator("[data-testid=letter-status]").first();
  await expect(status.innerText()).resolves.toMatch(/is off: you stopped it/);
  await screenshot(sp, "sharing-sponsor-letter-off-390");
  await sp.getByRole("button", { name: /Receive the Weekly letter about .* again/ }).click();
  // the confirmation is the line itself turning to "is on" (the refresh replaces the button and its note)
  await sp
    .locator("[data-testid=letter-status]", { hasText: /is on\./ })
    .first()
    .waitFor();
  await sp.reload();
  await expect(sp.locator("[data-testid=letter-status]").first().innerText()).resolves.toMatch(/is on/);
});

test("wide screen: the student's Sharing, the sponsor's letters and the chief's Weekly letters at 1280x800", async () => {
  const wide = await launchBrowser();
  try {
    const p = await wide.context.newPage();
    await signIn(p, DEMO_ACCOUNTS.chief);
    await p.goto(`/mail/letters?sponsor=${ids.sponsor}&student=${ids.student}`);
    await p.locator("[data-testid=letter-preview]").waitFor();
    await expect(p.locator("[data-testid=letter-preview]").innerText()).resolves.toMatch(/Coming up, to /);
    await screenshot(p, "sharing-chief-letters-1280");
    const q = await (await launchBrowser()).context.newPage();
    await signIn(q, DEMO_ACCOUNTS.student);
    await q.goto("/sharing");
    await q.locator("[data-testid=sponsor-consent]").first().waitFor();
    await screenshot(q, "sharing-student-1280");
    const r = await (await launchBrowser()).context.newPage();
    await signIn(r, DEMO_ACCOUNTS.sponsor);
    await r.goto("/today");
    await r.locator("[data-testid=sponsored-student]").first().waitFor();
    await screenshot(r, "sharing-sponsor-today-1280");
    await r.goto("/letters");
    await r.locator("[data-testid=letter-history]").waitFor();
    await screenshot(r, "sharing-letters-1280");
    await q.context().close();
    await r.context().close();
  } finally {
    await wide.close();
  }
});
