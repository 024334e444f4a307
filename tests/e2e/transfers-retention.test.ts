// Transfers in and Retention in headless Chromium on a phone (390x844): the chief sees the demo's
// transfer credit (at the 14 CFR 141.77(c) cap) and a refused credit's message beside the minutes
// field; the record past retention is listed to archive, a legal hold is set and lifted with a
// reason, and archiving asks for a second press (cancelled here, so the demo's record stays listed).
// Screenshots: tests/artifacts/screenshots/transfers-390.png, retention-390*.png.
import type { Page } from "playwright-core";
import { launchBrowser, screenshot, BASE_URL, type Browser } from "./helpers/browser";
import { signInOrThrow, SESSION_COOKIE } from "./helpers/http";
import { DEMO_ACCOUNTS } from "./helpers/accounts";

let browser: Browser;
let page: Page;

/** A valid 1×1 grey PNG (RFC 2083). */
const PNG = Buffer.from(
  "89504e470d0a1a0a0000000d49484452000000010000000108000000003a7e9b55" +
    "0000000a49444154789c636800000082008177cd72b60000000049454e44ae426082",
  "hex",
);

beforeAll(async () => {
  const cookie = await signInOrThrow(DEMO_ACCOUNTS.chief, "chalkwing-demo");
  browser = await launchBrowser({ width: 390, height: 844 });
  await browser.context.addCookies([
    { name: SESSION_COOKIE, value: cookie.slice(SESSION_COOKIE.length + 1), url: BASE_URL, httpOnly: true, sameSite: "Lax" },
  ]);
  page = await browser.context.newPage();
});
afterAll(async () => {
  await browser?.close();
});

const noSidewaysScroll = (p: Page) => p.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth);

test("Transfers in: the credit at the cap is listed, and one more minute is refused beside the field", async () => {
  await page.goto("/transfers");
  const credit = page.locator("[data-testid=transfer-credit]", { hasText: "Odile Ferreira" });
  await credit.waitFor();
  // the demo course's minimum is 35 h = 2100 min; 50% from an approved course is 1050 min (141.77(c)(1))
  await expect(credit.textContent()).resolves.toMatch(/1050 min; cap 1050 min, approved course, 50%/);
  expect(await noSidewaysScroll(page)).toBe(true);
  await screenshot(page, "transfers-390");

  const form = page.locator("form[aria-label='Record a transfer credit']");
  await form.getByLabel("Student", { exact: true }).selectOption({ label: "Odile Ferreira (PPL-GS)" });
  await expect(form.locator("text=at most").first().textContent()).resolves.toMatch(/at most 0 more minutes/);
  await form.getByLabel("Earlier school", { exact: true }).fill("Harness earlier school");
  await form.getByLabel("Ground time credited (minutes)").fill("1");
  await form.getByLabel("Taken on", { exact: true }).fill("2026-01-05");
  await form.getByLabel("Result", { exact: true }).fill("Passed");
  await form.getByLabel(/Evidence from the earlier school/).setInputFiles({ name: "scan.png", mimeType: "image/png", buffer: PNG });
  await form.getByRole("button", { name: "Record the credit" }).click();
  const minutes = form.getByLabel("Ground time credited (minutes)");
  await page.waitForFunction(() => document.querySelector("input[name=creditedMinutes]")?.getAttribute("aria-invalid") === "true");
  const described = (await minutes.getAttribute("aria-describedby"))!.split(" ");
  const message = await page.locator(`[id="${described[described.length - 1]}"]`).textContent();
  expect(message).toMatch(/at most 1050 minutes can be credited from an approved course, 50% .* \(14 CFR 141\.77\(c\)\)/);
  await expect(page.locator("[data-testid=transfer-credit]").count()).resolves.toBe(1);
  expect(await noSidewaysScroll(page)).toBe(true);
});

test("Retention: the record past its date is listed; a legal hold is set and lifted with reasons; archiving asks twice", async () => {
  await page.goto("/retention");
  const card = () => page.locator("li", { hasText: "Casimir Wetherell" });
  await card().and(page.locator("[data-state=due]")).waitFor();
  await expect(card().textContent()).resolves.toMatch(/Kept until .* \(14 CFR 61\.189\(c\)\)/);
  expect(await noSidewaysScroll(page)).toBe(true);
  await screenshot(page, "retention-390");

  await card().getByLabel("Reason for a legal hold").fill("Records asked for by the regulator's inspector");
  await card().getByRole("button", { name: "Set a legal hold" }).click();
  await card().and(page.locator("[data-state=held]")).waitFor();
  await expect(card().textContent()).resolves.toMatch(/On legal hold.*Records asked for by the regulator's inspector/);
  await expect(
    card()
      .getByRole("button", { name: /Archive/ })
      .count(),
  ).resolves.toBe(0);
  await screenshot(page, "retention-390-held");

  await card().getByLabel("Reason for lifting the hold").fill("Inspection closed");
  await card().getByRole("button", { name: "Lift the hold" }).click();
  await card().and(page.locator("[data-state=due]")).waitFor();

  await card().getByRole("button", { name: "Archive…" }).click();
  await expect(card().getByRole("button", { name: "Mark the record of Casimir Wetherell archived" }).isVisible()).resolves.toBe(true);
  await card().getByRole("button", { name: "Keep it listed" }).click();
  await expect(card().getAttribute("data-state")).resolves.toBe("due");
  expect(await noSidewaysScroll(page)).toBe(true);
});
