import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, actAs } from "@/tests/helpers/factories";
import { createBriefingAction, reviseBriefingAction } from "@/app/(app)/briefings/actions";
import { createSyllabusRevisionAction, moveEnrolmentAction } from "@/app/(app)/syllabus/actions";
import { getBriefing } from "@/db/access/briefings/read-briefing";
import { listBriefings } from "@/db/access/briefings/list";
import { getSyllabusRevision } from "@/db/access/syllabus/revisions";
import { DEMO_STAGES } from "@/db/seed/scenario";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));
afterAll(async () => {
  actAs(null);
  await closeDb();
});

type School = Awaited<ReturnType<typeof makeSchool>>;

async function itemIds(s: School, codes: string[]) {
  const rows = await sequelize.query<{ id: string; code: string }>(
    `SELECT id, code FROM syllabus_items WHERE revision_id = :rev AND code IN (:codes)`,
    {
      replacements: { rev: s.revision.id, codes },
      type: QueryTypes.SELECT,
    },
  );
  return codes.map((c) => rows.find((r) => r.code === c)!.id);
}

function draft(s: School, items: string[], over: Record<string, unknown> = {}) {
  return {
    courseId: s.course.id,
    syllabusRevisionId: s.revision.id,
    title: "Drag and the minimum-drag speed",
    objective: "Build the total-drag curve and find Vmd.",
    syllabusItemIds: items,
    elements: [
      { title: "Two kinds of drag", instructorActions: "Sketch both drag curves.", studentActions: "Label each curve.", minutes: 15 },
      { title: "Where they meet", instructorActions: "Add the curves.", studentActions: "Find the minimum.", minutes: 20 },
    ],
    equipment: "Whiteboard",
    demoRevisionIds: [],
    completionStandard: "Each student marks Vmd on an unlabelled curve.",
    handoutIds: [],
    changeNote: "First issue",
    ...over,
  };
}

const count = async (sql: string, replacements: Record<string, unknown>) =>
  (await sequelize.query<{ n: number }>(sql, { replacements, type: QueryTypes.SELECT }))[0]!.n;

describe("briefing revisions", () => {
  it("editing writes the next revision and leaves the earlier one exactly as it was", async () => {
    const s = await makeSchool("brev");
    const items = await itemIds(s, ["AER-01", "AER-03"]);
    actAs(s.as.instructor);
    const first = await createBriefingAction(draft(s, items));
    if (!first.ok) throw new Error(first.message);
    expect(first.data.number).toBe(1);

    const second = await reviseBriefingAction({
      ...draft(s, [items[1]!], { completionStandard: "Each student computes Vmd for the club aircraft.", changeNote: "Tighter standard" }),
      briefingId: first.data.briefingId,
    });
    if (!second.ok) throw new Error(second.message);
    expect(second.data).toMatchObject({ number: 2, created: true });

    const v1 = await getBriefing(s.as.instructor, first.data.briefingId, 1);
    const v2 = await getBriefing(s.as.instructor, first.data.briefingId);
    expect(v1!.revision.completionStandard).toBe("Each student marks Vmd on an unlabelled curve.");
    expect(v1!.items.map((i) => i.code)).toEqual(["AER-01", "AER-03"]);
    expect(v2!.revision.number).toBe(2);
    expect(v2!.currentNumber).toBe(2);
    expect(v2!.items.map((i) => i.code)).toEqual(["AER-03"]);
    expect(v2!.revisions.map((r) => r.number)).toEqual([2, 1]);

    // Saving the same content again writes nothing new.
    const same = await reviseBriefingAction({
      ...draft(s, [items[1]!], { completionStandard: "Each student computes Vmd for the club aircraft.", changeNote: "no change" }),
      briefingId: first.data.briefingId,
    });
    expect(same.ok && same.data).toMatchObject({ number: 2, created: false });
    expect(await count(`SELECT count(*)::int AS n FROM briefing_revisions WHERE briefing_id = :b`, { b: first.data.briefingId })).toBe(2);
  });

  it("the database refuses to change a briefing revision in place", async () => {
    const s = await makeSchool("bimm");
    actAs(s.as.instructor);
    const r = await createBriefingAction(draft(s, []));
    if (!r.ok) throw new Error(r.message);
    await expect(
      sequelize.query(`UPDATE briefing_revisions SET title = 'changed' WHERE id = :id`, { replacements: { id: r.data.revisionId } }),
    ).rejects.toThrow(/permission denied|immutable/);
  });

  it("refuses items from another syllabus revision, a student writer, and bad fields, writing nothing", async () => {
    const s = await makeSchool("bbad");
    const other = await makeSchool("bbad2");
    const foreign = await itemIds(other, ["AER-01"]);
    actAs(s.as.instructor);
    const before = await count(`SELECT count(*)::int AS n FROM briefings WHERE school_id = :s`, { s: s.school.id });
    const r = await createBriefingAction(draft(s, foreign));
    expect(r).toMatchObject({ ok: false, status: 400 });
    expect(r).toMatchObject({ field: "syllabusItemIds", message: expect.stringMatching(/^Syllabus items: /) });
    const bad = await createBriefingAction(
      draft(s, [], { elements: [{ title: "x", instructorActions: "y", studentActions: "z", minutes: 0 }] }),
    );
    expect(bad).toMatchObject({ ok: false, status: 400 });
    expect(!bad.ok && bad.fieldErrors?.["elements.0.minutes"]).toBeTruthy();
    actAs(s.as.student);
    expect(await createBriefingAction(draft(s, []))).toMatchObject({ ok: false, status: 403 });
    expect(await count(`SELECT count(*)::int AS n FROM briefings WHERE school_id = :s`, { s: s.school.id })).toBe(before);
  });

  it("a student reads only briefings assigned to them; staff of another school see nothing", async () => {
    const s = await makeSchool("bvis");
    const other = await makeSchool("bvis2");
    actAs(s.as.instructor);
    const r = await createBriefingAction(draft(s, []));
    if (!r.ok) throw new Error(r.message);
    const q = { sort: "updated", dir: "desc", page: 1, pageSize: 20 } as const;
    expect((await listBriefings(s.as.student, q)).total).toBe(0);
    expect(await getBriefing(s.as.student, r.data.briefingId)).toBeNull();
    await sequelize.query(
      `INSERT INTO assignments (school_id, kind, briefing_id, cohort_id, due_on, assigned_by) VALUES (:school, 'briefing', :b, :c, '2099-01-01', :by)`,
      { replacements: { school: s.school.id, b: r.data.briefingId, c: s.cohorts.a.id, by: s.people.instructor.id } },
    );
    expect((await listBriefings(s.as.student, q)).rows.map((x) => x.id)).toEqual([r.data.briefingId]);
    expect(await getBriefing(s.as.student, r.data.briefingId)).not.toBeNull();
    expect(await getBriefing(s.as.otherStudent, r.data.briefingId)).toBeNull();
    expect(await getBriefing(other.as.chief, r.data.briefingId)).toBeNull();
    expect((await listBriefings(other.as.chief, q)).rows.map((x) => x.id)).not.toContain(r.data.briefingId);
  });
});

describe("syllabus revisions", () => {
  it("a syllabus revision that enrolments or briefing revisions refer to cannot be changed or deleted", async () => {
    const s = await makeSchool("sfrz");
    await expect(
      sequelize.query(`UPDATE syllabus_items SET completion_standard = 'easier' WHERE revision_id = :r`, {
        replacements: { r: s.revision.id },
      }),
    ).rejects.toThrow(/referenced by enrolments/);
    await expect(
      sequelize.query(`DELETE FROM syllabus_stages WHERE revision_id = :r`, { replacements: { r: s.revision.id } }),
    ).rejects.toThrow(/referenced by enrolments/);

    // A fresh revision that nothing refers to yet is made by the chief...
    actAs(s.as.chief);
    const stages = DEMO_STAGES.map((st) => ({
      ...st,
      items: st.items.map((i) => (i.code === "AER-03" ? { ...i, completionStandard: "Computes Vmd within 2 kt for two masses." } : i)),
    }));
    const made = await createSyllabusRevisionAction({
      courseId: s.course.id,
      approvedOn: "2026-10-01",
      effectiveFrom: "",
      changeNote: "Tighter AER-03",
      stages,
    });
    if (!made.ok) throw new Error(made.message);
    expect(made.data.number).toBe(2);
    const v2 = await getSyllabusRevision(s.school.id, made.data.id);
    expect(v2!.stages[0]!.items.find((i) => i.code === "AER-03")!.completionStandard).toBe("Computes Vmd within 2 kt for two masses.");
    // ...the first revision is untouched, and every enrolment stays on it.
    const v1 = await getSyllabusRevision(s.school.id, s.revision.id);
    expect(v1!.stages[0]!.items.find((i) => i.code === "AER-03")!.completionStandard).toBe(DEMO_STAGES[0]!.items[2]!.completionStandard);
    expect(await count(`SELECT count(*)::int AS n FROM enrolments WHERE revision_id = :r`, { r: made.data.id })).toBe(0);

    // Once a briefing revision refers to revision 2, it is frozen too.
    const item = (
      await sequelize.query<{ id: string }>(`SELECT id FROM syllabus_items WHERE revision_id = :r AND code = 'AER-03'`, {
        replacements: { r: made.data.id },
        type: QueryTypes.SELECT,
      })
    )[0]!.id;
    actAs(s.as.instructor);
    const b = await createBriefingAction(draft(s, [item], { syllabusRevisionId: made.data.id }));
    expect(b.ok).toBe(true);
    await expect(
      sequelize.query(`UPDATE syllabus_items SET title = 'renamed' WHERE id = :i`, { replacements: { i: item } }),
    ).rejects.toThrow(/referenced by briefing revisions/);
  });

  it("a revision that only another area's record refers to (a make-up item) is frozen too", async () => {
    const s = await makeSchool("sfrz2");
    actAs(s.as.chief);
    const made = await createSyllabusRevisionAction({
      courseId: s.course.id,
      approvedOn: null,
      effectiveFrom: null,
      changeNote: "Second issue",
      stages: DEMO_STAGES,
    });
    if (!made.ok) throw new Error(made.message);
    const item = (
      await sequelize.query<{ id: string }>(`SELECT id FROM syllabus_items WHERE revision_id = :r AND code = 'AER-02'`, {
        replacements: { r: made.data.id },
        type: QueryTypes.SELECT,
      })
    )[0]!.id;
    // nothing refers to revision 2 yet: it may still be corrected
    await sequelize.query(`UPDATE syllabus_items SET title = 'Lift-dependent (induced) drag' WHERE id = :i`, { replacements: { i: item } });
    await sequelize.query(
      `INSERT INTO makeup_items (school_id, student_id, syllabus_item_id, source_kind, source_id) VALUES (:school, :student, :item, 'absence', gen_random_uuid())`,
      { replacements: { school: s.school.id, student: s.people.students[0]!.id, item } },
    );
    await expect(
      sequelize.query(`UPDATE syllabus_items SET completion_standard = 'easier' WHERE id = :i`, { replacements: { i: item } }),
    ).rejects.toThrow(/referenced by make-up items/);
  });

  it("the chief moves one enrolment to another revision of the same course; others stay", async () => {
    const s = await makeSchool("smov");
    const other = await makeSchool("smov2");
    actAs(s.as.chief);
    const made = await createSyllabusRevisionAction({
      courseId: s.course.id,
      approvedOn: null,
      effectiveFrom: null,
      changeNote: "Second issue",
      stages: DEMO_STAGES,
    });
    if (!made.ok) throw new Error(made.message);
    const [e] = await sequelize.query<{ id: string }>(`SELECT id FROM enrolments WHERE student_id = :s`, {
      replacements: { s: s.people.students[0]!.id },
      type: QueryTypes.SELECT,
    });
    expect(await moveEnrolmentAction({ enrolmentId: e!.id, revisionId: made.data.id })).toMatchObject({
      ok: true,
      data: { moved: true, revisionNumber: 2 },
    });
    expect(await count(`SELECT count(*)::int AS n FROM enrolments WHERE revision_id = :r`, { r: made.data.id })).toBe(1);
    expect(await count(`SELECT count(*)::int AS n FROM enrolments WHERE revision_id = :r`, { r: s.revision.id })).toBe(5);
    // Not to another course's revision, and not by an instructor.
    expect(await moveEnrolmentAction({ enrolmentId: e!.id, revisionId: other.revision.id })).toMatchObject({ ok: false, status: 400 });
    actAs(s.as.instructor);
    expect(await moveEnrolmentAction({ enrolmentId: e!.id, revisionId: s.revision.id })).toMatchObject({ ok: false, status: 403 });
    expect(
      await createSyllabusRevisionAction({
        courseId: s.course.id,
        approvedOn: null,
        effectiveFrom: null,
        changeNote: "x",
        stages: DEMO_STAGES,
      }),
    ).toMatchObject({
      ok: false,
      status: 403,
    });
  });

  it("refuses a revision with a repeated item code, naming the field, and writes nothing", async () => {
    const s = await makeSchool("sdup");
    actAs(s.as.chief);
    const stages = [{ code: "AER", title: "Drag", items: [DEMO_STAGES[0]!.items[0]!, DEMO_STAGES[0]!.items[0]!] }];
    const r = await createSyllabusRevisionAction({
      courseId: s.course.id,
      approvedOn: null,
      effectiveFrom: null,
      changeNote: "dup",
      stages,
    });
    expect(r).toMatchObject({ ok: false, status: 400 });
    expect(r).toMatchObject({ field: "stages", message: expect.stringMatching(/^Stages: item code AER-01 is used twice/) });
    expect(await count(`SELECT count(*)::int AS n FROM syllabus_revisions WHERE course_id = :c`, { c: s.course.id })).toBe(1);
  });
});
