import type { Transaction } from "sequelize";
import { addDays, format } from "date-fns";
import { sequelize } from "@/db/index";
import type { SeedContext } from "@/db/seed/extensions";
import { makeSchool } from "@/tests/helpers/factories";
import { createRoom } from "@/db/access/rooms/save-room";
import { now } from "@/lib/clock";
import { makeBriefing } from "./timetable/helpers";

// What the tests of the demo's seed extensions share: a test school holding what the earlier seeds
// give, and the seed's context for it.

type School = Awaited<ReturnType<typeof makeSchool>>;

/** As the demo counts days (db/seed/demo.ts): from the injectable clock, which a seed may move while it writes. */
export const seedDay = (n: number) => format(addDays(now(), n), "yyyy-MM-dd");

/** A test school with what the demo's timetable seed gives before the later seeds: a briefing and Briefing room 2. */
export async function schoolForSeed(label: string): Promise<School> {
  const s = await makeSchool(label);
  await makeBriefing(s, "Seed briefing", []);
  await sequelize.transaction((t) => createRoom(s.as.chief, { name: "Briefing room 2", capacity: 10 }, t));
  return s;
}

/** The seed context of the test school: the chief, Instructor One, Instructor Two as Priya and Rafael (override any). */
export function seedContext(
  s: School,
  t: Transaction,
  over: { people?: Partial<SeedContext["people"]>; students?: SeedContext["students"] } = {},
): SeedContext {
  return {
    t,
    schoolId: s.school.id,
    courseId: s.course.id,
    revisionId: s.revision.id,
    people: {
      chief: s.people.chief.id,
      instructor: s.people.instructor.id,
      priya: s.people.instructor2.id,
      rafael: s.people.instructor2.id,
      sponsor: s.people.sponsor.id,
      ...over.people,
    },
    students: over.students ?? {},
    cohorts: { a: s.cohorts.a.id, b: s.cohorts.b.id },
    day: seedDay,
  };
}
