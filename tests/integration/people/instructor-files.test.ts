jest.setTimeout(240_000);
jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));
import { execFileSync } from "node:child_process";
import { mkdtempSync, writeFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { QueryTypes } from "sequelize";
import { NextRequest } from "next/server";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, actAs, TEST_PASSWORD } from "@/tests/helpers/factories";
import { changeQualification } from "@/tests/helpers/qualifications";
import { saveQualificationAction } from "@/app/(app)/people/actions";
import { GET as trainingRecordRoute } from "@/app/api/records/[studentId]/training-record/route";
import { qualificationHistory } from "@/db/access/people/qualification-reads";
import { signerStanding } from "@/db/access/records/sign-off-plan";
import { signOffRegister } from "@/db/access/records/sign-off-register";
import { conductStageCheck } from "@/db/access/records/stage-checks";
import { RecordRefusal } from "@/db/access/records/refusals";
import { schoolOverview } from "@/db/access/today/school-overview";
import { CAUTION_TEXT } from "@/lib/caution";
import { listChecksOfStudent } from "@/db/access/records/check-history";
import { answerModeText } from "@/lib/records/questions";
import { printable } from "@/lib/records/training-record-pdf";
import { fixedClock, resetClock } from "@/lib/clock";
import { check, sign, itemId, auditCount, type School } from "../records/helpers";

// Issue 12, "Instructor files" and "The printable training record": each test failed on the
// behaviour before migration 0520 and the changes that came with it.

afterAll(async () => {
  actAs(null);
  resetClock();
  await closeDb();
});

async function refusal(p: Promise<unknown>): Promise<RecordRefusal> {
  try {
    await p;
  } catch (e) {
    if (e instanceof RecordRefusal) return e;
    throw e;
  }
  throw new Error("expected a refusal, but the act went through");
}

async function currentQualification(personId: string) {
  const [q] = await sequelize.query<{ qualification_id: string; certificate_number: string }>(
    `SELECT qualification_id, certificate_number FROM instructor_qualifications_current WHERE person_id = :p`,
    { replacements: { p: personId }, type: QueryTypes.SELECT },
  );
  return q!;
}

const formFor = (personId: string, over: Record<string, unknown> = {}) => ({
  personId,
  qualificationId: null,
  certificateKind: "Ground instructor",
  certificateNumber: "GI-NEW-1",
  ratings: "Principles of flight, Meteorology",
  courseIds: [] as string[],
  checkInstructor: false,
  issuedOn: "2020-01-01",
  recencyOn: "2026-01-01",
  recencyMonths: 24,
  effectiveFrom: "2026-11-01",
  changeNote: "",
  ...over,
});

describe("instructor records are kept (14 CFR 61.189 asks for 3 years; here nothing is deleted)", () => {
  let s: School;
  beforeAll(async () => {
    s = await makeSchool("keep");
  });

  it("the app role can neither delete nor rewrite a qualification or a course grant", async () => {
    const p = s.people.instructor.id;
    await expect(sequelize.query(`DELETE FROM instructor_qualifications WHERE person_id = :p`, { replacements: { p } })).rejects.toThrow(
      /permission denied/,
    );
    await expect(
      sequelize.query(`UPDATE instructor_qualifications SET certificate_number = 'X-1' WHERE person_id = :p`, { replacements: { p } }),
    ).rejects.toThrow(/permission denied/);
    await expect(sequelize.query(`DELETE FROM instructor_courses WHERE person_id = :p`, { replacements: { p } })).rejects.toThrow(
      /permission denied/,
    );
    expect((await currentQualification(p)).certificate_number).toBe(`GI-${p.slice(0, 6)}`);
  });

  it("a closed version cannot be reopened or closed again", async () => {
    const p = s.people.instructor2.id;
    await changeQualification(p, { recencyOn: "2026-06-01" }, "2026-06-01");
    await expect(
      sequelize.query(`UPDATE instructor_qualifications SET valid_to = '2026-07-01' WHERE person_id = :p AND valid_to IS NOT NULL`, {
        replacements: { p },
      }),
    ).rejects.toThrow(/instructor records are kept/);
    const { versions } = await qualificationHistory(s.school.id, p);
    expect(versions.map((v) => [v.version, v.validFrom, v.validTo])).toEqual([
      [2, "2026-06-01", null],
      [1, "2020-01-01", "2026-06-01"],
    ]);
  });
});

describe("the chief adds and edits instructors' qualifications from the People area", () => {
  let s: School;
  beforeAll(async () => {
    s = await makeSchool("qualform");
  });

  it("records a change as a new version, keeps the old one, changes the courses and audits it", async () => {
    actAs(s.as.chief);
    const p = s.people.instructor2.id;
    const q = await currentQualification(p);
    const r = await saveQualificationAction({
      ...formFor(p, {
        qualificationId: q.qualification_id,
        certificateNumber: "GI-RENEWED-7",
        ratings: "Navigation; Meteorology",
        checkInstructor: true,
        recencyOn: "2026-10-30",
        effectiveFrom: "2026-11-01",
        changeNote: "Renewal seminar attended",
      }),
      idempotencyKey: `qual-${p}`,
    });
    expect(r).toMatchObject({ ok: true, data: { version: 2, qualificationId: q.qualification_id } });
    const { versions, courses } = await qualificationHistory(s.school.id, p);
    expect(versions).toHaveLength(2);
    expect(versions[0]).toMatchObject({
      version: 2,
      certificateNumber: "GI-RENEWED-7",
      ratings: ["Navigation", "Meteorology"],
      checkInstructor: true,
      recencyOn: "2026-10-30",
      validFrom: "2026-11-01",
      validTo: null,
      recordedByName: "Chief",
      changeNote: "Renewal seminar attended",
    });
    expect(versions[1]).toMatchObject({ version: 1, certificateNumber: `GI-${p.slice(0, 6)}`, validTo: "2026-11-01" });
    // no course chosen: the grant is closed from the change's date, and kept
    expect(courses).toEqual([expect.objectContaining({ courseId: s.course.id, validFrom: null, validTo: "2026-11-01" })]);
    expect(await auditCount(s.school.id, "qualification.revised", (r as { data: { id: string } }).data.id)).toBe(1);
    // the stage-check examiner list and the scope read the version in force
    expect((await currentQualification(p)).certificate_number).toBe("GI-RENEWED-7");
  });

  it("adds a second qualification with the courses it allows", async () => {
    actAs(s.as.chief);
    const p = s.people.instructor.id;
    const r = await saveQualificationAction({ ...formFor(p, { courseIds: [s.course.id] }), idempotencyKey: `add-${p}` });
    expect(r).toMatchObject({ ok: true, data: { version: 1 } });
    const { versions } = await qualificationHistory(s.school.id, p);
    expect(versions.map((v) => v.certificateNumber).sort()).toEqual([`GI-${p.slice(0, 6)}`, "GI-NEW-1"].sort());
    expect(await auditCount(s.school.id, "qualification.added")).toBe(1);
  });

  it("names the field at fault and writes nothing on bad input", async () => {
    actAs(s.as.chief);
    const p = s.people.instructor.id;
    const before = await auditCount(s.school.id, "qualification.added");
    expect(await saveQualificationAction(formFor(p, { certificateNumber: "" }))).toMatchObject({
      ok: false,
      status: 400,
      field: "certificateNumber",
    });
    expect(await saveQualificationAction(formFor(p, { recencyOn: "2019-12-31" }))).toMatchObject({
      ok: false,
      status: 400,
      field: "recencyOn",
    });
    expect(await saveQualificationAction(formFor(p, { recencyMonths: 0 }))).toMatchObject({
      ok: false,
      status: 400,
      field: "recencyMonths",
    });
    expect(await saveQualificationAction(formFor(p, { effectiveFrom: "2099-01-01" }))).toMatchObject({
      ok: false,
      status: 400,
      field: "effectiveFrom",
    });
    const q = await currentQualification(s.people.instructor2.id);
    // a change needs its reason, and cannot take effect before the version it replaces
    expect(await saveQualificationAction(formFor(s.people.instructor2.id, { qualificationId: q.qualification_id }))).toMatchObject({
      ok: false,
      status: 400,
      field: "changeNote",
    });
    expect(
      await saveQualificationAction(
        formFor(s.people.instructor2.id, { qualificationId: q.qualification_id, changeNote: "backdated", effectiveFrom: "2026-10-01" }),
      ),
    ).toMatchObject({ ok: false, status: 400, field: "effectiveFrom" });
    // a student has no instructor file
    expect(await saveQualificationAction(formFor(s.people.students[0]!.id))).toMatchObject({ ok: false, status: 404, field: "personId" });
    expect(await auditCount(s.school.id, "qualification.added")).toBe(before);
  });

  it("is the chief's alone, checked on the server", async () => {
    const p = s.people.instructor.id;
    for (const who of [s.as.instructor, s.as.student, s.as.sponsor]) {
      actAs(who);
      expect(await saveQualificationAction(formFor(p, { certificateNumber: "GI-SELF-1" }))).toMatchObject({ ok: false, status: 403 });
    }
    actAs(null);
    expect(await saveQualificationAction(formFor(p, { certificateNumber: "GI-SELF-1" }))).toMatchObject({ ok: false, status: 401 });
    const { versions } = await qualificationHistory(s.school.id, p);
    expect(versions.some((v) => v.certificateNumber === "GI-SELF-1")).toBe(false);
  });
});

describe("an act is judged against the qualification held on its day", () => {
  it("the register notes a sign-off made while the recency had lapsed, even after a later renewal", async () => {
    const s = await makeSchool("onday");
    const p = s.people.instructor2.id;
    const st = s.people.students[3]!.id;
    const item = await itemId(s, "AER-01");
    await check(s.as.instructor2, st, [item], { occurredAt: new Date("2026-11-19T10:00:00Z") });
    const signed = await sign(s.as.instructor2, { studentId: st, itemId: item, signedOn: "2026-11-20" });
    // found afterwards: the recency had run out in 2025 (recorded from 1 November) and was renewed on 25 November
    await changeQualification(p, { recencyOn: "2023-06-01" }, "2026-11-01");
    await changeQualification(p, { recencyOn: "2026-11-25" }, "2026-11-25");
    expect((await signerStanding(p, s.course.id, "2026-11-20")).current).toBe(false);
    expect((await signerStanding(p, s.course.id, "2026-11-26")).current).toBe(true);
    const { rows } = await signOffRegister(s.as.chief, {}, { studentId: st });
    const row = rows.find((r) => r.id === (signed as { id: string }).id)!;
    expect(row.notes.map((n) => n.kind)).toContain("signer_not_current");
  });
});

describe("acting with lapsed recency is refused with the reason", () => {
  let s: School;
  beforeAll(async () => {
    s = await makeSchool("lapsedacts");
    // instructor2: a designated check instructor whose recency ran until 2025-06-01
    await changeQualification(s.people.instructor2.id, { recencyOn: "2023-06-01", checkInstructor: true }, "2026-01-01");
  });

  it("an oral check", async () => {
    const e = await refusal(check(s.as.instructor2, s.people.students[3]!.id, [await itemId(s, "AER-01")]));
    expect(e.reason).toBe("signer_not_current");
    expect(e.message).toMatch(
      /^signer: your instructor recency is not current on \w{3} \d{1,2} \w{3} \d{4} \(it ran until Sun 1 Jun 2025\)/,
    );
  });

  it("a stage check", async () => {
    const st = s.people.students[0]!.id;
    const ids = await Promise.all(["AER-01", "AER-02", "AER-03", "AER-04", "AER-05"].map((c) => itemId(s, c)));
    await check(s.as.instructor, st, ids);
    for (const id of ids) await sign(s.as.instructor, { studentId: st, itemId: id });
    const [stage] = await sequelize.query<{ id: string }>(`SELECT id FROM syllabus_stages WHERE revision_id = :r AND code = 'AER'`, {
      replacements: { r: s.revision.id },
      type: QueryTypes.SELECT,
    });
    const e = await refusal(
      sequelize.transaction((t) =>
        conductStageCheck(t, s.as.instructor2, {
          studentId: st,
          stageId: stage!.id,
          result: "pass",
          oralOutcomes: ids.map((itemId) => ({ itemId, outcome: "solid" as const })),
          writtenScorePercent: 90,
          remarks: "",
          occurredAt: new Date(Date.now() - 60_000),
          password: TEST_PASSWORD,
        }),
      ),
    );
    expect(e.reason).toBe("signer_not_current");
    expect(e.field).toBe("signer");
  });
});

describe("Today warns the chief 30 days before an instructor's recency date", () => {
  it("lists the instructors whose recency date is within 30 days, by the injectable clock", async () => {
    const s = await makeSchool("recencywarn");
    // the factory's qualifications: recency 2026-01-01 + 24 months, so the recency date is 2028-01-01
    fixedClock(new Date("2027-11-20T12:00:00Z"));
    expect((await schoolOverview(s.as.chief)).dueSoon).toEqual([]);
    fixedClock(new Date("2027-12-05T12:00:00Z"));
    const due = (await schoolOverview(s.as.chief)).dueSoon;
    expect(due.map((d) => d.name).sort()).toEqual(["Chief", "Instructor One", "Instructor Two"]);
    expect(due[0]).toMatchObject({ dueOn: "2028-01-01", daysLeft: 27 });
    // a renewal recorded by the chief takes the instructor off the card
    await changeQualification(s.people.instructor.id, { recencyOn: "2027-12-01" }, "2027-12-01");
    expect((await schoolOverview(s.as.chief)).dueSoon.map((d) => d.name)).not.toContain("Instructor One");
    resetClock();
  });
});

describe("the printable training record", () => {
  it("prints the caution on every page, each signer's certificate number, the items not yet done and the chief's certification", async () => {
    const s = await makeSchool("printed");
    const st = s.people.students[0]!.id;
    const item = await itemId(s, "AER-01");
    await check(s.as.instructor, st, [item]);
    await sign(s.as.instructor, { studentId: st, itemId: item });
    actAs(s.as.chief);
    const res = await trainingRecordRoute(new NextRequest(`http://127.0.0.1/api/records/${st}/training-record`), {
      params: Promise.resolve({ studentId: st }),
    });
    expect(res.status).toBe(200);
    const dir = mkdtempSync(path.join(tmpdir(), "qf-record-"));
    try {
      const file = path.join(dir, "record.pdf");
      writeFileSync(file, Buffer.from(await res.arrayBuffer()));
      // pdftotext (Debian's poppler-utils, installed by ensure_poppler in lib/ops/common.sh): one page per form feed
      const text = execFileSync("pdftotext", ["-enc", "UTF-8", file, "-"], { encoding: "utf8" });
      const flat = (x: string) => x.replace(/\s+/g, " ").trim();
      const pages = text.split("\f").filter((p) => p.trim());
      expect(pages.length).toBeGreaterThan(0);
      for (const page of pages) expect(flat(page)).toContain(flat(CAUTION_TEXT));
      const all = flat(text);
      expect(all).toContain(`GI-${s.people.instructor.id.slice(0, 6)}`);
      expect(all).toContain("Syllabus items not yet done");
      expect(all).toContain("AER-02");
      expect(all).toContain("Certification by the chief instructor");
      expect(all).toContain(`I, Chief, chief instructor of ${s.school.name}, certify that this is a true and complete copy`);
      expect(all).toContain("Name: Chief");
      expect(all).toContain(`Certificate number: GI-${s.people.chief.id.slice(0, 6)}`);
      expect(all).toMatch(/Date: _+/);
      expect(all).toMatch(/Signature: _+/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("prints each computed question's answer mode with its tolerance, as the student's record page shows it", async () => {
    const s = await makeSchool("printedmode");
    const st = s.people.students[1]!.id;
    const item = await itemId(s, "AER-03");
    const lt2 = { kind: "reference" as const, id: "lt-2" };
    const generated = (answerMode: "exact" | "rule_of_thumb") => ({
      syllabusItemId: item,
      answerSummary: "",
      outcome: "solid" as const,
      required: true,
      prompted: false,
      correctiveGiven: false,
      generated: { kind: "vmd" as const, aircraft: lt2, inputs: { massKg: 1000, altitudeFt: 6000 }, answerMode },
      studentFigure: 80,
    });
    await check(s.as.instructor, st, [item], { questions: [generated("rule_of_thumb"), generated("exact")] });
    const stored = (await listChecksOfStudent(s.school.id, st, { withRemarks: false }))[0]!.questions.map((q) => q.generated!);
    expect(stored.map((g) => g.answerMode)).toEqual(["rule_of_thumb", "exact"]);
    actAs(s.as.chief);
    const res = await trainingRecordRoute(new NextRequest(`http://127.0.0.1/api/records/${st}/training-record`), {
      params: Promise.resolve({ studentId: st }),
    });
    expect(res.status).toBe(200);
    const dir = mkdtempSync(path.join(tmpdir(), "qf-mode-"));
    try {
      const file = path.join(dir, "record.pdf");
      writeFileSync(file, Buffer.from(await res.arrayBuffer()));
      const all = execFileSync("pdftotext", ["-enc", "UTF-8", file, "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
      // TAS from IAS at 2 % per 1,000 ft: common practice (lib/records/questions.ts RULE_OF_THUMB)
      expect(all).toContain("Rule of thumb accepted (TAS = IAS + 2 % per 1,000 ft: ");
      expect(all).toContain("Exact answer asked: accepted within 3 %, ");
      // the whole line each question's page shows, with its accepted range
      for (const g of stored) expect(all).toContain(printable(answerModeText(g)));
      expect(all).toContain("student said 80");
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
