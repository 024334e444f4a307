import { QueryTypes } from "sequelize";
import { NextRequest } from "next/server";
import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { sequelize } from "@/db/index";
import { Assignment } from "@/db/models";
import { makeSchool, actAs, closeDb } from "@/tests/helpers/factories";
import { saveDemoAction } from "@/app/(app)/curve-lab/actions";
import { createAirframeAction } from "@/app/(app)/curve-lab/airframes/actions";
import { createBriefingAction } from "@/app/(app)/briefings/actions";
import { answerPracticeAction, submitPracticeTestAction } from "@/app/(app)/practice/actions";
import { GET as trainingRecordRoute } from "@/app/api/records/[studentId]/training-record/route";
import { formValuesFor } from "@/lib/curve-lab/schema";
import { getAirframe } from "@/db/access/curve-lab/airframes";
import { defaultSpec, snapshotOf, type DemoSpec } from "@/lib/curve-lab/demo-spec";
import { practiceTopicsFor } from "@/db/access/practice/topics";
import { practiceReadinessFor } from "@/db/access/practice/readiness";
import { listChecksOfStudent } from "@/db/access/records/check-history";
import { signOffRegister } from "@/db/access/records/sign-off-register";
import { progressFor } from "@/db/access/records/progress-map";
import { trainingRecordFor } from "@/db/access/records/training-record";
import { generateQuestion } from "@/lib/records/questions";
import { makePracticeQuestion } from "@/lib/practice/generate";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));
afterAll(async () => {
  actAs(null);
  await closeDb();
});

const CANARY = "Zephyrcanary";

describe("practice questions: scored at once, stored as practice, never as oral checks", () => {
  it("scores answers on the student's own demo and item, runs a practice test against the pass mark, and stays out of every record", async () => {
    const s = await makeSchool("practice");
    const [item] = await sequelize.query<{ id: string; code: string }>(
      `SELECT i.id, i.code FROM syllabus_items i WHERE i.revision_id = :r ORDER BY i.code LIMIT 1`,
      { replacements: { r: s.revision.id }, type: QueryTypes.SELECT },
    );
    actAs(s.as.instructor);
    const af = await createAirframeAction({
      ...formValuesFor(null, "metric"),
      name: CANARY,
      emptyMass: 560,
      maxMass: 760,
      wingArea: 11.6,
      wingSpan: 9.8,
      oswaldEfficiency: 0.78,
      zeroLiftDragCoefficient: 0.032,
      cleanMaxLiftCoefficient: 1.45,
    });
    if (!af.ok) throw new Error(af.message);
    const spec: DemoSpec = { ...defaultSpec(snapshotOf((await getAirframe(s.school.id, af.data.id))!)), callKind: "vmd" };
    const d = await saveDemoAction({ demoId: null, name: "Least drag", spec });
    if (!d.ok) throw new Error(d.message);
    const b = await createBriefingAction({
      courseId: s.course.id,
      syllabusRevisionId: s.revision.id,
      title: "Drag and speed",
      objective: "Find the speed of least drag.",
      syllabusItemIds: [item!.id],
      elements: [{ title: "The drag curve", instructorActions: "Show it.", studentActions: "Call Vmd.", minutes: 20 }],
      equipment: "",
      demoRevisionIds: [d.data.revisionId],
      completionStandard: "Finds Vmd.",
      handoutIds: [],
      changeNote: "",
    });
    if (!b.ok) throw new Error(b.message);
    await Assignment.create({
      schoolId: s.school.id,
      kind: "briefing",
      briefingId: b.data.briefingId,
      demoId: null,
      cohortId: s.cohorts.a.id,
      studentId: null,
      dueOn: "2099-01-01",
      note: "",
      assignedBy: s.people.instructor.id,
    });
    const student = s.people.students[0]!.id;
    const topics = await practiceTopicsFor(s.school.id, student);
    expect(topics).toHaveLength(1);
    expect(topics[0]!.items.map((i) => i.id)).toEqual([item!.id]);
    // a student of the other cohort has nothing to practise
    expect(await practiceTopicsFor(s.school.id, s.people.students[3]!.id)).toEqual([]);

    const q = makePracticeQuestion("vmd", topics[0]!.snapshot, () => 0.5)!;
    expect(q.text).toContain(CANARY);
    const right = q.answer.type === "number" ? q.answer.value : 0;
    const base = { demoRevisionId: d.data.revisionId, itemId: item!.id, kind: "vmd" as const, inputs: q.inputs };
    actAs(s.as.student);
    const good = await answerPracticeAction({ ...base, figure: right });
    expect(good).toMatchObject({ ok: true, data: { correct: true, worked: q.answer.type === "number" ? q.answer.display : "" } });
    const bad = await answerPracticeAction({ ...base, figure: right * 1.5 });
    expect(bad).toMatchObject({ ok: true, data: { correct: false } });
    // bad input: a clear 400 naming the field, nothing written
    expect(await answerPracticeAction({ ...base })).toMatchObject({ ok: false, status: 400, field: "figure" });
    expect(await answerPracticeAction({ ...base, inputs: { ...base.inputs, massKg: 5_000 }, figure: 60 })).toMatchObject({
      ok: false,
      status: 400,
      field: "inputs.massKg",
    });
    // a demo that is not theirs: 404
    actAs({ ...s.as.otherStudent });
    expect(await answerPracticeAction({ ...base, figure: right })).toMatchObject({ ok: false, status: 404 });

    // a practice test: 2 right of 3 is 66 %, below the default pass mark of 80 %
    actAs(s.as.student);
    const t = await submitPracticeTestAction({
      answers: [
        { ...base, figure: right },
        { ...base, figure: right },
        { ...base, figure: right * 2 },
      ],
    });
    expect(t).toMatchObject({ ok: true, data: { result: { correct: 2, total: 3, percent: 66, passMarkPercent: 80, passed: false } } });
    const [n] = await sequelize.query<{ n: number; tests: number }>(
      `SELECT count(*)::int AS n, count(DISTINCT test_id)::int AS tests FROM practice_attempts WHERE student_id = :st`,
      { replacements: { st: student }, type: QueryTypes.SELECT },
    );
    expect(n).toEqual({ n: 5, tests: 1 });
    // the stored question is the server's, computed again from the demo: the same as generateQuestion gives
    const [stored] = await sequelize.query<{ question: { answer: { value: number } } }>(
      `SELECT question FROM practice_attempts WHERE student_id = :st LIMIT 1`,
      { replacements: { st: student }, type: QueryTypes.SELECT },
    );
    const again = generateQuestion("vmd", topics[0]!.snapshot, q.inputs);
    expect(stored!.question.answer.value).toBeCloseTo(again.answer.type === "number" ? again.answer.value : Number.NaN, 9);

    // never in records: no oral check, nothing in the Sign-off register, the Progress map or the training record
    const [oc] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM oral_checks WHERE student_id = :st`, {
      replacements: { st: student },
      type: QueryTypes.SELECT,
    });
    expect(oc!.n).toBe(0);
    expect(await listChecksOfStudent(s.school.id, student, { withRemarks: true })).toEqual([]);
    expect((await signOffRegister(s.as.chief, {}, { studentId: student })).rows).toEqual([]);
    const map = await progressFor(s.as.chief, student);
    expect(map.checks).toEqual([]);
    expect(JSON.stringify(map)).not.toContain(CANARY);
    const record = await trainingRecordFor(s.as.chief, student);
    expect(record.checks).toEqual([]);
    expect(JSON.stringify(record)).not.toContain(CANARY);
    actAs(s.as.chief);
    const res = await trainingRecordRoute(new NextRequest(`http://127.0.0.1/api/records/${student}/training-record`), {
      params: Promise.resolve({ studentId: student }),
    });
    expect(res.status).toBe(200);
    const dir = mkdtempSync(path.join(tmpdir(), "practice-record-"));
    try {
      const file = path.join(dir, "record.pdf");
      writeFileSync(file, Buffer.from(await res.arrayBuffer()));
      const text = execFileSync("pdftotext", ["-enc", "UTF-8", file, "-"], { encoding: "utf8" });
      expect(text).toContain(s.people.students[0]!.name);
      expect(text).not.toContain(CANARY);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }

    // the instructor sees readiness per item: 5 attempts, 3 right (60 %)
    expect(await practiceReadinessFor(s.as.instructor, student)).toEqual([
      expect.objectContaining({ itemId: item!.id, itemCode: item!.code, attempts: 5, correct: 3, percent: 60 }),
    ]);
    // scoped as Records: the other cohort's lead sees no such student; a student may not ask
    await expect(practiceReadinessFor(s.as.instructor2, student)).rejects.toMatchObject({ status: 404 });
    await expect(practiceReadinessFor(s.as.student, student)).rejects.toMatchObject({ status: 403 });
  });
});
