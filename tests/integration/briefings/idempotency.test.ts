import { QueryTypes } from "sequelize";
import { randomUUID } from "node:crypto";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, actAs } from "@/tests/helpers/factories";
import { createBriefingAction, reviseBriefingAction } from "@/app/(app)/briefings/actions";
import { createAssignmentAction } from "@/app/(app)/assignments/actions";
import { createSyllabusRevisionAction } from "@/app/(app)/syllabus/actions";
import { fixedClock, resetClock } from "@/lib/clock";
import { DEMO_STAGES } from "@/db/seed/scenario";

// Each create of briefings, assignments and the syllabus, submitted twice with the same
// idempotency key (a retried form), makes one row and answers the second submit with the first result.

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));
afterEach(resetClock);
afterAll(async () => {
  actAs(null);
  await closeDb();
});

const count = async (sql: string, replacements: Record<string, unknown>) =>
  (await sequelize.query<{ n: number }>(sql, { replacements, type: QueryTypes.SELECT }))[0]!.n;

async function twice<T>(action: (input: unknown) => Promise<T>, input: Record<string, unknown>): Promise<[T, T]> {
  const key = randomUUID();
  return [await action({ ...input, idempotencyKey: key }), await action({ ...input, idempotencyKey: key })];
}

describe("briefings, assignments and syllabus creates with a repeated idempotency key", () => {
  let s: Awaited<ReturnType<typeof makeSchool>>;
  const draft = (title: string) => ({
    courseId: s.course.id,
    syllabusRevisionId: s.revision.id,
    title,
    objective: "Say where the drag curve has its minimum.",
    syllabusItemIds: [],
    elements: [{ title: "The bucket", instructorActions: "Draw the curve.", studentActions: "Mark Vmd.", minutes: 15 }],
    equipment: "",
    demoRevisionIds: [],
    completionStandard: "Marks Vmd on the curve.",
    handoutIds: [],
    changeNote: "",
  });
  beforeAll(async () => {
    s = await makeSchool("retry-briefings");
  });

  it("New briefing: one briefing with one revision", async () => {
    actAs(s.as.instructor);
    const [first, second] = await twice(createBriefingAction, draft("Retried briefing"));
    expect(first).toMatchObject({ ok: true });
    expect(second).toEqual({ ...first, replayed: true });
    expect(
      await count(
        `SELECT count(*)::int AS n FROM briefing_revisions r JOIN briefings b ON b.id = r.briefing_id WHERE b.school_id = :s AND r.title = 'Retried briefing'`,
        { s: s.school.id },
      ),
    ).toBe(1);
  });

  it("Next revision of a briefing: one revision", async () => {
    actAs(s.as.instructor);
    const made = await createBriefingAction({ ...draft("Revised twice"), idempotencyKey: randomUUID() });
    if (!made.ok) throw new Error(made.message);
    const { briefingId } = made.data;
    const [first, second] = await twice(reviseBriefingAction, { ...draft("Revised twice"), briefingId, equipment: "Whiteboard" });
    expect(first).toMatchObject({ ok: true, data: { number: 2 } });
    expect(second).toEqual({ ...first, replayed: true });
    expect(await count(`SELECT count(*)::int AS n FROM briefing_revisions WHERE briefing_id = :briefingId`, { briefingId })).toBe(2);
  });

  it("New assignment: one assignment and one mail per student", async () => {
    fixedClock(new Date("2026-10-05T09:00:00Z"));
    actAs(s.as.instructor);
    const made = await createBriefingAction({ ...draft("Assigned once"), idempotencyKey: randomUUID() });
    if (!made.ok) throw new Error(made.message);
    const [first, second] = await twice(createAssignmentAction, {
      kind: "briefing",
      briefingId: made.data.briefingId,
      demoId: "",
      cohortId: s.cohorts.a.id,
      studentIds: [],
      dueOn: "2026-10-10",
      note: "",
    });
    expect(first).toMatchObject({ ok: true });
    expect(second).toEqual({ ...first, replayed: true });
    expect(await count(`SELECT count(*)::int AS n FROM assignments WHERE briefing_id = :b`, { b: made.data.briefingId })).toBe(1);
    const ids = (first as { data: { ids: string[] } }).data.ids;
    const mailed = (first as { data: { mailed: number } }).data.mailed;
    expect(mailed).toBeGreaterThan(0);
    expect(
      await count(`SELECT count(*)::int AS n FROM outbox WHERE kind = 'assignment.new' AND idempotency_key LIKE :k`, {
        k: `assignment.new:${ids[0]}:%`,
      }),
    ).toBe(mailed);
  });

  it("New syllabus revision: one revision", async () => {
    actAs(s.as.chief);
    const [first, second] = await twice(createSyllabusRevisionAction, {
      courseId: s.course.id,
      approvedOn: "2026-10-01",
      effectiveFrom: "",
      changeNote: "Retried revision",
      stages: DEMO_STAGES,
    });
    expect(first).toMatchObject({ ok: true, data: { number: 2 } });
    expect(second).toEqual({ ...first, replayed: true });
    expect(await count(`SELECT count(*)::int AS n FROM syllabus_revisions WHERE course_id = :c`, { c: s.course.id })).toBe(2);
  });
});
