import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import type { makeSchool } from "@/tests/helpers/factories";

type School = Awaited<ReturnType<typeof makeSchool>>;

/** A briefing with one revision covering the given syllabus item codes (written straight to the briefings tables). */
export async function makeBriefing(
  s: School,
  title: string,
  itemCodes: string[],
): Promise<{ id: string; revisionId: string; itemIds: string[] }> {
  return sequelize.transaction(async (t) => {
    const [b] = await sequelize.query<{ id: string }>(
      `INSERT INTO briefings (school_id, course_id, owner_id) VALUES (:s, :c, :o) RETURNING id`,
      { replacements: { s: s.school.id, c: s.course.id, o: s.people.instructor.id }, type: QueryTypes.SELECT, transaction: t },
    );
    const [r] = await sequelize.query<{ id: string }>(
      `INSERT INTO briefing_revisions (briefing_id, number, title, objective, completion_standard, syllabus_revision_id, created_by)
       VALUES (:b, 1, :title, 'Objective of the test briefing', 'Standard', :rev, :o) RETURNING id`,
      { replacements: { b: b!.id, title, rev: s.revision.id, o: s.people.instructor.id }, type: QueryTypes.SELECT, transaction: t },
    );
    const items = await sequelize.query<{ id: string }>(
      `SELECT id FROM syllabus_items WHERE revision_id = :rev AND code = ANY(ARRAY[:codes]::text[]) ORDER BY code`,
      { replacements: { rev: s.revision.id, codes: itemCodes.length ? itemCodes : ["-"] }, type: QueryTypes.SELECT, transaction: t },
    );
    for (const i of items) {
      await sequelize.query(`INSERT INTO briefing_revision_items (briefing_revision_id, syllabus_item_id) VALUES (:r, :i)`, {
        replacements: { r: r!.id, i: i.id },
        transaction: t,
      });
    }
    await sequelize.query(`UPDATE briefings SET current_revision_id = :r WHERE id = :b`, {
      replacements: { r: r!.id, b: b!.id },
      transaction: t,
    });
    return { id: b!.id, revisionId: r!.id, itemIds: items.map((i) => i.id) };
  });
}

export async function count(sql: string, replacements: Record<string, unknown>): Promise<number> {
  const [row] = await sequelize.query<{ n: number }>(sql, { replacements, type: QueryTypes.SELECT });
  return row!.n;
}

/** Puts rooms of these names on the school's list (the Timetable books only listed rooms). */
export async function addRooms(s: School, names: string[]): Promise<void> {
  await sequelize.query(
    `INSERT INTO rooms (school_id, name) SELECT :s, unnest(ARRAY[:names]::text[]) ON CONFLICT (school_id, name_key) DO NOTHING`,
    { replacements: { s: s.school.id, names } },
  );
}
