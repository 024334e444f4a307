import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { linkSponsor } from "@/db/access/cohorts/sponsor-links";
import { requireStudentFor, visibleStudentIds } from "@/db/access/shared/student-scope";
import { HttpError } from "@/lib/http/errors";

// The one scoping rule (db/access/shared/student-scope.ts), against a real database: who sees
// whom for "records" and "progress".

afterAll(closeDb);

const sorted = (ids: string[]) => [...ids].sort();

describe("the student scope", () => {
  let s: Awaited<ReturnType<typeof makeSchool>>;
  let other: Awaited<ReturnType<typeof makeSchool>>;
  let hiddenSponsor: { id: string; name: string; roles: ["sponsor"]; schoolId: string };

  beforeAll(async () => {
    s = await makeSchool("scope");
    other = await makeSchool("scope-other");
    // a second sponsor of student 2 to whom the student does not show progress
    const [p] = await sequelize.query<{ id: string }>(
      `INSERT INTO people (school_id, name, email, roles) VALUES (:school, 'Quiet Sponsor', :email, ARRAY['sponsor']) RETURNING id`,
      { replacements: { school: s.school.id, email: `quiet.${s.tag}@chalkwing.test` }, type: QueryTypes.SELECT },
    );
    await linkSponsor({ sponsorId: p!.id, studentId: s.people.students[1]!.id, shares: { progress: false } });
    hiddenSponsor = { id: p!.id, name: "Quiet Sponsor", roles: ["sponsor"], schoolId: s.school.id };
  });

  it("lets the chief see every student of the school, for records and progress, and none of another school", async () => {
    const all = sorted(s.people.students.map((p) => p.id));
    expect(sorted(await visibleStudentIds(s.as.chief, "records"))).toEqual(all);
    expect(sorted(await visibleStudentIds(s.as.chief, "progress"))).toEqual(all);
    const { access } = await requireStudentFor(s.as.chief, s.people.students[4]!.id, "records");
    expect(access).toBe("staff");
    await expect(requireStudentFor(s.as.chief, other.people.students[0]!.id, "records")).rejects.toMatchObject({ status: 404 });
  });

  it("lets an instructor who leads a cohort see its students only, for records and progress", async () => {
    const led = sorted(s.people.students.slice(0, 3).map((p) => p.id));
    expect(sorted(await visibleStudentIds(s.as.instructor, "records"))).toEqual(led);
    expect(sorted(await visibleStudentIds(s.as.instructor, "progress"))).toEqual(led);
    await expect(requireStudentFor(s.as.instructor, s.people.students[3]!.id, "records")).rejects.toBeInstanceOf(HttpError);
  });

  it("gives an instructor who leads no cohort and teaches no session nobody", async () => {
    const [p] = await sequelize.query<{ id: string }>(
      `INSERT INTO people (school_id, name, email, roles) VALUES (:school, 'Spare Instructor', :email, ARRAY['instructor']) RETURNING id`,
      { replacements: { school: s.school.id, email: `spare.${s.tag}@chalkwing.test` }, type: QueryTypes.SELECT },
    );
    const spare = { id: p!.id, name: "Spare Instructor", roles: ["instructor" as const], schoolId: s.school.id };
    expect(await visibleStudentIds(spare, "records")).toEqual([]);
    expect(await visibleStudentIds(spare, "progress")).toEqual([]);
    await expect(requireStudentFor(spare, s.people.students[0]!.id, "progress")).rejects.toMatchObject({ status: 404 });
  });

  it("lets a student see themself for progress, never for records, and no other student", async () => {
    const me = s.people.students[0]!.id;
    expect(await visibleStudentIds(s.as.student, "progress")).toEqual([me]);
    expect(await visibleStudentIds(s.as.student, "records")).toEqual([]);
    expect((await requireStudentFor(s.as.student, me, "progress")).access).toBe("self");
    await expect(requireStudentFor(s.as.student, me, "records")).rejects.toMatchObject({ status: 404 });
    await expect(requireStudentFor(s.as.student, s.people.students[1]!.id, "progress")).rejects.toMatchObject({ status: 404 });
  });

  it("lets a sponsor see a student who shares progress, for progress only; not one who does not share it", async () => {
    const shared = s.people.students[0]!.id;
    expect(await visibleStudentIds(s.as.sponsor, "progress")).toEqual([shared]);
    expect(await visibleStudentIds(s.as.sponsor, "records")).toEqual([]);
    expect((await requireStudentFor(s.as.sponsor, shared, "progress")).access).toBe("sponsor");
    expect(await visibleStudentIds(hiddenSponsor, "progress")).toEqual([]);
    await expect(requireStudentFor(hiddenSponsor, s.people.students[1]!.id, "progress")).rejects.toMatchObject({ status: 404 });
  });

  it("keeps a student of another school out of reach of everyone here, and this school's students out of theirs", async () => {
    const stranger = other.people.students[0]!.id;
    for (const who of [s.as.chief, s.as.instructor, s.as.student, s.as.sponsor]) {
      expect(await visibleStudentIds(who, "progress")).not.toContain(stranger);
      await expect(requireStudentFor(who, stranger, "progress")).rejects.toMatchObject({ status: 404 });
    }
    expect(await visibleStudentIds(other.as.chief, "records")).not.toContain(s.people.students[0]!.id);
  });
});
