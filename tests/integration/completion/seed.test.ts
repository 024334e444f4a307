import { NextRequest } from "next/server";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { actAs, closeDb, TEST_PASSWORD } from "@/tests/helpers/factories";
import { seedCompletion } from "@/db/seed/completion";
import { GET as certificateRoute } from "@/app/api/records/[studentId]/certificate/route";
import { verifyChain } from "@/db/access/records/audit-chain";
import { creditedMinutesFor } from "@/db/access/ground-log/ground-hours";
import { schoolForSeed, seedContext, seedDay as day } from "../seed-helpers";

afterAll(async () => {
  actAs(null);
  await closeDb();
});

test("the demo seed gives the school a graduate with a certified record and a certificate", async () => {
  const s = await schoolForSeed("seedgrad");
  await sequelize.transaction((t) => seedCompletion(seedContext(s, t), TEST_PASSWORD));
  const [e] = await sequelize.query<{ id: string; status: string; end_kind: string; ended_on: string; certified: number }>(
    `SELECT p.id, e.status, e.end_kind, e.ended_on,
            (SELECT count(*)::int FROM record_certifications c WHERE c.enrolment_id = e.id AND c.purpose = 'graduation') AS certified
       FROM people p JOIN enrolments e ON e.student_id = p.id WHERE p.school_id = :s AND p.name = 'Ines Varga'`,
    { replacements: { s: s.school.id }, type: QueryTypes.SELECT },
  );
  expect(e).toMatchObject({ status: "completed", end_kind: "graduated", ended_on: day(-3), certified: 1 });
  expect((await verifyChain(s.school.id)).ok).toBe(true);
  // graduated only with the course complete, its minimum ground training time included (14 CFR 141.95(a));
  // the test course's minimum is 35 h = 2100 min, attended in two-hour sessions
  const [course] = await sequelize.query<{ min: number }>(`SELECT min_ground_minutes AS min FROM courses WHERE id = :c`, {
    replacements: { c: s.course.id },
    type: QueryTypes.SELECT,
  });
  expect(course!.min).toBe(2100);
  expect(await creditedMinutesFor(e!.id, s.course.id)).toBeGreaterThanOrEqual(course!.min);
  actAs(s.as.chief);
  const res = await certificateRoute(new NextRequest(`http://127.0.0.1/api/records/${e!.id}/certificate`), {
    params: Promise.resolve({ studentId: e!.id }),
  });
  expect(res.status).toBe(200);
});
