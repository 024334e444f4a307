import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, actAs } from "@/tests/helpers/factories";
import { createBriefingAction } from "@/app/(app)/briefings/actions";
import { addHandout, getHandoutFile } from "@/db/access/briefings/handouts";
import { canViewBriefing } from "@/db/access/briefings/visibility";
import { listBriefings } from "@/db/access/briefings/list";
import { briefingListQuery } from "@/lib/briefings/schema";
import type { CurrentUser } from "@/lib/auth/session";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));
afterAll(async () => {
  actAs(null);
  await closeDb();
});

type School = Awaited<ReturnType<typeof makeSchool>>;

async function briefing(s: School, title: string, codes: string[], minutes: number[]) {
  const items = await sequelize.query<{ id: string }>(`SELECT id FROM syllabus_items WHERE revision_id = :r AND code IN (:codes)`, {
    replacements: { r: s.revision.id, codes },
    type: QueryTypes.SELECT,
  });
  actAs(s.as.instructor);
  const r = await createBriefingAction({
    courseId: s.course.id,
    syllabusRevisionId: s.revision.id,
    title,
    objective: `About ${title}.`,
    syllabusItemIds: items.map((i) => i.id),
    elements: minutes.map((m, i) => ({ title: `Part ${i + 1}`, instructorActions: "Explain.", studentActions: "Answer.", minutes: m })),
    equipment: "",
    demoRevisionIds: [],
    completionStandard: "Answers correctly.",
    handoutIds: [],
    changeNote: "",
  });
  if (!r.ok) throw new Error(r.message);
  return r.data;
}

/** A session of the Timetable's shape (per the cross-area contract), written directly. */
async function session(
  s: School,
  b: { briefingId: string; revisionId: string },
  opts: { cohortId?: string; studentId?: string; startsAt: string; room: string },
) {
  const [row] = await sequelize.query<{ id: string }>(
    `INSERT INTO training_sessions (school_id, briefing_id, briefing_revision_id, starts_at, ends_at, room, instructor_id, cohort_id, created_by)
     VALUES (:school, :b, :r, :start::timestamptz, :start::timestamptz + interval '1 hour', :room, :i, :cohort, :i) RETURNING id`,
    {
      replacements: {
        school: s.school.id,
        b: b.briefingId,
        r: b.revisionId,
        start: opts.startsAt,
        room: opts.room,
        i: s.people.instructor2.id,
        cohort: opts.cohortId ?? null,
      },
      type: QueryTypes.SELECT,
    },
  );
  if (opts.studentId) {
    await sequelize.query(
      `INSERT INTO session_attendees (session_id, student_id, via, starts_at, ends_at, status)
       VALUES (:sid, :st, 'individual', :start::timestamptz, :start::timestamptz + interval '1 hour', 'scheduled')`,
      { replacements: { sid: row!.id, st: opts.studentId, start: opts.startsAt } },
    );
  }
  return row!.id;
}

describe("who may read a briefing", () => {
  it("a student reads a briefing scheduled for their cohort or for them alone; a cancelled session no longer counts", async () => {
    const s = await makeSchool("bsched");
    const b = await briefing(s, "Configuration and drag", ["PRF-03"], [30]);
    const pdf = Buffer.from("%PDF-1.4\n% handout\n");
    const { handoutId } = await sequelize.transaction((t) =>
      addHandout(s.as.instructor, b.briefingId, { fileName: "config.pdf", contentType: "application/pdf", bytes: pdf }, t),
    );

    const cohortB = s.people.students[3]!;
    const loneA = s.people.students[1]!;
    const viewer = (p: { id: string }): CurrentUser => ({ id: p.id, name: "Student", schoolId: s.school.id, roles: ["student"] });
    expect(await canViewBriefing(viewer(cohortB), b.briefingId)).toBe(false);
    expect(await getHandoutFile(viewer(cohortB), handoutId)).toEqual({ status: "forbidden" });

    const sid = await session(s, b, { cohortId: s.cohorts.b.id, startsAt: "2026-11-02T09:00:00Z", room: "Room 1" });
    expect(await canViewBriefing(viewer(cohortB), b.briefingId)).toBe(true);
    expect(await getHandoutFile(viewer(cohortB), handoutId)).toMatchObject({ status: "ok", fileName: "config.pdf" });
    expect(await canViewBriefing(viewer(loneA), b.briefingId)).toBe(false);

    await session(s, b, { studentId: loneA.id, startsAt: "2026-11-03T09:00:00Z", room: "Room 2" });
    expect(await canViewBriefing(viewer(loneA), b.briefingId)).toBe(true);
    // the rest of cohort A still may not
    expect(await canViewBriefing(viewer(s.people.students[0]!), b.briefingId)).toBe(false);

    await sequelize.query(`UPDATE training_sessions SET status = 'cancelled', cancel_reason = 'room flooded' WHERE id = :id`, {
      replacements: { id: sid },
    });
    expect(await canViewBriefing(viewer(cohortB), b.briefingId)).toBe(false);
    // a sponsor never reads briefings
    expect(
      await canViewBriefing({ id: s.people.sponsor.id, name: "Sponsor", schoolId: s.school.id, roles: ["sponsor"] }, b.briefingId),
    ).toBe(false);
  });
});

describe("the briefings list", () => {
  it("filters by text and syllabus item code, sorts by total minutes, and pages on the server", async () => {
    const s = await makeSchool("blist");
    await briefing(s, "Drag sources", ["AER-01", "AER-02"], [20, 25]);
    await briefing(s, "The Vmd bucket", ["AER-03"], [10]);
    await briefing(s, "Gliding for range", ["PRF-02"], [15, 15, 15]);
    const q = (raw: Record<string, string>) => listBriefings(s.as.chief, briefingListQuery.parse(raw));

    const byMinutes = (await q({ sort: "minutes", dir: "asc" })).rows;
    expect(byMinutes.map((r) => r.minutes)).toEqual([10, 45, 45]);
    expect(byMinutes[0]!.title).toBe("The Vmd bucket");
    expect((await q({ sort: "minutes", dir: "desc" })).rows.map((r) => r.minutes)).toEqual([45, 45, 10]);
    expect((await q({ item: "AER" })).rows.map((r) => r.title).sort()).toEqual(["Drag sources", "The Vmd bucket"]);
    expect((await q({ item: "aer-03" })).rows.map((r) => r.title)).toEqual(["The Vmd bucket"]);
    expect((await q({ q: "glid" })).rows.map((r) => r.title)).toEqual(["Gliding for range"]);
    // "%" in the search text is a character, not a wildcard
    expect((await q({ q: "%" })).total).toBe(0);
    const page2 = await q({ sort: "title", dir: "asc", pageSize: "2", page: "2" });
    expect(page2).toMatchObject({ total: 3, page: 2, pageSize: 2 });
    expect(page2.rows.map((r) => r.title)).toEqual(["The Vmd bucket"]);
    expect((await q({ sort: "title", dir: "desc" })).rows.map((r) => r.itemCodes)).toEqual([["AER-03"], ["PRF-02"], ["AER-01", "AER-02"]]);
  });
});
