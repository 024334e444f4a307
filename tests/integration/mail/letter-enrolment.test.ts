// The Weekly letter is about the course the student is on now: with two active enrolments, the
// newest (the view active_enrolments), the same course their Progress map shows, with the hours
// credited on that course only.
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { progressFor } from "@/db/access/records/progress-map";
import { runDueWork } from "@/lib/mail/producers";
import { closeDb, makeSchool } from "../../helpers/factories";
import { makeBriefing, makeSession } from "./helpers";

jest.setTimeout(60_000);

afterAll(closeDb);

test("a student in two courses: the letter names the newer course, as the Progress map does, with that course's hours", async () => {
  const s = await makeSchool("mail-two-courses");
  const student = s.people.students[0]!; // linked to the sponsor by makeSchool (hours shared)
  const [second] = await sequelize.query<{ id: string }>(
    `INSERT INTO courses (school_id, code, title, min_ground_minutes) VALUES (:s, :code, 'Night rating ground course', 1200) RETURNING id`,
    { replacements: { s: s.school.id, code: `NR-${s.tag}` }, type: QueryTypes.SELECT },
  );
  const [rev] = await sequelize.query<{ id: string }>(
    `INSERT INTO syllabus_revisions (course_id, number, approved_on, effective_from) VALUES (:c, 1, '2026-10-01', '2026-10-01') RETURNING id`,
    { replacements: { c: second!.id }, type: QueryTypes.SELECT },
  );
  // enrolled on the first course on 2026-08-30 (makeSchool); on the second, later
  await sequelize.query(
    `INSERT INTO enrolments (student_id, course_id, revision_id, enrolled_on, status) VALUES (:st, :c, :r, '2026-10-15', 'active')`,
    { replacements: { st: student.id, c: second!.id, r: rev!.id } },
  );

  // credited time on each course: 463 minutes (7.7 h) on the first, the week before; 90 (1.5 h) on the second, this week
  const b = await makeBriefing(s, "Night circuits: lighting and references");
  const log = async (courseId: string, minutes: number, at: string) => {
    const sessionId = await makeSession(s, b, new Date(at), [student.id], "Room 2");
    await sequelize.query(
      `INSERT INTO ground_log_entries (school_id, student_id, course_id, session_id, briefing_revision_id, instructor_id, status, credited_minutes, occurred_at, recorded_by)
       VALUES (:school, :st, :course, :session, :rev, :i, 'attended', :m, :at, :i)`,
      {
        replacements: {
          school: s.school.id,
          st: student.id,
          course: courseId,
          session: sessionId,
          rev: b.revisionId,
          i: s.people.instructor.id,
          m: minutes,
          at,
        },
      },
    );
  };
  await log(s.course.id, 463, "2026-11-24T10:00:00Z");
  await log(second!.id, 90, "2026-12-09T10:00:00Z");

  const map = await progressFor(s.as.student, student.id);
  expect(map.student.courseTitle).toBe("Night rating ground course");
  expect(map.ground).toEqual({ minutes: 90, minimumMinutes: 1200 });

  await runDueWork(new Date("2026-12-11T17:30:00Z")); // Friday after 17:00 in London: letter day
  const [letter] = await sequelize.query<{ body_text: string; body_html: string }>(
    `SELECT body_text, body_html FROM outbox WHERE idempotency_key = :k`,
    { replacements: { k: `weekly.letter:${s.people.sponsor.id}:${student.id}:2026-12-07` }, type: QueryTypes.SELECT },
  );
  expect(letter).toBeDefined();
  for (const body of [letter!.body_text, letter!.body_html]) {
    expect(body).toContain(`1.5 h of the 20 h ${map.student.courseTitle} minimum`);
    expect(body).not.toContain("Test ground course"); // the older enrolment's course
    expect(body).not.toContain("7.7 h"); // the older course's hours
    expect(body).not.toContain("9.2 h"); // both courses' hours added up
    expect(body).not.toContain("of 35 h"); // the older course's minimum
  }
});
