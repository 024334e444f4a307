// The Timetable's filters are a plain GET form: "Any instructor" and "Any room" send an empty value.
// An empty filter is no filter (the week view used to refuse the whole query, cohort and all, with
// "instructor not a valid id; room must not be empty"); a wrong value is still refused, naming its field.
import { sessionsQuerySchema, weekQuerySchema } from "@/lib/timetable/schema";

const COHORT = "3f1c9a52-8d7e-4b6a-9c21-5e0f7a8b9c10";

it("the week view reads a form sent with Any instructor and Any room as a filter by cohort alone", () => {
  const r = weekQuerySchema.safeParse({ week: "2026-12-02", instructor: "", cohort: COHORT, room: "", mine: "" });
  expect(r.success).toBe(true);
  expect(r.data).toEqual({ week: "2026-12-02", cohort: COHORT });
});

it("the sessions list reads empty filters as none, and keeps its defaults", () => {
  const r = sessionsQuerySchema.safeParse({ instructor: "", cohort: "", room: "", from: "", to: "", mine: "" });
  expect(r.success).toBe(true);
  expect(r.data).toEqual({ status: "all", sort: "starts_at", dir: "asc", page: 1, pageSize: 20 });
});

it("a filter that is not empty and not valid is still refused, naming the field", () => {
  for (const [field, value] of [
    ["instructor", "not-an-id"],
    ["cohort", "123"],
    ["week", "2026-02-30"],
    ["room", "   "],
    ["mine", "yes"],
  ] as const) {
    const r = weekQuerySchema.safeParse({ [field]: value });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0]?.path).toEqual([field]);
  }
});
