import type { SeedContext } from "./extensions";
import { sequelize } from "../index";

/**
 * Mail's demo data: a note from the lead instructor for the demo student's sponsor, so the next
 * Weekly letter (the school's letter day from 17:00) carries one.
 */
export async function seedMail(ctx: SeedContext): Promise<void> {
  const student = ctx.students["student@chalkwing.test"];
  if (!student) return;
  await sequelize.query(`INSERT INTO sponsor_notes (school_id, student_id, author_id, body) VALUES (:s, :st, :a, :b)`, {
    replacements: {
      s: ctx.schoolId,
      st: student,
      a: ctx.people.instructor,
      b: "A strong week: clear answers on why the drag curve has a minimum, and good questions about flying below Vmd on the approach.",
    },
    transaction: ctx.t,
  });
}
