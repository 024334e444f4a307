import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, actAs, closeDb } from "@/tests/helpers/factories";
import { studentWeekFor } from "@/db/access/today/student-week";
import { fixedClock, resetClock } from "@/lib/clock";

afterEach(resetClock);
afterAll(async () => {
  actAs(null);
  await closeDb();
});

const q = <T extends object>(sql: string, replacements: Record<string, unknown>) =>
  sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });

describe("This week: am I on track?", () => {
  it("answers from the planned end, the open make-ups and the last outcomes, and lists the make-ups with what to do next", async () => {
    const s = await makeSchool("ontrack");
    const student = s.people.students[0]!;
    const [item] = await q<{ id: string; code: string }>(
      `SELECT i.id, i.code FROM syllabus_items i JOIN syllabus_stages st ON st.id = i.stage_id WHERE st.revision_id = :r ORDER BY st.position, i.position LIMIT 1`,
      { r: s.revision.id },
    );
    // enrolled 30 Aug 2026; planned end 28 Nov 2026 (90 days): on 14 Oct, 45 days in, half of 35 h is due
    await sequelize.query(`UPDATE enrolments SET planned_end_on = '2026-11-28' WHERE student_id = :id`, {
      replacements: { id: student.id },
    });
    fixedClock(new Date("2026-10-14T09:00:00Z"));
    const week = await studentWeekFor(s.as.student);
    expect(week!.plannedEndOn).toBe("2026-11-28");
    expect(week!.assessment.standing).toBe("behind");
    expect(week!.assessment.line).toMatch(
      /^Behind: 0 h credited, the pace to finish by Sat 28 Nov 2026 needs 17\.5 h by now; \d+ items left before the \S+ stage check\.$/,
    );
    expect(week!.makeups).toEqual([]);

    // on the enrolment day nothing is due yet: on track
    fixedClock(new Date("2026-08-30T09:00:00Z"));
    expect((await studentWeekFor(s.as.student))!.assessment.standing).toBe("on-track");

    // an open make-up and an item last marked Not yet make it behind, with the reasons; the make-up is on Today
    await sequelize.query(
      `INSERT INTO makeup_items (school_id, student_id, syllabus_item_id, source_kind, source_id) VALUES (:s, :st, :i, 'stage_check', gen_random_uuid())`,
      { replacements: { s: s.school.id, st: student.id, i: item!.id } },
    );
    const [enr] = await q<{ id: string }>(`SELECT id FROM enrolments WHERE student_id = :id`, { id: student.id });
    const [check] = await q<{ id: string }>(
      `INSERT INTO oral_checks (school_id, student_id, enrolment_id, instructor_id, level_shown, duration_minutes, occurred_at, recorded_at, outcome, outcome_rule, item_outcomes)
       VALUES (:s, :st, :e, :ins, 'understanding', 20, '2026-08-29T10:00:00Z', '2026-08-29T10:00:00Z', 'not_yet', '{}'::jsonb, '[]'::jsonb) RETURNING id`,
      { s: s.school.id, st: student.id, e: enr!.id, ins: s.people.instructor.id },
    );
    await sequelize.query(
      `INSERT INTO oral_check_items (check_id, syllabus_item_id) VALUES (:c, :i);
       INSERT INTO oral_check_questions (check_id, position, syllabus_item_id, item_code, question_text, outcome) VALUES (:c, 1, :i, :code, 'Why?', 'not_yet')`,
      { replacements: { c: check!.id, i: item!.id, code: item!.code } },
    );
    const after = (await studentWeekFor(s.as.student))!;
    expect(after.assessment.standing).toBe("behind");
    expect(after.assessment.reasons).toEqual(["1 make-up open", `${item!.code} last marked Not yet`]);
    expect(after.makeups).toMatchObject([{ itemCode: item!.code, state: "open" }]);
    expect(after.next.map((n) => n.kind)).toEqual(["makeup", "debrief"]);
    expect(after.next[0]!.href).toBe("/ground-log#makeup-title");
    expect(after.next[1]!.href).toBe(`/progress/${student.id}#checks-title`);

    // a cohort-mate's week shows none of it
    const mate = (await studentWeekFor({ ...s.as.student, id: s.people.students[1]!.id, name: "Student 2" }))!;
    expect(mate.makeups).toEqual([]);
    expect(mate.assessment.reasons).toEqual([]);
  });

  it("refuses a caller without a student's Today", async () => {
    const s = await makeSchool("ontrack2");
    await expect(studentWeekFor(s.as.sponsor)).rejects.toMatchObject({ status: 403 });
  });
});
