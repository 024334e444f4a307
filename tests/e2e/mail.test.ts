// Mail through the services the test command starts (sink + worker beside the production
// server): a mail written to the outbox reaches the sink and the chief's Mail tray; the
// set-password link works once; unsubscribe GET changes nothing and the button stops the
// letter; the settings form saves and names a bad field. Screenshots for a look.
import { randomUUID } from "node:crypto";
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import type { Client } from "pg";
import type { Page } from "playwright-core";
import { sequelize } from "@/db/index";
import { enqueueMail } from "@/db/access/mail/outbox";
import { createSetPasswordLink } from "@/db/access/mail/set-password";
import { composeMail } from "@/lib/mail/compose";
import { signUnsubscribe } from "@/lib/mail/unsubscribe-token";
import { launchBrowser, screenshot, signIn, type Browser } from "./helpers/browser";
import { ownerClient } from "./helpers/db";
import { demoSchoolId, makeAccount, DEMO_ACCOUNTS } from "./helpers/accounts";

jest.setTimeout(120_000);

let db: Client;
let browser: Browser;
let schoolId: string;

beforeAll(async () => {
  db = await ownerClient();
  schoolId = await demoSchoolId(db);
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await db?.end();
  await sequelize.close();
});

/** A page in a fresh browser profile (no session left over from another test). */
async function page(): Promise<Page> {
  await browser.close();
  browser = await launchBrowser();
  return browser.context.newPage();
}

function sinkHas(messageId: string): boolean {
  const dir = process.env.MAIL_SINK_DIR;
  if (!dir) throw new Error("MAIL_SINK_DIR is not set: run through `npm test -- --only e2e`");
  const f = path.join(dir, "index.jsonl");
  return existsSync(f) && readFileSync(f, "utf8").includes(messageId);
}

async function until(what: string, fn: () => boolean | Promise<boolean>, ms = 60_000) {
  const end = Date.now() + ms;
  while (!(await fn())) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

test("a mail written to the outbox is sent by the worker to the sink and shows in the chief's Mail tray", async () => {
  const key = `e2e.tray:${randomUUID()}`;
  const title = `Tray check ${key.slice(-6)}`;
  const mail = composeMail(
    "record.signed",
    { name: "<Ada> Quill", itemCode: "AER-03", itemTitle: title, signerName: "Instructor", signedOn: "2026-12-01" },
    { name: "Larkhollow Flying School", timeZone: "Europe/London" },
  );
  await sequelize.transaction((t) =>
    enqueueMail(t, { schoolId, kind: "record.signed", idempotencyKey: key, to: "ada.tray@chalkwing.test", ...mail }),
  );
  const { rows } = await db.query<{ message_id: string }>(`SELECT message_id FROM outbox WHERE idempotency_key = $1`, [key]);
  await until("the sink to receive the mail", () => sinkHas(rows[0]!.message_id));
  await until(
    "the outbox row to be sent",
    async () => (await db.query(`SELECT 1 FROM outbox WHERE idempotency_key = $1 AND state = 'sent'`, [key])).rowCount === 1,
  );

  const p = await page();
  await signIn(p, DEMO_ACCOUNTS.chief);
  await p.goto("/mail");
  await p.click(`text=Signed off: AER-03 ${title}`);
  await p.waitForSelector("[data-testid=tray-html]");
  expect(await p.textContent("[data-testid=tray-text]")).toContain("Hello <Ada>,"); // the first name, escaped nowhere in plain text
  const frame = p.frameLocator("[data-testid=tray-html]");
  expect(await frame.locator("h1").textContent()).toBe(`Signed off: AER-03 ${title}`);
  expect(await p.getAttribute("[data-testid=tray-html]", "sandbox")).toBe("");
  await screenshot(p, "mail-tray-chief");
  await p.goto("/mail/outbox?state=sent");
  await p.waitForSelector("[data-testid=outbox-table]");
  expect(await p.textContent("[data-testid=outbox-table]")).toContain(title);
  await screenshot(p, "mail-outbox-chief");
  await p.goto("/mail/outbox?state=bogus");
  expect(await p.textContent("[role=alert]")).toContain("state: not one of");
  await p.close();
});

test("an invitation's set-password link sets the password once, then says it was used", async () => {
  const person = await makeAccount(db, "invitee", "unused-initial-pw-1");
  await db.query(`UPDATE people SET password_hash = NULL WHERE id = $1`, [person.id]);
  const link = await sequelize.transaction((t) => createSetPasswordLink(t, person.id));
  const p = await page();
  await p.goto(new URL(link.url).pathname);
  expect(await p.textContent("main")).toContain(person.email);
  await screenshot(p, "set-password-form");
  await p.fill("#password", "short");
  await p.fill("#confirm", "short");
  await p.click("button[type=submit]");
  await p.waitForSelector("#password-error");
  expect(await p.textContent("#password-error")).toBe("Password must be at least 10 characters");
  await p.fill("#password", "a-chosen-password-7");
  await p.fill("#confirm", "a-chosen-password-7");
  await p.click("button[type=submit]");
  await p.waitForSelector("[data-testid=set-password-done]");
  await p.reload();
  expect(await p.textContent("[data-testid=set-password-state]")).toContain("already been used");
  await signIn(p, person.email, "a-chosen-password-7");
  expect(new URL(p.url()).pathname).toBe("/today");
  await p.close();
});

test("unsubscribe: opening the link changes nothing; the button stops the Weekly letter for that student only", async () => {
  const { rows } = await db.query<{ sponsor_id: string; student_id: string }>(
    `SELECT l.sponsor_id, l.student_id FROM sponsor_links l JOIN people p ON p.id = l.sponsor_id WHERE p.email = $1 ORDER BY l.created_at LIMIT 1`,
    [DEMO_ACCOUNTS.sponsor],
  );
  const link = rows[0]!;
  const token = signUnsubscribe({ sponsorId: link.sponsor_id, studentId: link.student_id, kind: "weekly.letter" });
  const count = async () =>
    Number((await db.query(`SELECT count(*) AS n FROM mail_unsubscribes WHERE sponsor_id = $1`, [link.sponsor_id])).rows[0].n);
  await db.query(`DELETE FROM mail_unsubscribes WHERE sponsor_id = $1`, [link.sponsor_id]);
  try {
    const p = await page();
    await p.goto(`/unsubscribe/${token}`);
    await p.waitForSelector("[data-testid=unsubscribe-confirm]");
    await p.reload();
    expect(await count()).toBe(0);
    await screenshot(p, "unsubscribe-confirm");
    await Promise.all([p.waitForURL(/done=1/), p.click("[data-testid=unsubscribe-confirm]")]);
    expect(await p.textContent("[data-testid=unsubscribe-state]")).toContain("you will no longer receive the Weekly letter");
    expect(await count()).toBe(1);

    // a tampered link shows the refusal and changes nothing
    await p.goto(`/unsubscribe/${token.slice(0, -3)}xyz`);
    expect(await p.textContent("[data-testid=unsubscribe-state]")).toContain("not valid");
    await p.close();

    // the RFC 8058 one-click POST, as a mail client sends it
    const res = await fetch(`${process.env.E2E_BASE_URL}/api/unsubscribe?token=${encodeURIComponent(token)}`, {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body: "List-Unsubscribe=One-Click",
    });
    expect(res.status).toBe(200);
    expect(await count()).toBe(1);
  } finally {
    await db.query(`DELETE FROM mail_unsubscribes WHERE sponsor_id = $1`, [link.sponsor_id]);
  }
});

test("the chief's settings form saves, and a bad value names its field", async () => {
  const before = (await db.query(`SELECT settings FROM schools WHERE id = $1`, [schoolId])).rows[0].settings;
  const p = await page();
  await signIn(p, DEMO_ACCOUNTS.chief);
  await p.goto("/settings");
  await p.fill("#reminderLeadHours", "0");
  await p.click("button[type=submit]");
  await p.waitForSelector("#reminderLeadHours-error");
  expect(await p.textContent("#reminderLeadHours-error")).toBe("at least 1 hour");
  expect((await db.query(`SELECT settings FROM schools WHERE id = $1`, [schoolId])).rows[0].settings).toEqual(before);
  await p.fill("#reminderLeadHours", String(before.reminderLeadHours ?? 24));
  await p.click("button[type=submit]");
  await p.waitForFunction(() => document.querySelector("[data-testid=settings-status]")?.textContent === "Settings saved.");
  await screenshot(p, "settings-chief");
  await p.setViewportSize({ width: 390, height: 800 });
  expect(await p.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
  await p.close();
});
