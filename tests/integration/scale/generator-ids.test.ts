jest.setTimeout(120_000);
// The scale generator derives its ids from md5 (db/seed/scale.ts); forms, query strings and
// route parameters check ids with zod's uuid (RFC 9562: a version and a variant). A generated
// cohort whose id is a bare md5 could not be chosen in a filter (the Timetable answered "cohort not
// a valid id"), so every generated id must be one a form accepts.
import { QueryTypes } from "sequelize";
import { z } from "zod";
import { sequelize } from "@/db/index";
import { generateScale } from "@/db/seed/scale";
import { makeSchool, closeDb } from "@/tests/helpers/factories";

afterAll(closeDb);

it("every id the generator makes is a UUID as the forms check it", async () => {
  const s = await makeSchool("generator-ids");
  await generateScale(30, { schoolId: s.school.id });
  const rows = await sequelize.query<{ kind: string; id: string }>(
    `SELECT 'person' AS kind, id::text FROM people WHERE school_id = :s
     UNION ALL SELECT 'cohort', id::text FROM cohorts WHERE school_id = :s
     UNION ALL SELECT 'membership', m.id::text FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id WHERE c.school_id = :s
     UNION ALL SELECT 'oral check', id::text FROM oral_checks WHERE school_id = :s
     UNION ALL SELECT 'sign-off', id::text FROM sign_offs WHERE school_id = :s`,
    { replacements: { s: s.school.id }, type: QueryTypes.SELECT },
  );
  expect(rows.filter((r) => r.kind === "cohort").length).toBeGreaterThan(1);
  expect(rows.filter((r) => r.kind === "sign-off").length).toBeGreaterThanOrEqual(150);
  const uuid = z.string().uuid();
  expect(rows.filter((r) => !uuid.safeParse(r.id).success)).toEqual([]);
});
