// Signing in and out, end to end against the production build: the four demo accounts, wrong
// passwords, the 403 page, the lock after 10 failures and the chief's unlock, and sessions that
// end at once on sign-out, password change and deactivation.
import type { Client } from "pg";
import { sequelize } from "@/db/index";
import { changePassword, setActive } from "@/db/access/people/account-changes";
import { hashPassword } from "@/lib/auth/password";
import { launchBrowser, signIn, screenshot, BASE_URL, DEMO_PASSWORD, type Browser } from "./helpers/browser";
import { signInHttp, signInOrThrow, signOutHttp } from "./helpers/http";
import { ownerClient } from "./helpers/db";
import { DEMO_ACCOUNTS, makeAccount } from "./helpers/accounts";
import type { Page } from "playwright-core";

let browser: Browser;
let page: Page;
let db: Client;

beforeAll(async () => {
  db = await ownerClient();
  browser = await launchBrowser();
  page = await browser.context.newPage();
});
afterAll(async () => {
  await browser?.close();
  await db?.end();
  await sequelize.close();
});

async function fresh() {
  await browser.context.clearCookies();
}

const todayStatus = (cookie: string) => fetch(`${BASE_URL}/api/today`, { headers: { cookie } }).then((r) => r.status);

describe("the four demo accounts", () => {
  test("the chief signs in and sees the school's counts, from the database", async () => {
    await fresh();
    await signIn(page, DEMO_ACCOUNTS.chief);
    expect(new URL(page.url()).pathname).toBe("/today");
    const { rows } = await db.query<{ students: string; instructors: string; cohorts: string; sponsors: string }>(
      `SELECT count(*) FILTER (WHERE 'student' = ANY(p.roles)) AS students, count(*) FILTER (WHERE 'instructor' = ANY(p.roles)) AS instructors,
              (SELECT count(*) FROM cohorts c WHERE c.school_id = s.id) AS cohorts, count(*) FILTER (WHERE 'sponsor' = ANY(p.roles)) AS sponsors
         FROM schools s JOIN people p ON p.school_id = s.id AND p.active WHERE s.name = 'Larkhollow Flying School' GROUP BY s.id`,
    );
    const want = rows[0]!;
    for (const [label, n] of [
      ["Students", want.students],
      ["Instructors", want.instructors],
      ["Cohorts", want.cohorts],
      ["Sponsors", want.sponsors],
    ] as const) {
      await expect(page.locator(`dt:text-is("${label}") + dd`).textContent()).resolves.toBe(String(n));
    }
    expect(Number(want.students)).toBeGreaterThanOrEqual(24); // the seed's two cohorts of twelve
    await expect(page.locator("[data-testid=whoami]").textContent()).resolves.toContain("Imogen Farrant");
    await page.waitForSelector("[data-testid=focus-list]");
    await expect(page.locator("[data-testid=focus-list]").textContent()).resolves.toContain("Kestrel cohort");
    await screenshot(page, "sign-in-chief-today");
  });

  test("the instructor signs in and sees the cohort they lead and its students", async () => {
    await fresh();
    await signIn(page, DEMO_ACCOUNTS.instructor);
    expect(new URL(page.url()).pathname).toBe("/today");
    const lead = await page.locator("section[aria-labelledby=lead-title]").textContent();
    expect(lead).toContain("Kestrel cohort");
    expect(lead).not.toContain("Merlin cohort");
    await page.waitForSelector("[data-testid=focus-list]");
    const list = await page.locator("[data-testid=focus-list]").textContent();
    expect(list).toContain("Ada Quill");
    expect(list).not.toContain("Lotte Lindqvist"); // Merlin cohort
    // each student's name opens their record
    const ada = page.locator("[data-testid=focus-list] a", { hasText: "Ada Quill" });
    await expect(ada.getAttribute("href")).resolves.toMatch(/^\/records\/[0-9a-f-]{36}$/);
  });

  test("the student signs in and sees This week with their ground hours", async () => {
    await fresh();
    await signIn(page, DEMO_ACCOUNTS.student);
    expect(new URL(page.url()).pathname).toBe("/today");
    await expect(page.locator("#week-title").textContent()).resolves.toBe("This week");
    const { rows } = await db.query<{ minutes: number }>(
      `SELECT COALESCE(sum(g.credited_minutes), 0)::int AS minutes FROM ground_log_current g JOIN people p ON p.id = g.student_id WHERE p.email = $1`,
      [DEMO_ACCOUNTS.student],
    );
    const h = (m: number) => (Math.round((m / 60) * 10) / 10).toLocaleString("en-GB", { maximumFractionDigits: 1 });
    await expect(page.locator("[data-testid=ground-hours]").textContent()).resolves.toBe(`${h(rows[0]!.minutes)} of 35 h`);
    await expect(page.locator("[data-testid=whoami]").textContent()).resolves.toContain("Ada Quill");
  });

  test("the sponsor signs in and sees the students they sponsor in one list, and only theirs", async () => {
    await fresh();
    await signIn(page, DEMO_ACCOUNTS.sponsor);
    expect(new URL(page.url()).pathname).toBe("/today");
    // the students linked to this sponsor, from the database
    const { rows } = await db.query<{ name: string }>(
      `SELECT st.name FROM sponsor_links l JOIN people st ON st.id = l.student_id JOIN people sp ON sp.id = l.sponsor_id
        WHERE sp.email = $1 ORDER BY st.name`,
      [DEMO_ACCOUNTS.sponsor],
    );
    expect(rows.map((r) => r.name)).toContain("Ada Quill");
    await page.waitForSelector("[data-testid=sponsored-student]");
    // one list of the sponsored students (the panel); the older list of names is gone
    await expect(page.locator("[aria-label='Students you sponsor']").count()).resolves.toBe(1);
    await expect(page.locator("[data-testid=focus-list]").count()).resolves.toBe(0);
    await expect(page.locator("main h2", { hasText: /students you sponsor/i }).count()).resolves.toBe(1);
    const entries = page.locator("[data-testid=sponsored-student]");
    const names = (await entries.locator("h3").allTextContents()).map((t) => t.split(" · ")[0]!.trim()).sort();
    expect(names).toEqual(rows.map((r) => r.name));
    // each entry says whether the Weekly letter about the student is on (what the old list showed)
    for (let i = 0; i < rows.length; i++)
      await expect(entries.nth(i).locator("[data-testid=letter-status]").textContent()).resolves.toMatch(
        /The Weekly letter about \S+ is (on|off)/,
      );
    const text = await page.locator("main").textContent();
    expect(text).not.toContain("Noor Brandt"); // another sponsor's student, same cohort
  });
});

describe("refusals", () => {
  test("a wrong password shows the error and stays on the sign-in page", async () => {
    const acct = await makeAccount(db, "wrongpw", "right-password-1");
    await fresh();
    await signIn(page, acct.email, "not-the-password");
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await page.waitForSelector("[data-testid=sign-in-error]");
    const msg = await page.locator("[data-testid=sign-in-error]").textContent();
    expect(msg?.length).toBeGreaterThan(5);
    // an unknown e-mail gets exactly the same message
    await signIn(page, "nobody-at-all@chalkwing.test", "not-the-password");
    await page.waitForSelector("[data-testid=sign-in-error]");
    await expect(page.locator("[data-testid=sign-in-error]").textContent()).resolves.toBe(msg);
  });

  test("a student opening /people gets the 403 page", async () => {
    await fresh();
    await signIn(page, DEMO_ACCOUNTS.student);
    const res = await page.goto("/people");
    expect(res?.status()).toBe(403);
    await expect(page.locator("h1").textContent()).resolves.toBe("This page is not part of your role");
    expect(await page.locator("body").textContent()).not.toContain("Kestrel cohort");
    expect(await page.locator("main").count()).toBe(1);
  });

  test("signed out, a page sends you to sign-in and an API answers 401", async () => {
    await fresh();
    await page.goto("/people");
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    const res = await fetch(`${BASE_URL}/api/today`);
    expect(res.status).toBe(401);
  });
});

describe("the lock after 10 failures", () => {
  test("the 11th sign-in is refused even with the right password; the chief unlocks it from Today; then it works", async () => {
    const acct = await makeAccount(db, "lockout", "right-password-2");
    for (let i = 0; i < 10; i++) expect((await signInHttp(acct.email, "wrong-password")).ok).toBe(false);
    // 11th, with the right password, over HTTP and in the browser
    expect((await signInHttp(acct.email, acct.password)).ok).toBe(false);
    await fresh();
    await signIn(page, acct.email, acct.password);
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await page.waitForSelector("[data-testid=sign-in-error]");

    // the chief sees the lock and lifts it with the Unlock button
    await fresh();
    await signIn(page, DEMO_ACCOUNTS.chief);
    const button = page.getByRole("button", { name: `Unlock ${acct.name}` });
    await button.click();
    // the page refreshes and the account leaves the list of locked sign-ins
    await button.waitFor({ state: "detached", timeout: 15_000 });
    await screenshot(page, "sign-in-chief-unlocked");
    const { rows } = await db.query(`SELECT 1 FROM sign_in_throttle WHERE email = $1`, [acct.email]);
    expect(rows).toHaveLength(0);

    await fresh();
    await signIn(page, acct.email, acct.password);
    expect(new URL(page.url()).pathname).toBe("/today");
  });
});

describe("sessions end at once", () => {
  test("signing out: the old cookie gets 401", async () => {
    const acct = await makeAccount(db, "signout", "right-password-3");
    const cookie = await signInOrThrow(acct.email, acct.password);
    expect(await todayStatus(cookie)).toBe(200);
    await signOutHttp(cookie);
    expect(await todayStatus(cookie)).toBe(401);
  });

  test("a password change: the old cookie gets 401, the new password works", async () => {
    const acct = await makeAccount(db, "pwchange", "right-password-4");
    const cookie = await signInOrThrow(acct.email, acct.password);
    expect(await todayStatus(cookie)).toBe(200);
    await changePassword(acct.id, "the-new-password-4");
    expect(await todayStatus(cookie)).toBe(401);
    expect((await signInHttp(acct.email, acct.password)).ok).toBe(false);
    expect((await signInHttp(acct.email, "the-new-password-4")).ok).toBe(true);
  });

  test("deactivation: the old cookie gets 401 and sign-in is refused", async () => {
    const acct = await makeAccount(db, "deactivate", "right-password-5");
    const cookie = await signInOrThrow(acct.email, acct.password);
    expect(await todayStatus(cookie)).toBe(200);
    await setActive(acct.schoolId, acct.id, false);
    expect(await todayStatus(cookie)).toBe(401);
    expect((await signInHttp(acct.email, acct.password)).ok).toBe(false);
  });

  test("the session the browser can read holds only id, name, roles and expiry", async () => {
    const cookie = await signInOrThrow(DEMO_ACCOUNTS.instructor, DEMO_PASSWORD);
    const res = await fetch(`${BASE_URL}/api/auth/session`, { headers: { cookie } });
    const body = (await res.json()) as { user: Record<string, unknown>; expires: string };
    expect(Object.keys(body).sort()).toEqual(["expires", "user"]);
    expect(Object.keys(body.user).sort()).toEqual(["id", "name", "roles"]);
    const { rows } = await db.query<{ id: string }>(`SELECT id FROM people WHERE email = $1`, [DEMO_ACCOUNTS.instructor]);
    expect(body.user).toEqual({ id: rows[0]!.id, name: "Tomasz Varga", roles: ["instructor"] });
    expect(Number.isNaN(Date.parse(body.expires))).toBe(false);
  });
});

describe("passwords over 72 bytes", () => {
  test("hashPassword refuses them instead of truncating", async () => {
    await expect(hashPassword("é".repeat(37))).rejects.toThrow(/72 bytes/); // 74 bytes in UTF-8
    await expect(hashPassword("a".repeat(72))).resolves.toMatch(/^\$2[aby]\$/);
  });

  test("sign-in refuses a password whose first 72 bytes are right", async () => {
    const exact = "p".repeat(72);
    const acct = await makeAccount(db, "long", exact);
    expect((await signInHttp(acct.email, exact + "extra")).ok).toBe(false); // bcrypt alone would accept this
    expect((await signInHttp(acct.email, exact)).ok).toBe(true);
  });
});
