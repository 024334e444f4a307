jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, actAs, TEST_PASSWORD } from "@/tests/helpers/factories";
import { changeQualification } from "@/tests/helpers/qualifications";
import { endorseAction, recordResultAction, completeRemedialAction, saveAuthoritySettingsAction } from "@/app/(app)/endorsements/actions";
import { endorse } from "@/db/access/endorsements/endorse";
import { EndorsementRefusal, type EndorsementReason } from "@/db/access/endorsements/preconditions";
import { passRateByCourse } from "@/db/access/endorsements/pass-rate";
import { endorsementChoices, searchEndorsementChoices } from "@/db/access/endorsements/log";
import { itemsOfRevision } from "@/db/access/records/items";
import { withdrawSignOff } from "@/db/access/records/sign-offs";
import { dateInZone } from "@/lib/time";
import type { CurrentUser } from "@/lib/auth/session";
import { sign, auditCount, type School } from "../records/helpers";
import { completeCourse } from "../completion/helpers";

// Knowledge-test endorsements (issue 13): each precondition refused on its own and named; the
// endorsement signed with password re-entry, append-only and in the audit chain; a failed result
// opens remedial items and a retest without that training is refused; the first-attempt pass rate.

let s: School;
const today = () => dateInZone(new Date(), "Europe/London");
const signOffIds = new Map<string, string>();

async function setMinimum(minutes: number) {
  await sequelize.query(`UPDATE courses SET min_ground_minutes = :m WHERE id = :c`, { replacements: { m: minutes, c: s.course.id } });
}

/** Endorses through the data layer and returns the refusal's reasons ([] when it went through). */
async function reasonsOf(user: CurrentUser, studentId: string): Promise<{ reasons: EndorsementReason[]; message: string }> {
  try {
    await sequelize.transaction((t) => endorse(t, user, { studentId, password: TEST_PASSWORD, endorsedOn: undefined }));
    return { reasons: [], message: "" };
  } catch (e) {
    if (e instanceof EndorsementRefusal) return { reasons: e.reasons, message: e.message };
    throw e;
  }
}

async function endorsementCount(studentId: string) {
  const [r] = await sequelize.query<{ n: number }>(
    `SELECT count(*)::int AS n FROM knowledge_test_endorsements WHERE student_id = :studentId`,
    {
      replacements: { studentId },
      type: QueryTypes.SELECT,
    },
  );
  return r!.n;
}

let ready: string; // every precondition met
let lastStageOpen: string; // every item signed, last stage check not taken

beforeAll(async () => {
  s = await makeSchool("ktest");
  ready = s.people.students[0]!.id;
  lastStageOpen = s.people.students[1]!.id;
  const onSigned = (studentId: string) => (i: { code: string }, signOffId: string) => signOffIds.set(`${studentId}:${i.code}`, signOffId);
  await completeCourse(s, ready, { onSigned: onSigned(ready) });
  await completeCourse(s, lastStageOpen, { onSigned: onSigned(lastStageOpen), skipLastStageCheck: true });
  await setMinimum(0);
}, 120_000);
afterAll(async () => {
  actAs(null);
  await closeDb();
});

describe("endorsement preconditions, each refused on its own and named", () => {
  it("refuses an item not signed off, naming it, and nothing else", async () => {
    const id = signOffIds.get(`${ready}:ATM-02`)!;
    await sequelize.transaction((t) =>
      withdrawSignOff(t, s.as.instructor, { signOffId: id, reason: "signed on the wrong check", password: TEST_PASSWORD }),
    );
    const r = await reasonsOf(s.as.instructor, ready);
    expect(r.reasons).toEqual(["items_unsigned"]);
    expect(r.message).toMatch(/items not signed off: ATM-02/);
    const again = await sign(s.as.instructor, {
      studentId: ready,
      itemId: (await itemsOfRevision(s.revision.id)).find((i) => i.code === "ATM-02")!.id,
    });
    expect(again.id).toBeTruthy();
    expect(await endorsementCount(ready)).toBe(0);
  });

  it("refuses a stage check not passed, naming the stage", async () => {
    const r = await reasonsOf(s.as.instructor, lastStageOpen);
    expect(r.reasons).toEqual(["stage_checks_not_passed"]);
    expect(r.message).toMatch(/stage checks not passed: PRF/);
  });

  it("refuses an open make-up item, naming the item", async () => {
    const item = (await itemsOfRevision(s.revision.id)).find((i) => i.code === "AER-03")!;
    await sequelize.query(
      `INSERT INTO makeup_items (school_id, student_id, syllabus_item_id, source_kind, source_id) VALUES (:school, :st, :item, 'absence', gen_random_uuid())`,
      { replacements: { school: s.school.id, st: ready, item: item.id } },
    );
    const r = await reasonsOf(s.as.instructor, ready);
    expect(r.reasons).toEqual(["makeup_open"]);
    expect(r.message).toMatch(/open make-up items: AER-03/);
    await sequelize.query(
      `UPDATE makeup_items SET state = 'waived', waived_reason = 'covered', closed_at = now() WHERE student_id = :st AND state = 'open'`,
      { replacements: { st: ready } },
    );
  });

  it("refuses credited ground hours below the course minimum, naming both", async () => {
    await setMinimum(90);
    const r = await reasonsOf(s.as.instructor, ready);
    await setMinimum(0);
    expect(r.reasons).toEqual(["ground_hours_short"]);
    expect(r.message).toMatch(/credited ground hours 0 h are below the course minimum of 1.5 h/);
  });

  it("refuses an instructor not current on the day, and lists every reason at once", async () => {
    await changeQualification(s.people.chief.id, { recencyOn: "2020-01-01", recencyMonths: 1 }, today());
    const r = await reasonsOf(s.as.chief, ready);
    expect(r.reasons).toEqual(["signer_not_current"]);
    expect(r.message).toMatch(/recency is not current/);
    await setMinimum(90);
    const both = await reasonsOf(s.as.chief, lastStageOpen);
    await setMinimum(0);
    expect(both.reasons).toEqual(["stage_checks_not_passed", "ground_hours_short", "signer_not_current"]);
    expect(await endorsementCount(ready)).toBe(0);
  });
});

describe("endorsing, results and retests", () => {
  let endorsementId: string;

  it("refuses a wrong password and other roles; endorses, audited, append-only for the app role", async () => {
    actAs(s.as.instructor);
    expect(await endorseAction({ studentId: ready, password: "not-it" })).toMatchObject({ ok: false, field: "password" });
    for (const who of [s.as.student, s.as.sponsor]) {
      actAs(who);
      expect(await endorseAction({ studentId: ready, password: TEST_PASSWORD })).toMatchObject({ ok: false, status: 403 });
    }
    actAs(s.as.instructor);
    const r = await endorseAction({ studentId: ready, password: TEST_PASSWORD });
    if (!r.ok) throw new Error(r.message);
    endorsementId = r.data.endorsementId;
    expect(r.data.attempt).toBe(1);
    expect(r.data.statement).toMatch(/^I, Instructor One, endorse/);
    expect(await auditCount(s.school.id, "endorsement.signed", endorsementId)).toBe(1);
    await expect(
      sequelize.query(`UPDATE knowledge_test_endorsements SET endorsed_on = '2020-01-01' WHERE id = :id`, {
        replacements: { id: endorsementId },
      }),
    ).rejects.toThrow();
    await expect(
      sequelize.query(`DELETE FROM knowledge_test_endorsements WHERE id = :id`, { replacements: { id: endorsementId } }),
    ).rejects.toThrow();
    await expect(sequelize.query(`TRUNCATE knowledge_test_endorsements`)).rejects.toThrow();
    expect(await endorsementCount(ready)).toBe(1);
    // a second endorsement before the result is refused
    expect((await reasonsOf(s.as.instructor, ready)).reasons).toEqual(["awaiting_result"]);
  });

  it("a failed result opens remedial items; a retest without that training is refused; after it, a new endorsement and a pass", async () => {
    actAs(s.as.instructor);
    expect(await recordResultAction({ endorsementId, takenOn: today(), scorePercent: 55, areasMissed: "" })).toMatchObject({
      ok: false,
      status: 400,
      field: "areasMissed",
    });
    const fail = await recordResultAction({
      endorsementId,
      takenOn: today(),
      scorePercent: 55,
      areasMissed: "Density altitude\nStatic stability",
    });
    if (!fail.ok) throw new Error(fail.message);
    expect(fail.data).toMatchObject({ passed: false, validUntil: null, remedialItems: 2 });
    expect(await auditCount(s.school.id, "endorsement.result", fail.data.resultId)).toBe(1);
    await expect(
      sequelize.query(`UPDATE knowledge_test_results SET passed = true WHERE id = :id`, { replacements: { id: fail.data.resultId } }),
    ).rejects.toThrow();

    const refused = await endorseAction({ studentId: ready, password: TEST_PASSWORD });
    expect(refused).toMatchObject({ ok: false, status: 422, field: "studentId" });
    expect(!refused.ok && refused.message).toMatch(
      /remedial training of the last failed test is still open: Density altitude, Static stability/,
    );

    const remedials = await sequelize.query<{ id: string }>(`SELECT id FROM knowledge_test_remedials WHERE result_id = :r ORDER BY area`, {
      replacements: { r: fail.data.resultId },
      type: QueryTypes.SELECT,
    });
    expect(remedials).toHaveLength(2);
    // the form "Remedial training done" offers both (a list while few), and finds one by its area
    const offered = await endorsementChoices(s.as.instructor, "remedial");
    if (offered.kind !== "list") throw new Error("expected a list");
    expect(offered.rows.filter((r) => remedials.some((m) => m.id === r.id)).map((r) => r.name.replace(/^.*: /, ""))).toEqual([
      "Density altitude",
      "Static stability",
    ]);
    const byArea = await searchEndorsementChoices(s.as.instructor, "remedial", "STABIL");
    expect(byArea.rows.map((r) => r.id)).toEqual([remedials[1]!.id]);
    expect(byArea.rows[0]!.detail).toMatch(/^test of /);
    expect(
      await completeRemedialAction({ remedialId: remedials[0]!.id, note: "Reviewed density altitude with worked examples" }),
    ).toMatchObject({ ok: true });
    expect((await reasonsOf(s.as.instructor, ready)).reasons).toEqual(["remedial_open"]);
    expect((await searchEndorsementChoices(s.as.instructor, "remedial", "density")).rows).toEqual([]);
    expect(await completeRemedialAction({ remedialId: remedials[1]!.id, note: "Stability briefing repeated" })).toMatchObject({ ok: true });

    const again = await endorseAction({ studentId: ready, password: TEST_PASSWORD });
    if (!again.ok) throw new Error(again.message);
    expect(again.data.attempt).toBe(2);
    const pass = await recordResultAction({ endorsementId: again.data.endorsementId, takenOn: today(), scorePercent: 88, areasMissed: [] });
    if (!pass.ok) throw new Error(pass.message);
    expect(pass.data).toMatchObject({ passed: true, remedialItems: 0 });
    expect(pass.data.validUntil! > today()).toBe(true);
  });

  it("the attempt limit and the pass mark come from the chief's settings", async () => {
    actAs(s.as.instructor);
    expect(
      await saveAuthoritySettingsAction({
        authorityName: "X",
        endorsementWording: "long enough wording here",
        passMarkPercent: 70,
        resultValidityMonths: 24,
        attemptLimit: 2,
      }),
    ).toMatchObject({ ok: false, status: 403 });
    actAs(s.as.chief);
    expect(
      await saveAuthoritySettingsAction({
        authorityName: "Demo Part 141 authority",
        endorsementWording: "short",
        passMarkPercent: 70,
        resultValidityMonths: 24,
        attemptLimit: 2,
      }),
    ).toMatchObject({ ok: false, status: 400, field: "endorsementWording" });
    const saved = await saveAuthoritySettingsAction({
      authorityName: "Demo Part 141 authority",
      endorsementWording: "{student} has had the ground training for {course} and is prepared for the test.",
      passMarkPercent: 75,
      resultValidityMonths: 24,
      attemptLimit: 2,
    });
    expect(saved).toMatchObject({ ok: true });
    expect(await auditCount(s.school.id, "endorsement.settings")).toBe(1);
    // two results are on record: the limit of 2 is reached
    expect((await reasonsOf(s.as.instructor, ready)).reasons).toEqual(["attempt_limit"]);
  });
});

describe("first-attempt pass rate", () => {
  it("counts each student's first result per course inside the 24-month window", async () => {
    const f = await makeSchool("krate");
    const students = f.people.students.map((p) => p.id);
    const enrolment = async (st: string) =>
      (
        await sequelize.query<{ id: string }>(`SELECT id FROM enrolments WHERE student_id = :st`, {
          replacements: { st },
          type: QueryTypes.SELECT,
        })
      )[0]!.id;
    let n = 0;
    const result = async (st: string, takenOn: string, score: number) => {
      n += 1;
      const [e] = await sequelize.query<{ id: string }>(
        `INSERT INTO knowledge_test_endorsements (school_id, student_id, course_id, enrolment_id, instructor_id, endorsed_on, authority_name, wording, statement, attempt, audit_hash)
         VALUES (:school, :st, :course, :enr, :instr, :on, 'A', 'w', 'a statement of at least twenty characters', :n, 'h') RETURNING id`,
        {
          replacements: {
            school: f.school.id,
            st,
            course: f.course.id,
            enr: await enrolment(st),
            instr: f.people.instructor.id,
            on: takenOn,
            n,
          },
          type: QueryTypes.SELECT,
        },
      );
      await sequelize.query(
        `INSERT INTO knowledge_test_results (school_id, endorsement_id, student_id, course_id, taken_on, score_percent, pass_mark_percent, passed, valid_until, recorded_by, audit_hash)
         VALUES (:school, :e, :st, :course, :on, :score, 70, :passed, :vu, :by, 'h')`,
        {
          replacements: {
            school: f.school.id,
            e: e!.id,
            st,
            course: f.course.id,
            on: takenOn,
            score,
            passed: score >= 70,
            vu: score >= 70 ? "2030-01-01" : null,
            by: f.people.instructor.id,
          },
        },
      );
    };
    await result(students[0]!, "2026-03-10", 85); // first, pass
    await result(students[1]!, "2026-04-02", 60); // first, fail
    await result(students[1]!, "2026-05-02", 90); // retest: not a first attempt
    await result(students[2]!, "2025-02-20", 91); // first, pass
    await result(students[3]!, "2024-02-29", 95); // first, but before the window
    await result(students[3]!, "2025-06-01", 95); // not first
    await result(students[4]!, "2026-06-30", 40); // first, fail
    const rows = await passRateByCourse(f.school.id, { from: "2024-07-01", to: "2026-06-30" });
    expect(rows).toEqual([
      { courseId: f.course.id, courseCode: f.course.code, courseTitle: "Test ground course", firstAttempts: 4, passed: 2, ratePercent: 50 },
    ]);
    const none = await passRateByCourse(f.school.id, { from: "2020-01-01", to: "2020-12-31" });
    expect(none[0]).toMatchObject({ firstAttempts: 0, passed: 0, ratePercent: null });
  });
});
