// End to end on a phone (390x844): the chief invites a new instructor from Accounts and roles (one
// account, one invitation in the outbox even after a second click), and changes the roles of an
// instructor who is signed in elsewhere: that session ends at once (their next request is refused).
import { randomUUID } from "node:crypto";
import { sequelize } from "@/db/index";
import type { Client } from "pg";
import type { Page } from "playwright-core";
import { launchBrowser, signIn, screenshot, BASE_URL, type Browser } from "./helpers/browser";
import { ownerClient } from "./helpers/db";
import { makeAccount } from "./helpers/accounts";
import { signInOrThrow } from "./helpers/http";

let phone: Browser;
let db: Client;
let page: Page;

beforeAll(async () => {
  phone = await launchBrowser({ width: 390, height: 844 });
  db = await ownerClient();
  page = await phone.context.newPage();
});
afterAll(async () => {
  await phone?.close();
  await db?.end();
  await sequelize.close();
});

describe("Accounts and roles", () => {
  it("invites an instructor: one account without a password and one invitation, shown in the list", async () => {
    const tag = randomUUID().slice(0, 8);
    const email = `noor.achterberg.${tag}@chalkwing.test`;
    await signIn(page, "chief@chalkwing.test");
    await page.goto("/people");
    await Promise.all([page.waitForURL(/\/people\/accounts$/), page.click("a:has-text('Invite people and change roles')")]);
    // the list pages 50 accounts at a time: narrow it to the tag first, so the new account shows on it
    await page.fill("#accounts-name", tag);
    await Promise.all([page.waitForURL(/\/people\/accounts\?name=/), page.click("form[aria-label='Find an account'] button[type=submit]")]);
    await page.fill("#inv-name", `Noor Achterberg ${tag}`);
    await page.fill("#inv-email", email);
    await page.check("form[aria-labelledby=invite-title] input[name=roles][value=instructor]");
    const invite = page.locator("form[aria-labelledby=invite-title] button[type=submit]");
    await invite.click();
    await page.waitForSelector(`form[aria-labelledby=invite-title] [role=status]:has-text("Invited Noor Achterberg ${tag}")`);
    // the list is read again after the invitation
    await page.waitForSelector(`[data-testid=accounts-table] td:has-text("Noor Achterberg ${tag}")`);
    await screenshot(page, "people-accounts-invited-phone");
    const { rows: people } = await db.query<{ id: string; roles: string[]; password_hash: string | null }>(
      `SELECT id, roles, password_hash FROM people WHERE email = $1`,
      [email],
    );
    expect(people).toEqual([{ id: expect.any(String), roles: ["instructor"], password_hash: null }]);
    const { rows: mails } = await db.query(`SELECT 1 FROM outbox WHERE kind = 'invitation' AND recipient_id = $1`, [people[0]!.id]);
    expect(mails).toHaveLength(1);
    // the same address again (the form was cleared and has a new key): refused beside the e-mail field
    await page.fill("#inv-name", "Someone else");
    await page.fill("#inv-email", email);
    await page.check("form[aria-labelledby=invite-title] input[name=roles][value=sponsor]");
    await invite.click();
    await page.waitForSelector("#inv-email-error");
    expect(await page.textContent("#inv-email-error")).toContain("already belongs to an account");
    expect((await db.query(`SELECT 1 FROM people WHERE email = $1`, [email])).rows).toHaveLength(1);
  });

  it("changes an instructor's roles and ends the session they had open", async () => {
    const person = await makeAccount(db, "roles", "a-long-enough-password", ["instructor"]);
    const cookie = await signInOrThrow(person.email, person.password);
    const today = (c: string) => fetch(`${BASE_URL}/api/today`, { headers: { cookie: c } }).then((r) => r.status);
    expect(await today(cookie)).toBe(200);

    // the Person choice offers the accounts on the list's page: narrowed to this one's name
    await page.goto(`/people/accounts?name=${encodeURIComponent(person.name)}`);
    await page.selectOption("#roles-person", { label: person.name });
    await page.check("form[aria-labelledby=roles-title] input[value=sponsor]");
    await page.click("form[aria-labelledby=roles-title] button[type=submit]");
    await page.waitForSelector(`form[aria-labelledby=roles-title] [role=status]:has-text("sessions have ended")`);
    await screenshot(page, "people-accounts-roles-phone");
    const { rows } = await db.query<{ roles: string[] }>(`SELECT roles FROM people WHERE id = $1`, [person.id]);
    expect(rows[0]!.roles.sort()).toEqual(["instructor", "sponsor"]);
    // the old session is over: the next request is refused as signed out
    expect(await today(cookie)).toBe(401);
    expect(await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)).toBeLessThanOrEqual(0);
  });
});
