// The chief records a student's date of birth, which decides who manages the student's sponsor
// links (under 18: the school; lib/sharing/consent.ts): a future date or an implausible age is a
// 400 naming birthDate with nothing written; only the chief may set it; it takes effect at once
// on who may change the links, and every change is audited.
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { sharingRights } from "@/db/access/sharing/sponsors-of-student";
import { getSchool } from "@/db/access/shared/school";
import { setBirthDateAction, changeStudentSharingAction, changeSharingAction } from "@/app/(app)/sharing/actions";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import { actAs, closeDb, makeSchool } from "../../helpers/factories";
import { auditCount } from "../records/helpers";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
let other: School;
let today: string;
const all = { attendance: true, hours: true, milestones: true, outcomes: true, schedule: true, weeklyLetter: true };

/** `today` moved by whole years (and days), as yyyy-MM-dd. */
function yearsAgo(years: number, days = 0): string {
  const [y, m, d] = today.split("-").map(Number) as [number, number, number];
  const at = new Date(Date.UTC(y - years, m - 1, d + days));
  return at.toISOString().slice(0, 10);
}

async function storedBirthDate(id: string): Promise<string | null> {
  const [r] = await sequelize.query<{ b: string | null }>(`SELECT to_char(birth_date, 'YYYY-MM-DD') AS b FROM people WHERE id = :id`, {
    replacements: { id },
    type: QueryTypes.SELECT,
  });
  return r!.b;
}

beforeAll(async () => {
  s = await makeSchool("birthdate");
  other = await makeSchool("birthdate-other");
  today = dateInZone(now(), (await getSchool(s.school.id)).timeZone);
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

describe("the chief records a student's date of birth", () => {
  test("a minor's links become the school's at once; back to an adult, the student's again; each change audited", async () => {
    const student = s.people.students[0]!;
    const before = await auditCount(s.school.id, "person.birth_date", student.id);
    actAs(s.as.chief);
    const minor = yearsAgo(15);
    expect(await setBirthDateAction({ studentId: student.id, birthDate: minor })).toMatchObject({
      ok: true,
      data: { birthDate: minor, manager: "school", changed: true },
    });
    expect(await storedBirthDate(student.id)).toBe(minor);
    expect(await sharingRights(s.as.instructor, student.id)).toMatchObject({ manager: "school", birthDate: minor, mayChange: true });
    // the lead instructor now manages the minor's sponsor; the student no longer can
    actAs(s.as.instructor);
    expect(await changeStudentSharingAction({ studentId: student.id, sponsorId: s.people.sponsor.id, ...all, hours: false })).toMatchObject(
      { ok: true, data: { changed: true } },
    );
    actAs(s.as.student);
    expect(await changeSharingAction({ studentId: student.id, sponsorId: s.people.sponsor.id, ...all })).toMatchObject({
      ok: false,
      status: 403,
    });
    // the same date again writes nothing
    actAs(s.as.chief);
    expect(await setBirthDateAction({ studentId: student.id, birthDate: minor })).toMatchObject({ ok: true, data: { changed: false } });
    // eighteen today: an adult, who decides again
    expect(await setBirthDateAction({ studentId: student.id, birthDate: yearsAgo(18) })).toMatchObject({
      ok: true,
      data: { manager: "student", changed: true },
    });
    actAs(s.as.student);
    expect(await changeSharingAction({ studentId: student.id, sponsorId: s.people.sponsor.id, ...all })).toMatchObject({ ok: true });
    // cleared: no date on file is treated as an adult
    actAs(s.as.chief);
    expect(await setBirthDateAction({ studentId: student.id, birthDate: "" })).toMatchObject({
      ok: true,
      data: { birthDate: null, manager: "student", changed: true },
    });
    expect(await storedBirthDate(student.id)).toBeNull();
    expect((await auditCount(s.school.id, "person.birth_date", student.id)) - before).toBe(3);
  });

  test("a future date, an implausible age or no real date is a 400 naming birthDate, and nothing is written", async () => {
    const student = s.people.students[1]!;
    actAs(s.as.chief);
    const adult = yearsAgo(30);
    expect(await setBirthDateAction({ studentId: student.id, birthDate: adult })).toMatchObject({ ok: true });
    const audits = await auditCount(s.school.id, "person.birth_date", student.id);
    const cases: [string, RegExp][] = [
      [yearsAgo(0, 1), /future/],
      [yearsAgo(5), /age of 5, under 10/],
      [yearsAgo(101, -1), /age of 101, over 100/],
      ["2001-02-30", /real date/],
      ["12/03/2001", /real date/],
    ];
    for (const [birthDate, words] of cases) {
      const res = await setBirthDateAction({ studentId: student.id, birthDate });
      expect(res).toMatchObject({ ok: false, status: 400, field: "birthDate" });
      expect(res.ok ? "" : res.message).toMatch(words);
      expect(res.ok ? "" : res.message).toMatch(/^Birth date: /);
    }
    expect(await storedBirthDate(student.id)).toBe(adult);
    expect(await auditCount(s.school.id, "person.birth_date", student.id)).toBe(audits);
  });

  test("only the chief may set it; a student of another school is a 404 that names nobody", async () => {
    const student = s.people.students[2]!;
    const input = { studentId: student.id, birthDate: yearsAgo(16) };
    for (const who of [s.as.instructor, s.as.student, s.as.sponsor]) {
      actAs(who);
      expect(await setBirthDateAction(input)).toMatchObject({ ok: false, status: 403 });
    }
    actAs(null);
    expect(await setBirthDateAction(input)).toMatchObject({ ok: false, status: 401 });
    actAs(s.as.chief);
    const foreign = await setBirthDateAction({ studentId: other.people.students[0]!.id, birthDate: yearsAgo(16) });
    expect(foreign).toMatchObject({ ok: false, status: 404, field: "studentId" });
    expect(JSON.stringify(foreign)).not.toContain(other.people.students[0]!.name);
    expect(await storedBirthDate(student.id)).toBeNull();
    expect(await storedBirthDate(other.people.students[0]!.id)).toBeNull();
  });
});
