import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { actAs, closeDb, TEST_PASSWORD } from "@/tests/helpers/factories";
import { seedTransfers } from "@/db/seed/transfers";
import { verifyChain } from "@/db/access/records/audit-chain";
import { creditedMinutesFor } from "@/db/access/ground-log/ground-hours";
import { transferCreditsOf } from "@/db/access/transfers/credits";
import { retentionOf } from "@/db/access/retention/records";
import { schoolForSeed, seedContext, seedDay as day } from "../seed-helpers";

// The demo's transfer-in (credit at exactly the 14 CFR 141.77(c)(1) cap of 50%), endorsed with a
// passing knowledge-test result, and a record past retention (transferred out four years ago,
// beyond the 3 years of 14 CFR 61.189(c)), written through the services so the chain verifies.

afterAll(async () => {
  actAs(null);
  await closeDb();
});

test("the demo seed gives a transfer-in at the cap, endorsed with a result, and a record past retention", async () => {
  const s = await schoolForSeed("seedxfer");
  await sequelize.transaction((t) => seedTransfers(seedContext(s, t), TEST_PASSWORD));
  const person = async (email: string) =>
    (
      await sequelize.query<{ id: string }>(`SELECT id FROM people WHERE email = :email AND school_id = :s`, {
        replacements: { email, s: s.school.id },
        type: QueryTypes.SELECT,
      })
    )[0]!.id;
  const odile = await person("odile.ferreira@chalkwing.test");
  const [credit] = await transferCreditsOf(odile, s.course.id);
  // the test course's minimum is 35 h = 2100 min: the approved-course cap is 1050 min (141.77(c)(1))
  expect(credit).toMatchObject({ sourceApproved: true, creditedMinutes: 1050, capMinutes: 1050 });
  expect(credit!.items.length).toBeGreaterThan(0);
  // this school's test on the day the credit was given, 118 days ago (not shifted by the seed's clock)
  expect(credit!.testTakenOn).toBe(day(-118));
  expect(await creditedMinutesFor(odile, s.course.id)).toBeGreaterThanOrEqual(2100);
  const [kt] = await sequelize.query<{ passed: boolean; score: number; endorsedOn: string; takenOn: string }>(
    `SELECT r.passed, r.score_percent AS score, to_char(e.endorsed_on, 'YYYY-MM-DD') AS "endorsedOn", to_char(r.taken_on, 'YYYY-MM-DD') AS "takenOn"
       FROM knowledge_test_results r JOIN knowledge_test_endorsements e ON e.id = r.endorsement_id
      WHERE r.student_id = :s`,
    { replacements: { s: odile }, type: QueryTypes.SELECT },
  );
  expect(kt).toEqual({ passed: true, score: 86, endorsedOn: day(-9), takenOn: day(-4) });

  const casimir = await person("casimir.wetherell@chalkwing.test");
  expect(await retentionOf(s.school.id, casimir)).toMatchObject({
    state: "due",
    endedOn: day(-4 * 365),
    governing: ["instructor_records"],
  });
  expect((await verifyChain(s.school.id)).ok).toBe(true);
}, 120_000);
