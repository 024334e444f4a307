jest.setTimeout(180_000);
// The stages waiting for their stage check (the chief's Today, the instructor's "Checks due") are read
// for a whole school in one aggregate query (`stagesWaitingSql`, which starts from the school's current
// sign-offs). The rule is the one `stageReadiness` applies to one student, step by step in code: every
// item of the stage signed off and not withdrawn, no open make-up item, not passed yet, the previous
// stage passed. Students are put in each state through the app's own data-access code, and the one
// query is checked against the per-student rule and against the states we made.
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, TEST_PASSWORD } from "@/tests/helpers/factories";
import { conductStageCheck } from "@/db/access/records/stage-checks";
import { stageReadiness } from "@/db/access/records/stage-readiness";
import { withdrawSignOff } from "@/db/access/records/sign-offs";
import { stagesWaiting, stagesWaitingTop } from "@/db/access/records/stages-waiting";
import { requireStudentFor } from "@/db/access/shared/student-scope";
import { check, sign, type School } from "./helpers";

afterAll(closeDb);

async function stage(s: School, code: string) {
  const items = await sequelize.query<{ stage_id: string; id: string }>(
    `SELECT g.id AS stage_id, i.id FROM syllabus_stages g JOIN syllabus_items i ON i.stage_id = g.id
      WHERE g.revision_id = :r AND g.code = :c ORDER BY i.position`,
    { replacements: { r: s.revision.id, c: code }, type: QueryTypes.SELECT },
  );
  return { id: items[0]!.stage_id, items: items.map((i) => i.id) };
}

/** An oral check of the items and a sign-off of each, by the student's lead instructor. */
async function signAll(s: School, studentId: string, itemIds: string[]) {
  const lead = s.people.students.indexOf(s.people.students.find((p) => p.id === studentId)!) < 3 ? s.as.instructor : s.as.instructor2;
  await check(lead, studentId, itemIds);
  const signed = [];
  for (const itemId of itemIds) signed.push(await sign(lead, { studentId, itemId }));
  return signed;
}

async function stageCheck(s: School, studentId: string, st: { id: string; items: string[] }, failItem?: string) {
  return sequelize.transaction((t) =>
    conductStageCheck(t, s.as.chief, {
      studentId,
      stageId: st.id,
      result: failItem ? "fail" : "pass",
      oralOutcomes: st.items.map((itemId) => ({ itemId, outcome: itemId === failItem ? ("not_yet" as const) : ("solid" as const) })),
      writtenScorePercent: failItem ? 60 : 90,
      remarks: "",
      occurredAt: new Date(Date.now() - 60_000),
      password: TEST_PASSWORD,
    }),
  );
}

it("the school-wide query finds exactly the stages the per-student rule calls ready", async () => {
  const s = await makeSchool("waiting");
  const aer = await stage(s, "AER");
  const atm = await stage(s, "ATM");
  // students 0–2 are in cohort A, led by the instructor, 3–5 in cohort B, led by instructor2; the chief examines
  const [complete, withdrawn, makeup, nextStage, none, partNext] = s.people.students.map((p) => p.id) as [
    string,
    string,
    string,
    string,
    string,
    string,
  ];

  await signAll(s, complete, aer.items); // waiting: AER
  const w = await signAll(s, withdrawn, aer.items); // one sign-off withdrawn: not waiting
  await sequelize.transaction((t) =>
    withdrawSignOff(t, s.as.instructor, { signOffId: w[2]!.id, reason: "Signed against the wrong check.", password: TEST_PASSWORD }),
  );
  await signAll(s, makeup, aer.items); // failed once: a make-up item is open, so not waiting
  expect((await stageCheck(s, makeup, aer, aer.items[3])).makeupItemsOpened).toBe(1);
  await signAll(s, nextStage, aer.items); // AER passed, every ATM item signed: waiting ATM
  await stageCheck(s, nextStage, aer);
  await signAll(s, nextStage, atm.items);
  // `none` has nothing signed; `partNext` passed AER and has one ATM item signed
  await signAll(s, partNext, aer.items);
  await stageCheck(s, partNext, aer);
  await signAll(s, partNext, atm.items.slice(0, 1));

  const found = (await stagesWaiting(s.as.chief)).map((r) => `${r.studentId} ${r.stageCode} ${r.since?.toISOString()}`).sort();

  // the rule, one student at a time
  const expected: string[] = [];
  for (const id of [complete, withdrawn, makeup, nextStage, none, partNext]) {
    const { student } = await requireStudentFor(s.as.chief, id, "records");
    for (const st of await stageReadiness(student))
      if (st.ready && !st.passed) expected.push(`${id} ${st.code} ${st.readySince?.toISOString()}`);
  }
  expect(found).toEqual(expected.sort());
  // and the states made above: only these two stages wait
  expect(found.map((f) => f.split(" ").slice(0, 2).join(" ")).sort()).toEqual([`${complete} AER`, `${nextStage} ATM`].sort());

  // the chief's Today: the count and the longest waiting first
  const top = await stagesWaitingTop(s.as.chief, 1);
  expect(top.total).toBe(2);
  expect(top.top.map((t) => t.studentId)).toEqual([complete]);
  // an instructor sees the stages of the students they teach
  expect((await stagesWaiting(s.as.instructor)).map((r) => r.studentId)).toEqual([complete]);
  expect((await stagesWaiting(s.as.instructor2)).map((r) => r.studentId)).toEqual([nextStage]);
});
