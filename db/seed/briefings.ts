import { QueryTypes } from "sequelize";
import { PDFDocument, StandardFonts, rgb } from "pdf-lib";
import { sequelize } from "../index";
import { Assignment, AssignmentCompletion } from "../models";
import { addHandout } from "../access/briefings/handouts";
import { saveBriefingRevision, type BriefingInput } from "../access/briefings/save-revision";
import { createAssignments } from "../access/assignments/create";
import type { SeedContext } from "./extensions";
import type { CurrentUser } from "@/lib/auth/session";

// Demo briefings for the drag-and-speed stage (content of our own, standard theory), a generated
// PDF handout, and assignments for the Kestrel cohort. Runs after Curve Lab's seed (it uses its demos)
// and before the Timetable's (which schedules these briefings).

/** A one-page handout: the two drag curves, their sum, and Vmd where the two are equal. */
export async function dragCurveHandoutPdf(): Promise<Buffer> {
  const doc = await PDFDocument.create();
  doc.setTitle("The drag curve and Vmd");
  doc.setCreator("Chalkwing demo data");
  const page = doc.addPage([595, 842]); // A4 in points
  const font = await doc.embedFont(StandardFonts.Helvetica);
  const bold = await doc.embedFont(StandardFonts.HelveticaBold);
  page.drawText("Larkhollow Flying School - ground school handout", { x: 50, y: 790, size: 10, font, color: rgb(0.3, 0.3, 0.35) });
  page.drawText("The drag curve and the minimum-drag speed (Vmd)", { x: 50, y: 765, size: 16, font: bold });
  const lines = [
    "Zero-lift drag grows with the square of the equivalent airspeed: twice the speed, four times the drag.",
    "Lift-dependent drag falls with the square of the speed in level flight, because less lift coefficient is needed.",
    "Total drag is their sum. Its lowest point is Vmd, where the two parts are equal; L/D is greatest there.",
    "Below Vmd, slowing down raises drag: at constant thrust the aircraft keeps slowing (speed-unstable).",
    "Above Vmd, a gust that slows the aircraft lowers drag, so it accelerates back (speed-stable).",
    "A lighter aircraft has a lower Vmd: it varies with the square root of the weight.",
  ];
  lines.forEach((l, i) => page.drawText(l, { x: 50, y: 735 - i * 16, size: 10, font, maxWidth: 495 }));
  // The curves, in arbitrary units: D0 = k1 v^2, Di = k2 / v^2, equal at v = 1.
  const ox = 80,
    oy = 330,
    w = 440,
    h = 260;
  page.drawLine({ start: { x: ox, y: oy }, end: { x: ox + w, y: oy }, thickness: 1 });
  page.drawLine({ start: { x: ox, y: oy }, end: { x: ox, y: oy + h }, thickness: 1 });
  page.drawText("speed", { x: ox + w - 30, y: oy - 16, size: 9, font });
  page.drawText("drag", { x: ox - 30, y: oy + h - 10, size: 9, font });
  const X = (v: number) => ox + ((v - 0.4) / (2.2 - 0.4)) * w;
  const Y = (d: number) => oy + (Math.min(d, 4) / 4) * h;
  const curve = (f: (v: number) => number, color: ReturnType<typeof rgb>, dash?: number[]) => {
    let prev: { x: number; y: number } | null = null;
    for (let v = 0.5; v <= 2.2001; v += 0.05) {
      const p = { x: X(v), y: Y(f(v)) };
      if (prev) page.drawLine({ start: prev, end: p, thickness: 1.5, color, ...(dash ? { dashArray: dash } : {}) });
      prev = p;
    }
  };
  curve((v) => v * v, rgb(0.14, 0.35, 0.54), [4, 3]);
  curve((v) => 1 / (v * v), rgb(0.66, 0.42, 0.02), [1, 2]);
  curve((v) => v * v + 1 / (v * v), rgb(0.1, 0.1, 0.1));
  page.drawLine({ start: { x: X(1), y: oy }, end: { x: X(1), y: Y(2) }, thickness: 0.8, dashArray: [2, 2] });
  page.drawText("Vmd", { x: X(1) - 10, y: oy - 16, size: 9, font: bold });
  page.drawText("total drag (solid)", { x: X(1.75), y: Y(3.6), size: 9, font });
  page.drawText("zero-lift drag (dashed)", { x: X(1.55), y: Y(2.2), size: 9, font });
  page.drawText("lift-dependent drag (dotted)", { x: X(0.62), y: Y(3.3), size: 9, font });
  page.drawText("Sketch for teaching only; real curves come from the aircraft's drag polar.", {
    x: 50,
    y: 290,
    size: 9,
    font,
    color: rgb(0.4, 0.4, 0.45),
  });
  return Buffer.from(await doc.save());
}

const el = (title: string, instructorActions: string, studentActions: string, minutes: number) => ({
  title,
  instructorActions,
  studentActions,
  minutes,
});

export async function seedBriefings(ctx: SeedContext): Promise<void> {
  const { t, schoolId } = ctx;
  const items = await sequelize.query<{ id: string; code: string }>(`SELECT id, code FROM syllabus_items WHERE revision_id = :r`, {
    replacements: { r: ctx.revisionId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  const item = (code: string) => items.find((i) => i.code === code)!.id;
  const demos = await sequelize.query<{ name: string; revisionId: string }>(
    `SELECT name, current_revision_id AS "revisionId" FROM demos WHERE school_id = :s AND deleted_at IS NULL AND current_revision_id IS NOT NULL ORDER BY created_at`,
    { replacements: { s: schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  const demo = (name: string) => demos.filter((d) => d.name === name).map((d) => d.revisionId);
  const tomasz: CurrentUser = { id: ctx.people.instructor, name: "Tomasz Varga", schoolId, roles: ["instructor"] };
  const base = (over: Partial<BriefingInput>): BriefingInput => ({
    courseId: ctx.courseId,
    syllabusRevisionId: ctx.revisionId,
    title: "",
    objective: "",
    syllabusItemIds: [],
    elements: [],
    equipment: "Whiteboard, coloured pens, the classroom projector.",
    demoRevisionIds: [],
    completionStandard: "",
    handoutIds: [],
    changeNote: "First issue",
    ...over,
  });

  const sources = await saveBriefingRevision(
    tomasz,
    null,
    base({
      title: "Where drag comes from",
      objective:
        "Name the parts of drag, and explain why zero-lift drag rises and lift-dependent drag falls as speed rises in level flight.",
      syllabusItemIds: [item("AER-01"), item("AER-02")],
      elements: [
        el(
          "Feel the air",
          "Ask who has held a hand out of a car window; compare walking and motorway speed.",
          "Describe the force and guess how it grows with speed.",
          5,
        ),
        el(
          "Skin friction, form and interference",
          "Sketch a wing root and a strut; mark where each kind of zero-lift drag arises.",
          "Give one example of each on the school's trainer.",
          15,
        ),
        el(
          "Twice the speed, four times the drag",
          "Write D = ½ρV²·S·CD0 and double V on the board.",
          "Work out the drag at 60, 90 and 120 kt from the 60 kt value.",
          10,
        ),
        el(
          "Lift costs drag",
          "Show downwash and the tilted lift vector; relate CL to speed in level flight.",
          "Explain why lift-dependent drag is largest when slow.",
          15,
        ),
        el("Check of understanding", "Ask each student one question on the board sketch.", "Answer in their own words.", 5),
      ],
      completionStandard:
        "Names the three parts of zero-lift drag with an example each, and states how each drag part changes when the speed doubles in level flight.",
    }),
    t,
  );

  const vmd = await saveBriefingRevision(
    tomasz,
    null,
    base({
      title: "The drag curve and Vmd",
      objective: "Build the total-drag curve from its two parts and locate Vmd, the speed of best lift-to-drag ratio.",
      syllabusItemIds: [item("AER-03")],
      elements: [
        el(
          "Two curves on one graph",
          "Plot zero-lift and lift-dependent drag against speed.",
          "Predict where the sum is smallest before it is drawn.",
          10,
        ),
        el("Add them up", "Draw the total-drag curve point by point.", "Mark the bottom of the bucket and read off Vmd.", 10),
        el(
          "Vmd in Curve Lab",
          "Open the demo; change the mass and show Vmd move.",
          "Make a call for Vmd, then compare with the reveal.",
          15,
        ),
        el(
          "Why it matters",
          "Link Vmd to best glide and to flying on the back of the drag curve.",
          "Say which side of Vmd the approach is flown on.",
          5,
        ),
      ],
      demoRevisionIds: demo("Why drag has a bucket"),
      completionStandard:
        "Marks Vmd on an unlabelled drag curve, states that the two drag parts are equal there, and says which way a lower mass moves it.",
    }),
    t,
  );
  const pdf = await dragCurveHandoutPdf();
  await addHandout(tomasz, vmd.briefingId, { fileName: "drag-curve-and-vmd.pdf", contentType: "application/pdf", bytes: pdf }, t);

  await saveBriefingRevision(
    tomasz,
    null,
    base({
      title: "Slower than Vmd: speed stability",
      objective: "Explain why speeds below Vmd are speed-unstable at constant thrust, and what that means on the approach.",
      syllabusItemIds: [item("AER-04"), item("AER-05")],
      elements: [
        el(
          "A gust on each side",
          "On the drag curve, disturb the speed above and below Vmd.",
          "Say whether drag rises or falls and where the speed goes next.",
          15,
        ),
        el(
          "Power required",
          "Multiply drag by speed to get the power curve; mark Vmp below Vmd.",
          "Explain why Vmp gives the longest endurance.",
          15,
        ),
        el(
          "On the approach",
          "Discuss holding a speed below Vmd with power, not only the elevator.",
          "Describe what to do when the speed decays on final.",
          10,
        ),
      ],
      demoRevisionIds: demo("Heavy vs light: where Vmd moves"),
      completionStandard:
        "Predicts the response to a speed disturbance on either side of Vmd and links it to power handling on the approach.",
    }),
    t,
  );

  // Kestrel: the Vmd briefing due in three days (mailed, through the normal path) and the
  // drag-sources briefing that was due two days ago, done by some.
  const chief: CurrentUser = { id: ctx.people.chief, name: "Imogen Farrant", schoolId, roles: ["chief", "instructor"] };
  await createAssignments(
    chief,
    {
      kind: "briefing",
      briefingId: vmd.briefingId,
      cohortId: ctx.cohorts.a,
      dueOn: ctx.day(3),
      note: "Read it before Thursday's session.",
    },
    t,
  );
  const past = await Assignment.create(
    {
      schoolId,
      kind: "briefing",
      briefingId: sources.briefingId,
      demoId: null,
      cohortId: ctx.cohorts.a,
      studentId: null,
      dueOn: ctx.day(-2),
      note: "",
      assignedBy: ctx.people.instructor,
      createdAt: new Date(`${ctx.day(-9)}T09:00:00Z`),
    },
    { transaction: t },
  );
  const kestrel = await sequelize.query<{ id: string }>(
    `SELECT m.student_id AS id FROM cohort_memberships m JOIN people p ON p.id = m.student_id WHERE m.cohort_id = :c AND m.to_date IS NULL ORDER BY p.name`,
    { replacements: { c: ctx.cohorts.a }, type: QueryTypes.SELECT, transaction: t },
  );
  for (const [i, s] of kestrel.entries()) {
    if (i % 3 === 2) continue; // a third have not done it: overdue
    await AssignmentCompletion.create(
      { assignmentId: past.id, studentId: s.id, completedAt: new Date(`${ctx.day(-3)}T18:30:00Z`) },
      { transaction: t },
    );
  }
}
