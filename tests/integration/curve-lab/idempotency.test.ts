import { QueryTypes } from "sequelize";
import { randomUUID } from "node:crypto";
import { sequelize } from "@/db/index";
import { Assignment } from "@/db/models";
import { makeSchool, actAs, closeDb } from "@/tests/helpers/factories";
import { saveDemoAction, duplicateDemoAction, makeCallAction } from "@/app/(app)/curve-lab/actions";
import { createAirframeAction, duplicateAirframeAction } from "@/app/(app)/curve-lab/airframes/actions";
import { formValuesFor } from "@/lib/curve-lab/schema";
import { defaultSpec, snapshotOf, type DemoSpec } from "@/lib/curve-lab/demo-spec";
import { ktToMs } from "@/lib/aero";

// Each Curve Lab create, submitted twice with the same idempotency key (a retried form), makes one
// row and answers the second submit with the first result.

afterAll(async () => {
  actAs(null);
  await closeDb();
});

const trainer = {
  ...formValuesFor(null, "metric"),
  name: "Retry trainer",
  emptyMass: 560,
  maxMass: 760,
  wingArea: 11.6,
  wingSpan: 9.8,
  oswaldEfficiency: 0.78,
  zeroLiftDragCoefficient: 0.032,
  cleanMaxLiftCoefficient: 1.45,
};

async function count(sql: string, replacements: Record<string, unknown>): Promise<number> {
  const [r] = await sequelize.query<{ n: number }>(sql, { replacements, type: QueryTypes.SELECT });
  return r!.n;
}

async function twice<T>(action: (input: unknown) => Promise<T>, input: Record<string, unknown>): Promise<[T, T]> {
  const key = randomUUID();
  const first = await action({ ...input, idempotencyKey: key });
  const second = await action({ ...input, idempotencyKey: key });
  return [first, second];
}

describe("Curve Lab creates with a repeated idempotency key", () => {
  let s: Awaited<ReturnType<typeof makeSchool>>;
  let spec: DemoSpec;
  let airframeId: string;
  beforeAll(async () => {
    s = await makeSchool("curvelab-retry");
    actAs(s.as.instructor);
    const a = await createAirframeAction(trainer);
    if (!a.ok) throw new Error(a.message);
    airframeId = a.data.id;
    spec = { ...defaultSpec(snapshotOf(a.data)), callKind: "vmd" };
  });

  it("Create profile: one aircraft profile", async () => {
    actAs(s.as.instructor);
    const [first, second] = await twice(createAirframeAction, { ...trainer, name: "Retried profile" });
    expect(first).toMatchObject({ ok: true });
    expect(second).toEqual({ ...first, replayed: true });
    expect(
      await count(`SELECT count(*)::int AS n FROM airframes WHERE school_id = :id AND name = 'Retried profile'`, { id: s.school.id }),
    ).toBe(1);
  });

  it("Duplicate profile: one copy", async () => {
    actAs(s.as.instructor);
    const [first, second] = await twice(duplicateAirframeAction, { airframeId });
    expect(first).toMatchObject({ ok: true });
    expect(second).toEqual({ ...first, replayed: true });
    expect(
      await count(`SELECT count(*)::int AS n FROM airframes WHERE school_id = :id AND name = 'Copy of Retry trainer'`, { id: s.school.id }),
    ).toBe(1);
  });

  it("Save (a new demo): one demo with one revision", async () => {
    actAs(s.as.instructor);
    const [first, second] = await twice(saveDemoAction, { demoId: null, name: "Retried demo", spec });
    expect(first).toMatchObject({ ok: true, data: { revisionNumber: 1 } });
    expect(second).toEqual({ ...first, replayed: true });
    expect(await count(`SELECT count(*)::int AS n FROM demos WHERE school_id = :id AND name = 'Retried demo'`, { id: s.school.id })).toBe(
      1,
    );
    const demoId = (first as { data: { demoId: string } }).data.demoId;
    expect(await count(`SELECT count(*)::int AS n FROM demo_revisions WHERE demo_id = :demoId`, { demoId })).toBe(1);
  });

  it("Duplicate demo: one copy", async () => {
    actAs(s.as.instructor);
    const made = await saveDemoAction({ demoId: null, name: "Source demo", spec, idempotencyKey: randomUUID() });
    if (!made.ok) throw new Error(made.message);
    const [first, second] = await twice(duplicateDemoAction, { demoId: made.data.demoId });
    expect(first).toMatchObject({ ok: true });
    expect(second).toEqual({ ...first, replayed: true });
    expect(
      await count(`SELECT count(*)::int AS n FROM demos WHERE school_id = :id AND name = 'Copy of Source demo'`, { id: s.school.id }),
    ).toBe(1);
  });

  it("Call it first: one call", async () => {
    actAs(s.as.instructor);
    const made = await saveDemoAction({ demoId: null, name: "Call demo", spec, idempotencyKey: randomUUID() });
    if (!made.ok) throw new Error(made.message);
    await Assignment.create({
      schoolId: s.school.id,
      kind: "demo",
      briefingId: null,
      demoId: made.data.demoId,
      cohortId: s.cohorts.a.id,
      studentId: null,
      dueOn: "2099-01-01",
      note: "",
      assignedBy: s.people.instructor.id,
    });
    actAs(s.as.student);
    const [first, second] = await twice(makeCallAction, { demoRevisionId: made.data.revisionId, kind: "vmd", predictedMs: ktToMs(65) });
    expect(first).toMatchObject({ ok: true });
    expect(second).toEqual({ ...first, replayed: true });
    expect(await count(`SELECT count(*)::int AS n FROM demo_calls WHERE demo_revision_id = :rev`, { rev: made.data.revisionId })).toBe(1);
  });
});
