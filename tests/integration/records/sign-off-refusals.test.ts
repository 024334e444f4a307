jest.setTimeout(120_000);
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, TEST_PASSWORD } from "@/tests/helpers/factories";
import { withdrawOralCheck } from "@/db/access/records/oral-check-corrections";
import { signerStanding } from "@/db/access/records/sign-off-plan";
import { withdrawSignOff, currentSignOffs } from "@/db/access/records/sign-offs";
import { RecordRefusal } from "@/db/access/records/refusals";
import { verifyChain } from "@/db/access/records/audit-chain";
import { check, sign, itemId, auditCount, type School } from "./helpers";
import { changeQualification, endCourseGrants } from "@/tests/helpers/qualifications";

afterAll(closeDb);

async function refusal(p: Promise<unknown>): Promise<string> {
  try {
    await p;
  } catch (e) {
    if (e instanceof RecordRefusal) return e.reason;
    throw e;
  }
  throw new Error("expected a refusal, but the sign-off went through");
}

let s: School;
let student: string;
beforeAll(async () => {
  s = await makeSchool("signoff");
  student = s.people.students[0]!.id;
});

describe("the server refuses a sign-off without its basis, saying why", () => {
  it("no check of this student on the item", async () => {
    expect(await refusal(sign(s.as.instructor, { studentId: student, itemId: await itemId(s, "AER-01") }))).toBe("no_check");
  });

  it("a check that does not meet the standard (a required question Shaky)", async () => {
    const item = await itemId(s, "AER-02");
    await check(s.as.instructor, student, [item], { question: { outcome: "shaky" } });
    expect(await refusal(sign(s.as.instructor, { studentId: student, itemId: item }))).toBe("not_meeting_standard");
  });

  it("a check below the item's required level of learning", async () => {
    const item = await itemId(s, "AER-03"); // requires application
    await check(s.as.instructor, student, [item], { levelShown: "understanding" });
    expect(await refusal(sign(s.as.instructor, { studentId: student, itemId: item }))).toBe("level_below_required");
  });

  it("a withdrawn check; and after the withdrawal of a sign-off the item can be signed again", async () => {
    const item = await itemId(s, "AER-04");
    const c = await check(s.as.instructor, student, [item]);
    await sequelize.transaction((t) =>
      withdrawOralCheck(t, s.as.instructor, { checkId: c.id, reason: "recorded against the wrong student", password: TEST_PASSWORD }),
    );
    expect(await refusal(sign(s.as.instructor, { studentId: student, itemId: item }))).toBe("check_withdrawn");
    await check(s.as.instructor, student, [item]);
    const first = await sign(s.as.instructor, { studentId: student, itemId: item });
    expect(await refusal(sign(s.as.instructor, { studentId: student, itemId: item }))).toBe("already_signed");
    await sequelize.transaction((t) =>
      withdrawSignOff(t, s.as.instructor, {
        signOffId: first.id,
        reason: "signed before the debrief was complete",
        password: TEST_PASSWORD,
      }),
    );
    expect((await currentSignOffs(student)).some((x) => x.itemId === item)).toBe(false);
    const second = await sign(s.as.instructor, { studentId: student, itemId: item });
    expect(second.generation).toBe(2);
    const current = (await currentSignOffs(student)).filter((x) => x.itemId === item);
    expect(current.map((x) => x.id)).toEqual([second.id]);
    // both stay visible
    const [n] = await sequelize.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM sign_offs WHERE student_id = :st AND syllabus_item_id = :i`,
      { replacements: { st: student, i: item }, type: QueryTypes.SELECT },
    );
    expect(n!.n).toBe(2);
    expect(await auditCount(s.school.id, "signoff.withdrawn", first.id)).toBe(1);
  });

  it("a check older than the school's limit (60 days by default)", async () => {
    const item = await itemId(s, "AER-05");
    await check(s.as.instructor, student, [item], { occurredAt: new Date(Date.now() - 70 * 86_400_000) });
    expect(await refusal(sign(s.as.instructor, { studentId: student, itemId: item }))).toBe("check_expired");
  });

  it("an open make-up item on it", async () => {
    const other = s.people.students[1]!.id;
    const item = await itemId(s, "AER-01");
    await check(s.as.instructor, other, [item]);
    await sequelize.query(
      `INSERT INTO makeup_items (school_id, student_id, syllabus_item_id, source_kind, source_id, state) VALUES (:school, :st, :item, 'absence', gen_random_uuid(), 'open')`,
      { replacements: { school: s.school.id, st: other, item } },
    );
    expect(await refusal(sign(s.as.instructor, { studentId: other, itemId: item }))).toBe("makeup_open");
  });

  it("items of the next stage before its stage check is passed (for checks and sign-offs)", async () => {
    const item = await itemId(s, "ATM-01");
    expect(await refusal(check(s.as.instructor, student, [item]))).toBe("stage_locked");
    expect(await refusal(sign(s.as.instructor, { studentId: student, itemId: item }))).toBe("stage_locked");
  });

  it("a wrong password", async () => {
    const other = s.people.students[2]!.id;
    const item = await itemId(s, "AER-01");
    await check(s.as.instructor, other, [item]);
    expect(await refusal(sign(s.as.instructor, { studentId: other, itemId: item, password: "not-the-password" }))).toBe("wrong_password");
    expect((await currentSignOffs(other)).length).toBe(0);
  });

  it("the audit chain of all of the above verifies", async () => {
    const v = await verifyChain(s.school.id);
    expect(v.ok).toBe(true);
    expect(v.checked).toBeGreaterThan(8);
  });
});

describe("the signer must be qualified for the course and current on that date", () => {
  it("a signer not qualified for the course", async () => {
    const s2 = await makeSchool("unqualified");
    const st = s2.people.students[3]!.id; // cohort B, led by instructor2
    const item = await itemId(s2, "AER-01");
    await check(s2.as.instructor2, st, [item]);
    await endCourseGrants(s2.people.instructor2.id, "2020-01-01");
    expect(await refusal(sign(s2.as.instructor2, { studentId: st, itemId: item }))).toBe("signer_not_qualified");
  });

  it("a signer whose recency had lapsed on the date signed for", async () => {
    const s3 = await makeSchool("lapsed");
    const st = s3.people.students[3]!.id;
    const item = await itemId(s3, "AER-01");
    await check(s3.as.instructor2, st, [item]);
    await changeQualification(s3.people.instructor2.id, { recencyOn: "2023-01-15", recencyMonths: 24 }, "2020-01-01");
    expect(await refusal(sign(s3.as.instructor2, { studentId: st, itemId: item }))).toBe("signer_not_current");
  });

  it("recency is counted in calendar months (31 January + 1 month ends on 28 February)", async () => {
    const s4 = await makeSchool("months");
    const p = s4.people.instructor2.id;
    await changeQualification(p, { issuedOn: "2020-01-01", recencyOn: "2025-01-31", recencyMonths: 1 }, "2020-01-01");
    expect((await signerStanding(p, s4.course.id, "2025-02-27")).current).toBe(true);
    const end = await signerStanding(p, s4.course.id, "2025-02-28");
    expect(end.current).toBe(false);
    expect(end.currentUntil).toBe("2025-02-28");
  });
});
