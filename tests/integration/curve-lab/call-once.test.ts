import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { Assignment } from "@/db/models";
import { makeSchool, actAs, closeDb } from "@/tests/helpers/factories";
import { saveDemoAction, makeCallAction } from "@/app/(app)/curve-lab/actions";
import { createAirframeAction } from "@/app/(app)/curve-lab/airframes/actions";
import { formValuesFor } from "@/lib/curve-lab/schema";
import { getAirframe } from "@/db/access/curve-lab/airframes";
import { ownCallOnRevision } from "@/db/access/curve-lab/call-once";
import { listCallsForDemo } from "@/db/access/curve-lab/calls";
import { defaultSpec, snapshotOf, type DemoSpec } from "@/lib/curve-lab/demo-spec";
import { ktToMs } from "@/lib/aero";

afterAll(async () => {
  actAs(null);
  await closeDb();
});

describe("Call it first: one call per student per demo revision", () => {
  it("a second call on the same revision stores nothing and returns the first; a new revision takes a new call", async () => {
    const s = await makeSchool("callonce");
    actAs(s.as.instructor);
    const af = await createAirframeAction({
      ...formValuesFor(null, "metric"),
      name: "Once trainer",
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
    const d = await saveDemoAction({ demoId: null, name: "Once", spec });
    if (!d.ok) throw new Error(d.message);
    await Assignment.create({
      schoolId: s.school.id,
      kind: "demo",
      briefingId: null,
      demoId: d.data.demoId,
      cohortId: s.cohorts.a.id,
      studentId: null,
      dueOn: "2099-01-01",
      note: "",
      assignedBy: s.people.instructor.id,
    });

    actAs(s.as.student);
    expect(await ownCallOnRevision(s.school.id, d.data.revisionId, s.people.students[0]!.id)).toBeNull();
    const first = await makeCallAction({ demoRevisionId: d.data.revisionId, kind: "vmd", predictedMs: ktToMs(62) });
    if (!first.ok) throw new Error(first.message);
    expect(first.data.alreadyMade).toBe(false);
    // after the reveal, a second call (a reload, another tab, a new idempotency key) changes nothing
    const second = await makeCallAction({
      demoRevisionId: d.data.revisionId,
      kind: "vmd",
      predictedMs: ktToMs(70),
      idempotencyKey: "7d0f7c52-2b6c-4c41-9b64-7a1f7b0c9e11",
    });
    expect(second).toMatchObject({ ok: true, data: { id: first.data.id, alreadyMade: true } });
    if (second.ok) expect(second.data.predictedMs).toBeCloseTo(ktToMs(62), 9);
    const [n] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM demo_calls WHERE demo_revision_id = :r`, {
      replacements: { r: d.data.revisionId },
      type: QueryTypes.SELECT,
    });
    expect(n!.n).toBe(1);
    // what the page reads on reload: the first call, not a new prompt
    expect(await ownCallOnRevision(s.school.id, d.data.revisionId, s.people.students[0]!.id)).toMatchObject({ id: first.data.id });
    // the database itself refuses a second row
    await expect(
      sequelize.query(
        `INSERT INTO demo_calls (school_id, demo_revision_id, student_id, marker_kind, speed_axis, predicted_ms, actual_ms, error_ms)
         SELECT school_id, demo_revision_id, student_id, marker_kind, speed_axis, 40, actual_ms, 40 - actual_ms FROM demo_calls WHERE id = :id`,
        { replacements: { id: first.data.id } },
      ),
    ).rejects.toMatchObject({ name: "SequelizeUniqueConstraintError", parent: { constraint: "demo_calls_one_per_revision" } });

    // a new revision takes a new call, and the student sees both of their calls
    actAs(s.as.instructor);
    const v2 = await saveDemoAction({ demoId: d.data.demoId, name: "Once", spec: { ...spec, notes: "v2" } });
    if (!v2.ok) throw new Error(v2.message);
    expect(v2.data.revisionNumber).toBe(2);
    actAs(s.as.student);
    const again = await makeCallAction({ demoRevisionId: v2.data.revisionId, kind: "vmd", predictedMs: ktToMs(66) });
    expect(again).toMatchObject({ ok: true, data: { alreadyMade: false } });
    const mine = await listCallsForDemo(s.as.student, d.data.demoId);
    expect(mine.map((c) => c.revisionNumber).sort()).toEqual([1, 2]);
  });
});
