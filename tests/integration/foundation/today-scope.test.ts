import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { todayFocusList } from "@/db/access/today/focus-list";

afterAll(closeDb);

describe("Today list is scoped to the caller", () => {
  it("gives an instructor only the students of cohorts they lead, and a sponsor only their own student", async () => {
    const s = await makeSchool("today");
    const mine = await todayFocusList(s.as.instructor);
    expect(mine.rows.map((r) => r.id).sort()).toEqual(
      s.people.students
        .slice(0, 3)
        .map((p) => p.id)
        .sort(),
    );
    const sponsor = await todayFocusList(s.as.sponsor);
    expect(sponsor.rows.map((r) => r.id)).toEqual([s.people.students[0]!.id]);
    const chief = await todayFocusList(s.as.chief);
    expect(chief.rows.map((r) => r.id).sort()).toEqual([s.cohorts.a.id, s.cohorts.b.id].sort());
  });
});
