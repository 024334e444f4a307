import { Assignment } from "@/db/models";
import { makeSchool, actAs, closeDb } from "@/tests/helpers/factories";
import { saveDemoAction, makeCallAction } from "@/app/(app)/curve-lab/actions";
import { createAirframeAction } from "@/app/(app)/curve-lab/airframes/actions";
import { createBriefingAction } from "@/app/(app)/briefings/actions";
import { formValuesFor } from "@/lib/curve-lab/schema";
import { getAirframe } from "@/db/access/curve-lab/airframes";
import { listAssignmentsForStudent } from "@/db/access/assignments/student-assignments";
import { defaultSpec, snapshotOf, type DemoSpec } from "@/lib/curve-lab/demo-spec";
import { ktToMs } from "@/lib/aero";
import { fixedClock, resetClock } from "@/lib/clock";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));
afterEach(resetClock);
afterAll(async () => {
  actAs(null);
  await closeDb();
});

describe("one due date per thing, and the call completes the demo's assignment", () => {
  it("a demo assigned on its own and through a briefing shows the earliest date; making the call marks the demo assignment done", async () => {
    fixedClock(new Date("2026-10-05T09:00:00Z"));
    const s = await makeSchool("onedue");
    actAs(s.as.instructor);
    const af = await createAirframeAction({
      ...formValuesFor(null, "metric"),
      name: "Due trainer",
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
    const d = await saveDemoAction({ demoId: null, name: "Where drag is least", spec });
    if (!d.ok) throw new Error(d.message);
    const b = await createBriefingAction({
      courseId: s.course.id,
      syllabusRevisionId: s.revision.id,
      title: "Drag and speed",
      objective: "Find the speed of least drag.",
      syllabusItemIds: [],
      elements: [{ title: "The drag curve", instructorActions: "Show it.", studentActions: "Call Vmd.", minutes: 20 }],
      equipment: "",
      demoRevisionIds: [d.data.revisionId],
      completionStandard: "Finds Vmd.",
      handoutIds: [],
      changeNote: "",
    });
    if (!b.ok) throw new Error(b.message);
    const common = { schoolId: s.school.id, cohortId: s.cohorts.a.id, studentId: null, note: "", assignedBy: s.people.instructor.id };
    const demoAsg = await Assignment.create({ ...common, kind: "demo", briefingId: null, demoId: d.data.demoId, dueOn: "2026-10-20" });
    const briefingAsg = await Assignment.create({
      ...common,
      kind: "briefing",
      briefingId: b.data.briefingId,
      demoId: null,
      dueOn: "2026-10-12",
    });

    const student = s.people.students[0]!.id;
    const before = await listAssignmentsForStudent(s.school.id, student);
    const demoRow = before.find((a) => a.id === demoAsg.id)!;
    expect(demoRow.dueOn).toBe("2026-10-12"); // the earlier date, reached through the briefing
    expect(before.find((a) => a.id === briefingAsg.id)!.dueOn).toBe("2026-10-12");
    // the week's window follows the one date: due within seven days of 5 Oct
    expect((await listAssignmentsForStudent(s.school.id, student, { to: "2026-10-12" })).map((a) => a.id)).toContain(demoAsg.id);
    // another student of another cohort is untouched
    expect(await listAssignmentsForStudent(s.school.id, s.people.students[3]!.id)).toEqual([]);

    actAs(s.as.student);
    const call = await makeCallAction({ demoRevisionId: d.data.revisionId, kind: "vmd", predictedMs: ktToMs(64) });
    if (!call.ok) throw new Error(call.message);
    const after = await listAssignmentsForStudent(s.school.id, student);
    expect(after.find((a) => a.id === demoAsg.id)).toMatchObject({ done: true });
    // the briefing asks more than the call: it stays open
    expect(after.find((a) => a.id === briefingAsg.id)).toMatchObject({ done: false });
    // a cohort-mate who has not called is not done
    expect((await listAssignmentsForStudent(s.school.id, s.people.students[1]!.id)).find((a) => a.id === demoAsg.id)).toMatchObject({
      done: false,
    });
  });
});
