import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { Assignment } from "@/db/models";
import { makeSchool, actAs, closeDb } from "@/tests/helpers/factories";
import { saveDemoAction, renameDemoAction, duplicateDemoAction, deleteDemoAction, makeCallAction } from "@/app/(app)/curve-lab/actions";
import { createAirframeAction, updateAirframeAction } from "@/app/(app)/curve-lab/airframes/actions";
import { formValuesFor } from "@/lib/curve-lab/schema";
import { getDemo, getDemoRevision, listDemos } from "@/db/access/curve-lab/demos";
import { listCallsForDemo } from "@/db/access/curve-lab/calls";
import { getAirframe } from "@/db/access/curve-lab/airframes";
import { snapshotOf } from "@/lib/curve-lab/demo-spec";
import { defaultSpec, aircraftFor, type DemoSpec } from "@/lib/curve-lab/demo-spec";
import { minimumDragSpeed, ktToMs } from "@/lib/aero";

afterAll(async () => {
  actAs(null);
  await closeDb();
});

type School = Awaited<ReturnType<typeof makeSchool>>;

const trainer = {
  ...formValuesFor(null, "metric"),
  name: "Integration trainer",
  emptyMass: 560,
  maxMass: 760,
  wingArea: 11.6,
  wingSpan: 9.8,
  oswaldEfficiency: 0.78,
  zeroLiftDragCoefficient: 0.032,
  cleanMaxLiftCoefficient: 1.45,
  flaps1: { present: true, cd0Increment: 0.012, maxLiftCoefficient: 1.75 },
};

async function count(table: string, where = "true", replacements: Record<string, unknown> = {}): Promise<number> {
  const [r] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM ${table} WHERE ${where}`, {
    replacements,
    type: QueryTypes.SELECT,
  });
  return r!.n;
}

async function newAirframe(s: School) {
  actAs(s.as.instructor);
  const r = await createAirframeAction(trainer);
  if (!r.ok) throw new Error(r.message);
  return (await getAirframe(s.school.id, r.data.id))!;
}

async function newDemo(s: School, spec: DemoSpec, name = "Bucket") {
  actAs(s.as.instructor);
  const r = await saveDemoAction({ demoId: null, name, spec });
  if (!r.ok) throw new Error(r.message);
  return r.data;
}

function assign(s: School, demoId: string) {
  return Assignment.create({
    schoolId: s.school.id,
    kind: "demo",
    briefingId: null,
    demoId,
    cohortId: s.cohorts.a.id,
    studentId: null,
    dueOn: "2099-01-01",
    note: "",
    assignedBy: s.people.instructor.id,
  });
}

describe("Curve Lab demos: save, revisions, duplicate, delete", () => {
  let s: School;
  let spec: DemoSpec;
  beforeAll(async () => {
    s = await makeSchool("curvelab");
    spec = { ...defaultSpec(snapshotOf(await newAirframe(s))), callKind: "vmd" };
  });

  it("saving an unused demo updates its current revision in place", async () => {
    const d = await newDemo(s, spec);
    expect(d.revisionNumber).toBe(1);
    const changed = { ...spec, notes: "first words" };
    const r = await saveDemoAction({ demoId: d.demoId, name: "Bucket", spec: changed });
    expect(r).toMatchObject({ ok: true, data: { revisionNumber: 1, newRevision: false, revisionId: d.revisionId } });
    expect((await getDemoRevision(s.school.id, d.revisionId))!.spec.notes).toBe("first words");
    expect(await count("demo_revisions", "demo_id = :id", { id: d.demoId })).toBe(1);
  });

  it("editing an assigned demo makes a new numbered revision and leaves the taught one unchanged", async () => {
    const d = await newDemo(s, spec, "Assigned");
    await assign(s, d.demoId);
    const heavier = { ...spec, cases: [{ ...spec.cases[0]!, massKg: 700 }] };
    const r = await saveDemoAction({ demoId: d.demoId, name: "Assigned", spec: heavier });
    expect(r).toMatchObject({ ok: true, data: { revisionNumber: 2, newRevision: true } });
    const first = await getDemoRevision(s.school.id, d.revisionId);
    expect(first!.spec.cases[0]!.massKg).toBe(spec.cases[0]!.massKg);
    const demo = await getDemo(s.school.id, d.demoId);
    expect(demo!.revision.number).toBe(2);
    expect(demo!.revision.spec.cases[0]!.massKg).toBe(700);
  });

  it("refuses to delete an assigned demo (409, kept) and deletes an unused one", async () => {
    const used = await newDemo(s, spec, "Used");
    await assign(s, used.demoId);
    const r = await deleteDemoAction({ demoId: used.demoId });
    expect(r).toMatchObject({ ok: false, status: 409 });
    expect(await getDemo(s.school.id, used.demoId)).not.toBeNull();

    const unused = await newDemo(s, spec, "Unused");
    expect(await deleteDemoAction({ demoId: unused.demoId })).toMatchObject({ ok: true });
    expect(await getDemo(s.school.id, unused.demoId)).toBeNull();
    expect((await listDemos(s.school.id)).map((d) => d.id)).not.toContain(unused.demoId);
  });

  it("duplicates into the caller's own demo at revision 1; only the owner or the chief may change a demo", async () => {
    const d = await newDemo(s, spec, "Original");
    actAs(s.as.instructor2);
    expect(await saveDemoAction({ demoId: d.demoId, name: "Hijack", spec })).toMatchObject({ ok: false, status: 403 });
    expect(await renameDemoAction({ demoId: d.demoId, name: "Hijack" })).toMatchObject({ ok: false, status: 403 });
    const copy = await duplicateDemoAction({ demoId: d.demoId });
    if (!copy.ok) throw new Error(copy.message);
    const c = await getDemo(s.school.id, copy.data.demoId);
    expect(c).toMatchObject({ name: "Copy of Original", ownerId: s.people.instructor2.id, revision: { number: 1 } });
    expect(c!.revision.spec).toEqual((await getDemo(s.school.id, d.demoId))!.revision.spec);
    actAs(s.as.chief);
    expect(await renameDemoAction({ demoId: d.demoId, name: "Renamed by chief" })).toMatchObject({ ok: true });
    expect((await getDemo(s.school.id, d.demoId))!.name).toBe("Renamed by chief");
  });

  it("refuses a student's save with 403 and writes nothing", async () => {
    const before = await count("demos");
    const revisions = await count("demo_revisions");
    actAs(s.as.student);
    expect(await saveDemoAction({ demoId: null, name: "Mine", spec })).toMatchObject({ ok: false, status: 403 });
    const d = await newDemo(s, spec, "Student target");
    actAs(s.as.student);
    expect(await saveDemoAction({ demoId: d.demoId, name: "Mine", spec })).toMatchObject({ ok: false, status: 403 });
    expect(await deleteDemoAction({ demoId: d.demoId })).toMatchObject({ ok: false, status: 403 });
    expect(await count("demos")).toBe(before + 1);
    expect(await count("demo_revisions")).toBe(revisions + 1);
  });

  it("rejects a bad spec with a field error and writes nothing", async () => {
    const before = await count("demos");
    actAs(s.as.instructor);
    const bad = { ...spec, cases: [{ ...spec.cases[0]!, massKg: -3 }] };
    const r = await saveDemoAction({ demoId: null, name: "Bad", spec: bad });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.status).toBe(400);
    expect(Object.keys(r.fieldErrors ?? {})).toContain("spec.cases.0.massKg");
    const five = { ...spec, cases: [0, 1, 2, 3, 4].map(() => spec.cases[0]!) };
    expect(await saveDemoAction({ demoId: null, name: "Too many", spec: five })).toMatchObject({
      ok: false,
      status: 400,
      fieldErrors: { "spec.cases": ["cases: at most four cases"] },
    });
    expect(await count("demos")).toBe(before);
  });
});

describe("Call it first", () => {
  it("stores a student's call with the answer computed by the server and its error, shown to their instructor only", async () => {
    const s = await makeSchool("calls");
    const spec: DemoSpec = { ...defaultSpec(snapshotOf(await newAirframe(s))), callKind: "vmd" };
    const d = await newDemo(s, spec, "Call demo");
    await assign(s, d.demoId);

    actAs(s.as.student);
    const predictedMs = ktToMs(65);
    const r = await makeCallAction({ demoRevisionId: d.revisionId, kind: "vmd", predictedMs });
    if (!r.ok) throw new Error(r.message);
    const vmd = minimumDragSpeed(aircraftFor(spec.airframe, spec.cases[0]!), { altitudeM: 0, isaDeviationK: 0 }).equivalentAirspeedMs;
    expect(r.data.actualMs).toBeCloseTo(vmd, 9);
    expect(r.data.errorMs).toBeCloseTo(predictedMs - vmd, 9);

    // a call the demo does not ask for, and a student the demo is not assigned to
    expect(await makeCallAction({ demoRevisionId: d.revisionId, kind: "stall", predictedMs })).toMatchObject({ ok: false, status: 400 });
    actAs(s.as.otherStudent);
    expect(await makeCallAction({ demoRevisionId: d.revisionId, kind: "vmd", predictedMs })).toMatchObject({ ok: false, status: 404 });
    actAs(s.as.instructor);
    expect(await makeCallAction({ demoRevisionId: d.revisionId, kind: "vmd", predictedMs })).toMatchObject({ ok: false, status: 403 });

    const mine = await listCallsForDemo(s.as.instructor, d.demoId);
    expect(mine).toHaveLength(1);
    expect(mine[0]).toMatchObject({ studentId: s.people.students[0]!.id, markerKind: "vmd", revisionNumber: 1 });
    expect(mine[0]!.errorMs).toBeCloseTo(predictedMs - vmd, 9);
    expect(await listCallsForDemo(s.as.instructor2, d.demoId)).toHaveLength(0);
    expect(await listCallsForDemo(s.as.chief, d.demoId)).toHaveLength(1);

    // a called demo is in use: the next save makes revision 2, and calls stay on revision 1
    expect(await saveDemoAction({ demoId: d.demoId, name: "Call demo", spec: { ...spec, notes: "v2" } })).toMatchObject({
      ok: true,
      data: { revisionNumber: 2 },
    });
    // calls are append-only for the app's role
    await expect(sequelize.query(`UPDATE demo_calls SET error_ms = 0`)).rejects.toThrow(/permission denied/);
  });
});

describe("aircraft profiles", () => {
  it("rejects bad input with field errors and writes nothing; an edit never changes a saved demo's numbers", async () => {
    const s = await makeSchool("airframes");
    actAs(s.as.instructor);
    const before = await count("airframes", "school_id = :id", { id: s.school.id });
    const bad = await createAirframeAction({ ...trainer, maxMass: 400, oswaldEfficiency: 2 });
    expect(bad).toMatchObject({ ok: false, status: 400 });
    if (bad.ok) return;
    expect(bad.fieldErrors).toMatchObject({
      maxMass: ["Maximum mass must be at least the empty mass"],
      oswaldEfficiency: ["Oswald efficiency must be between 0.1 and 1"],
    });
    expect(await count("airframes", "school_id = :id", { id: s.school.id })).toBe(before);

    const a = await newAirframe(s);
    const d = await newDemo(s, defaultSpec(snapshotOf(a)), "Snapshot");
    const edited = await updateAirframeAction({ airframeId: a.id, values: { ...trainer, zeroLiftDragCoefficient: 0.05 } });
    expect(edited).toMatchObject({ ok: true, data: { zeroLiftDragCoefficient: 0.05 } });
    expect((await getDemoRevision(s.school.id, d.revisionId))!.spec.airframe.zeroLiftDragCoefficient).toBe(0.032);

    actAs(s.as.student);
    expect(await createAirframeAction(trainer)).toMatchObject({ ok: false, status: 403 });
    // another school's profile is not found
    const other = await makeSchool("airframes-other");
    actAs(other.as.instructor);
    expect(await updateAirframeAction({ airframeId: a.id, values: trainer })).toMatchObject({ ok: false, status: 404 });
  });
});
