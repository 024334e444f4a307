import { Assignment } from "@/db/models";
import { makeSchool, actAs, closeDb } from "@/tests/helpers/factories";
import { saveDemoAction, makeCallAction } from "@/app/(app)/curve-lab/actions";
import { createAirframeAction } from "@/app/(app)/curve-lab/airframes/actions";
import { formValuesFor } from "@/lib/curve-lab/schema";
import { getAirframe } from "@/db/access/curve-lab/airframes";
import { listCallsForDemo } from "@/db/access/curve-lab/calls";
import { defaultSpec, snapshotOf, type DemoSpec } from "@/lib/curve-lab/demo-spec";
import { ktToMs, validityText } from "@/lib/aero";

// Issue 12 leftover: a stored Call it first answer is shown with lib/aero's validity words of its own
// revision (the calls table of the demo page and the student's own calls), never as a bare figure.

afterAll(async () => {
  actAs(null);
  await closeDb();
});

describe("the calls on a demo carry their answer's validity words", () => {
  it("a Vmd below the stall reads 'below stall' on every call made on it; a trainer's answer reads bare", async () => {
    const s = await makeSchool("callflags");
    actAs(s.as.instructor);
    const demoOn = async (name: string, cleanMaxLiftCoefficient: number) => {
      const af = await createAirframeAction({
        ...formValuesFor(null, "metric"),
        name,
        emptyMass: 560,
        maxMass: 760,
        wingArea: 11.6,
        wingSpan: 9.8,
        oswaldEfficiency: 0.78,
        zeroLiftDragCoefficient: 0.032,
        cleanMaxLiftCoefficient,
      });
      if (!af.ok) throw new Error(af.message);
      const spec: DemoSpec = { ...defaultSpec(snapshotOf((await getAirframe(s.school.id, af.data.id))!)), callKind: "vmd" };
      const d = await saveDemoAction({ demoId: null, name, spec });
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
      return d.data;
    };
    // CL at Vmd = sqrt(CD0 pi AR e) = sqrt(0.032 x pi x 8.28 x 0.78) = 0.81 (lib/aero/README.md):
    // with CLmax 0.7 Vmd lies below the stall, with 1.45 above it
    const low = await demoOn("Low CLmax", 0.7);
    const trainer = await demoOn("Trainer", 1.45);
    actAs(s.as.student);
    for (const d of [low, trainer]) {
      const r = await makeCallAction({ demoRevisionId: d.revisionId, kind: "vmd", predictedMs: ktToMs(60) });
      if (!r.ok) throw new Error(r.message);
    }
    for (const viewer of [s.as.student, s.as.instructor]) {
      expect((await listCallsForDemo(viewer, low.demoId)).map((c) => c.answerFlag)).toEqual([validityText(["below_stall"])]);
      expect((await listCallsForDemo(viewer, trainer.demoId)).map((c) => c.answerFlag)).toEqual([""]);
    }
  });
});
