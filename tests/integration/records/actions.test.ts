jest.setTimeout(120_000);
jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, actAs, TEST_PASSWORD } from "@/tests/helpers/factories";
import { recordCheckAction, signOffAction, conductStageCheckAction } from "@/app/(app)/records/actions";
import { acknowledgeCheckAction } from "@/app/(app)/progress/actions";
import { itemId, type School } from "./helpers";

afterAll(async () => {
  actAs(null);
  await closeDb();
});

let s: School;
beforeAll(async () => {
  s = await makeSchool("actions");
});

const checkInput = (studentId: string, item: string, over: Record<string, unknown> = {}) => ({
  studentId,
  itemIds: [item],
  levelShown: "understanding",
  durationMinutes: 9,
  occurredAt: new Date(Date.now() - 60_000).toISOString(),
  questions: [
    {
      syllabusItemId: item,
      questionText: "Parts of zero-lift drag?",
      answerSummary: "three",
      outcome: "solid",
      required: true,
      prompted: false,
      correctiveGiven: false,
    },
  ],
  ...over,
});

describe("the Records actions", () => {
  it("bad input is a 400 naming the field, and nothing is written", async () => {
    actAs(s.as.instructor);
    const item = await itemId(s, "AER-01");
    const [before] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM oral_checks WHERE school_id = :s`, {
      replacements: { s: s.school.id },
      type: QueryTypes.SELECT,
    });
    const r1 = await recordCheckAction(checkInput(s.people.students[0]!.id, item, { durationMinutes: 0 }));
    expect(r1).toMatchObject({ ok: false, status: 400 });
    expect(r1).toMatchObject({ field: "durationMinutes", message: expect.stringMatching(/^Duration: /) });
    const r2 = await recordCheckAction(
      checkInput(s.people.students[0]!.id, item, {
        questions: [{ syllabusItemId: item, outcome: "solid", answerSummary: "", required: true, prompted: false, correctiveGiven: false }],
      }),
    );
    expect(r2).toMatchObject({ field: "questions.0.questionText", message: expect.stringMatching(/^Question \(line 1\): /) });
    const r3 = await recordCheckAction(
      checkInput(s.people.students[0]!.id, item, {
        questions: [
          {
            syllabusItemId: item,
            outcome: "solid",
            answerSummary: "",
            required: true,
            prompted: false,
            correctiveGiven: false,
            generated: { kind: "vmd", aircraft: { kind: "reference", id: "lt-2" }, inputs: { massKg: 1000 } },
          },
        ],
      }),
    );
    expect(r3).toMatchObject({ ok: false, status: 400 });
    expect(r3).toMatchObject({
      field: "questions.0.generated.inputs.altitudeFt",
      message: expect.stringMatching(/^Altitude \(ft\) \(line 1\): /),
    });
    const r4 = await recordCheckAction(checkInput(s.people.students[0]!.id, item, { sessionId: "00000000-0000-4000-8000-000000000000" }));
    expect(r4).toMatchObject({ field: "sessionId", message: expect.stringMatching(/^Session: /) });
    const [after] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM oral_checks WHERE school_id = :s`, {
      replacements: { s: s.school.id },
      type: QueryTypes.SELECT,
    });
    expect(after!.n).toBe(before!.n);
  });

  it("an instructor cannot record for a student of another cohort (404, no name), nor a student at all (403)", async () => {
    const item = await itemId(s, "AER-01");
    actAs(s.as.instructor);
    const r = await recordCheckAction(checkInput(s.people.students[3]!.id, item));
    expect(r).toMatchObject({ ok: false, status: 404 });
    expect(JSON.stringify(r)).not.toContain("Student 4");
    actAs(s.as.student);
    expect(await recordCheckAction(checkInput(s.people.students[0]!.id, item))).toMatchObject({ ok: false, status: 403 });
  });

  it("records a check with a generated question, signs off with the password, refuses a second sign-off with 409, and the student acknowledges", async () => {
    actAs(s.as.instructor);
    const item = await itemId(s, "AER-03");
    const st = s.people.students[1]!.id;
    const rec = await recordCheckAction(
      checkInput(st, item, {
        levelShown: "application",
        idempotencyKey: "check-key-123456",
        questions: [
          {
            syllabusItemId: item,
            outcome: "solid",
            answerSummary: "76 kt",
            required: true,
            prompted: false,
            correctiveGiven: false,
            generated: { kind: "vmd", aircraft: { kind: "reference", id: "lt-2" }, inputs: { massKg: 1000, altitudeFt: 4000 } },
            studentFigure: 78,
          },
        ],
      }),
    );
    expect(rec).toMatchObject({ ok: true, data: { outcome: "meets" } });
    // a retried submit with the same key returns the first result and writes nothing new
    const again = await recordCheckAction(checkInput(st, item, { levelShown: "application", idempotencyKey: "check-key-123456" }));
    expect(again).toMatchObject({ ok: true, replayed: true });
    const wrong = await signOffAction({ studentId: st, itemId: item, password: "wrong-password-1" });
    expect(wrong).toMatchObject({ ok: false, status: 422, fieldErrors: { password: [expect.stringMatching(/does not match/)] } });
    const signed = await signOffAction({ studentId: st, itemId: item, password: TEST_PASSWORD });
    expect(signed).toMatchObject({ ok: true, data: { itemCode: "AER-03", generation: 1 } });
    expect(await signOffAction({ studentId: st, itemId: item, password: TEST_PASSWORD })).toMatchObject({ ok: false, status: 409 });
    actAs({ ...s.as.student, id: st, name: "Student 2" });
    const checkId = rec.ok ? rec.data.id : "";
    expect(await acknowledgeCheckAction({ checkId })).toMatchObject({ ok: true, data: { acknowledged: true } });
  });

  it("a stage check by an instructor who is not a check instructor is refused, naming the examiner", async () => {
    actAs(s.as.instructor2);
    const [stage] = await sequelize.query<{ id: string }>(`SELECT id FROM syllabus_stages WHERE revision_id = :r AND code = 'AER'`, {
      replacements: { r: s.revision.id },
      type: QueryTypes.SELECT,
    });
    const r = await conductStageCheckAction({
      studentId: s.people.students[3]!.id,
      stageId: stage!.id,
      result: "pass",
      oralOutcomes: [],
      remarks: "",
      occurredAt: new Date().toISOString(),
      password: TEST_PASSWORD,
    });
    expect(r).toMatchObject({ ok: false, status: 422 });
    expect(r).toMatchObject({ field: "examiner", message: expect.stringMatching(/^Examiner: /) });
  });
});
