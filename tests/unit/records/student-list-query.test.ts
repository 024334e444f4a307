import { parseNameListQuery, parseStudentListQuery } from "@/lib/records/student-list-query";

// The query string of the paged student lists: the pager's filter when it parses, and when it does
// not, no filter at all (the page shows every student) with the problem named by its field.

it("turns the query string into the pager's filter and page", () => {
  const r = parseStudentListQuery({ name: " Ada ", cohortName: "C0007", page: "3", student: "kept-out" }, ["student"]);
  expect(r.problem).toBeNull();
  expect(r.filter).toEqual({ cohortId: undefined, cohortName: "C0007", name: "Ada" });
  expect(r.q.page).toBe(3);
});

it("names the field of a bad value and filters nothing", () => {
  const r = parseStudentListQuery({ cohort: "not-a-cohort", name: "Ada" });
  expect(r.problem?.path).toEqual(["cohort"]);
  expect(r.problem?.message).toBe("must be a cohort id");
  expect(r.filter).toEqual({ cohortId: undefined, cohortName: undefined, name: undefined });
});

it("refuses a key the list does not know unless the page says it is its own, and ignores repeated keys", () => {
  expect(parseStudentListQuery({ student: "x" }).problem).not.toBeNull();
  expect(parseStudentListQuery({ student: "x" }, ["student"]).problem).toBeNull();
  expect(parseStudentListQuery({ name: ["a", "b"] }).filter.name).toBeUndefined();
});

it("reads the lists filtered by a part of the name only (Cohorts, Accounts and roles), naming the field of a bad value", () => {
  expect(parseNameListQuery({ name: " Kestrel ", page: "2" })).toEqual({ q: { name: "Kestrel", page: 2 }, problem: null });
  const bad = parseNameListQuery({ name: "Kestrel", page: "0" });
  expect(bad.q).toEqual({});
  expect(bad.problem?.path).toEqual(["page"]);
  expect(bad.problem?.message).toBe("must be 1 or more");
  // a cohort is no filter of these lists
  expect(parseNameListQuery({ cohort: "x" }).problem?.path).toEqual([]);
});
