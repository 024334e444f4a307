jest.setTimeout(120_000);
// The search picker in a browser. The demo school is small, so every other walk and the
// accessibility crawl see its plain <select>; this test makes a school of its own with more
// cohorts than a form lists (PICKER_LIST_MAX), signs in as its chief on a phone (390x844) and
// uses the Timetable's cohort filter by keyboard: typing asks GET /api/directory/cohorts, the
// listbox names at most PICKER_RESULTS cohorts, Down and Enter choose one, the filter's URL
// carries its id, and the open combobox passes axe-core (no serious or critical violation).
import { QueryTypes } from "sequelize";
import type { Page } from "playwright-core";
import { sequelize } from "@/db/index";
import { generateScale } from "@/db/seed/scale";
import { makeSchool, TEST_PASSWORD } from "@/tests/helpers/factories";
import { createPerson, addQualification } from "@/db/access/people/create-person";
import { PICKER_LIST_MAX, PICKER_RESULTS } from "@/lib/directory/picker";
import { launchBrowser, signIn, screenshot, type Browser } from "./helpers/browser";
import { axeSerious } from "./helpers/axe";

let phone: Browser;
let page: Page;
let school: Awaited<ReturnType<typeof makeSchool>>;
let cohorts: { id: string; name: string }[];

beforeAll(async () => {
  school = await makeSchool("picker-e2e");
  // 25 students a cohort: 51 generated cohorts beside the school's own two, more than a form lists
  await generateScale(25 * (PICKER_LIST_MAX + 1), { schoolId: school.school.id });
  cohorts = await sequelize.query<{ id: string; name: string }>(`SELECT id, name FROM cohorts WHERE school_id = :s ORDER BY name`, {
    replacements: { s: school.school.id },
    type: QueryTypes.SELECT,
  });
  phone = await launchBrowser({ width: 390, height: 844 });
  page = await phone.context.newPage();
});
afterAll(async () => {
  await phone?.close();
  await sequelize.close();
});

it("the Timetable's cohort filter searches by name beyond the listed few, and is chosen by keyboard", async () => {
  expect(cohorts.length).toBeGreaterThan(PICKER_LIST_MAX);
  const target = cohorts[cohorts.length - 1]!;
  await signIn(page, school.people.chief.email, TEST_PASSWORD);
  await page.goto("/timetable");
  const box = page.getByRole("combobox", { name: "Cohort" });
  await box.waitFor({ state: "visible" });
  // no <select> of every cohort on the page
  expect(await page.locator("select#f-cohort").count()).toBe(0);

  await box.fill(target.name);
  // the combobox's own listbox (the page's other filters are plain selects with options of their own);
  // the answer to the typed name replaces the first answer (to the empty text, on focus)
  const options = page.locator(`[id="${await box.getAttribute("aria-controls")}"]`).getByRole("option");
  await options.filter({ hasText: target.name }).first().waitFor({ state: "visible" });
  const names = await options.allInnerTexts();
  expect(names.length).toBeGreaterThan(0);
  expect(names.length).toBeLessThanOrEqual(PICKER_RESULTS);
  expect(names.some((n) => n.includes(target.name))).toBe(true);
  expect(await box.getAttribute("aria-expanded")).toBe("true");
  expect(await axeSerious(page)).toEqual([]);
  await screenshot(page, "search-picker-open-390");

  // Down to the first answer, Enter: the hidden input named "cohort" carries its id
  await box.press("ArrowDown");
  expect(await box.getAttribute("aria-activedescendant")).toBeTruthy();
  const first = (await options.first().innerText()).trim();
  await box.press("Enter");
  expect(await box.getAttribute("aria-expanded")).toBe("false");
  const chosen = cohorts.find((c) => first.startsWith(c.name));
  expect(chosen).toBeDefined();
  expect(await page.locator("input[type=hidden][name=cohort]").inputValue()).toBe(chosen!.id);

  await Promise.all([page.waitForURL(/[?&]cohort=/), page.click("form[aria-label='Filter the Timetable'] button[type=submit]")]);
  expect(new URL(page.url()).searchParams.get("cohort")).toBe(chosen!.id);
  // the filtered page names the chosen cohort in the picker
  await page.waitForLoadState("networkidle");
  await screenshot(page, "search-picker-filtered-390");
  expect(await page.getByRole("combobox", { name: "Cohort" }).inputValue()).toBe(chosen!.name);
});

it("a search that matches nothing says so in the status the combobox points at", async () => {
  await page.goto("/timetable");
  const box = page.getByRole("combobox", { name: "Cohort" });
  await box.fill("zz-no-such-cohort-qq");
  const statusId = (await box.getAttribute("aria-describedby"))!.split(" ")[0]!;
  const status = page.locator(`[id="${statusId}"]`);
  await page.waitForFunction((id) => document.getElementById(id)?.textContent?.includes("No match"), statusId, { timeout: 10_000 });
  expect(await status.innerText()).toContain('No match for "zz-no-such-cohort-qq"');
  expect(
    await page
      .locator(`[id="${await box.getAttribute("aria-controls")}"]`)
      .getByRole("option")
      .count(),
  ).toBe(0);
});

it("Records' Check instructors finds an instructor by name past a list's worth, and designates them", async () => {
  // more qualified instructors than a list holds, in the school of this file
  await sequelize.transaction(async (t) => {
    for (let i = 0; i <= PICKER_LIST_MAX; i++) {
      const p = await createPerson(
        {
          schoolId: school.school.id,
          name: `Tutor ${String(i).padStart(2, "0")} Vale`,
          email: `tutor${i}.${school.tag}@chalkwing.test`,
          roles: ["instructor"],
        },
        t,
      );
      await addQualification(
        {
          personId: p.id,
          certificateKind: "Ground instructor",
          certificateNumber: `GI-V${i}`,
          ratings: [],
          issuedOn: "2020-01-01",
          recencyOn: "2026-01-01",
          courseIds: [school.course.id],
        },
        t,
      );
    }
  });
  await page.goto("/records");
  const section = page.getByTestId("check-instructors");
  await section.waitFor({ state: "visible" });
  // the designated ones by name with a toggle; no toggle for every other instructor
  expect(await section.getByRole("heading", { name: "Designated (1)" }).isVisible()).toBe(true);
  expect(await section.getByRole("button", { name: /^Designate / }).count()).toBe(0);
  const box = section.getByRole("combobox", { name: "Instructor's name" });
  await box.fill("Tutor 37");
  const options = page.locator(`[id="${await box.getAttribute("aria-controls")}"]`).getByRole("option");
  await options.filter({ hasText: "Tutor 37 Vale" }).first().waitFor({ state: "visible" });
  await box.press("ArrowDown");
  await box.press("Enter");
  const choice = page.getByTestId("designate-choice");
  expect(await choice.innerText()).toContain("Not designated");
  expect(await axeSerious(page)).toEqual([]);
  await choice.getByRole("button", { name: "Designate Tutor 37 Vale as check instructor" }).click();
  await choice.getByText("Saved").waitFor({ state: "visible" });
  // the page is refreshed: one more designated, named in the list, and the chosen one now offers to stop
  await section.getByRole("heading", { name: "Designated (2)" }).waitFor({ state: "visible" });
  expect(await section.locator("li", { hasText: "Tutor 37 Vale" }).count()).toBe(1);
  expect(await choice.getByRole("button", { name: "Stop designating Tutor 37 Vale as check instructor" }).isVisible()).toBe(true);
  await screenshot(page, "records-check-instructors-find-390");
});
