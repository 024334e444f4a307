import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { NextRequest } from "next/server";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, actAs, TEST_PASSWORD } from "@/tests/helpers/factories";
import { GET as certificateRoute } from "@/app/api/records/[studentId]/certificate/route";
import { GET as trainingRecordRoute } from "@/app/api/records/[studentId]/training-record/route";
import { scheduleSession } from "@/db/access/timetable/schedule-session";
import { recordAttendance } from "@/db/access/ground-log/record-attendance";
import { waiveMakeup } from "@/db/access/ground-log/change-makeup";
import { creditedMinutesFor } from "@/db/access/ground-log/ground-hours";
import { scheduleSessionSchema, recordAttendanceSchema } from "@/lib/timetable/schema";
import { completionStatement } from "@/lib/completion/statements";
import { dateInZone, formatDay } from "@/lib/time";
import { auditCount, type School } from "../records/helpers";
import { makeBriefing, addRooms } from "../timetable/helpers";
import { completeCourse, endTrainingToday, enrolment, statement, today } from "./helpers";

// End of training (issue 13): graduation refused until the course is complete (14 CFR 141.95(a)):
// every item signed, every stage check passed, no make-up item open and the course's minimum ground
// training time credited (141.55(c); the test course's minimum is 35 h); the chief's certification (141.101(c)) with password re-entry, append-only and audited;
// the graduation certificate (141.95(b)) and the graduate's own record after the enrolment ended (141.101(e)).

let s: School;
let plain: string; // a briefing covering no syllabus item
let aer03: string; // a briefing covering AER-03
let daysBack = 1;

beforeAll(async () => {
  s = await makeSchool("eot");
  await sequelize.query(`UPDATE schools SET settings = settings || '{"schoolCertificateNumber":"KSC-4471"}'::jsonb WHERE id = :id`, {
    replacements: { id: s.school.id },
  });
  await addRooms(s, ["Hangar classroom"]);
  plain = (await makeBriefing(s, "Revision of the course", [])).id;
  aer03 = (await makeBriefing(s, "Stalls and spins", ["AER-03"])).id;
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

/** A past ground session the student is booked on, with their attendance recorded as the Timetable records it. */
async function attend(studentId: string, minutes: number, status: "attended" | "absent" = "attended", briefingId = plain) {
  const session = await sequelize.transaction((t) =>
    scheduleSession(
      s.as.instructor,
      scheduleSessionSchema.parse({
        briefingId,
        date: dateInZone(new Date(Date.now() - daysBack++ * 86_400_000), "Europe/London"),
        time: "08:00",
        durationMinutes: minutes,
        room: "Hangar classroom",
        instructorId: s.people.instructor.id,
        studentIds: [studentId],
      }),
      t,
    ),
  );
  await sequelize.transaction((t) =>
    recordAttendance(s.as.instructor, recordAttendanceSchema.parse({ sessionId: session.id, lines: [{ studentId, status }] }), t),
  );
}

async function certifications(studentId: string) {
  const [r] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM record_certifications WHERE student_id = :studentId`, {
    replacements: { studentId },
    type: QueryTypes.SELECT,
  });
  return r!.n;
}

/** A graduation today refused as the course is not complete (409 on the kind), with `message`; nothing is written. */
async function expectGraduationRefused(st: string, message: string) {
  actAs(s.as.chief);
  const r = await endTrainingToday({ studentId: st, kind: "graduated", reason: "done" });
  expect(r).toMatchObject({ ok: false, status: 409, field: "kind" });
  expect(!r.ok && r.message).toBe(message);
  expect((await enrolment(st)).status).toBe("active");
  expect(await certifications(st)).toBe(0);
}

async function pdfText(res: Response): Promise<string> {
  const dir = mkdtempSync(path.join(tmpdir(), "eot-"));
  try {
    const file = path.join(dir, "x.pdf");
    writeFileSync(file, Buffer.from(await res.arrayBuffer()));
    // pdftotext: Debian's poppler-utils, installed by ensure_poppler in lib/ops/common.sh
    return execFileSync("pdftotext", ["-enc", "UTF-8", file, "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
const req = (st: string, what: string) =>
  [new NextRequest(`http://127.0.0.1/api/records/${st}/${what}`), { params: Promise.resolve({ studentId: st }) }] as const;

describe("ending training", () => {
  it("refuses a graduation with items not signed off, naming them, and changes nothing", async () => {
    const st = s.people.students[1]!.id;
    actAs(s.as.chief);
    const r = await endTrainingToday({ studentId: st, kind: "graduated", reason: "course done" });
    expect(r).toMatchObject({ ok: false, status: 409, field: "kind" });
    expect(!r.ok && r.message).toMatch(/items not signed off: AER-01/);
    expect((await enrolment(st)).status).toBe("active");
  });

  it("refuses a wrong password, a date before enrolment, and callers without records.certify", async () => {
    const st = s.people.students[1]!.id;
    actAs(s.as.chief);
    const base = { studentId: st, kind: "terminated", reason: "left the area" };
    expect(await endTrainingToday({ ...base, password: "wrong-one" })).toMatchObject({ ok: false, field: "password" });
    expect(await endTrainingToday({ ...base, endedOn: "2026-08-01" })).toMatchObject({
      ok: false,
      status: 400,
      field: "endedOn",
    });
    for (const who of [s.as.instructor, s.as.student, s.as.sponsor]) {
      actAs(who);
      expect(await endTrainingToday(base)).toMatchObject({ ok: false, status: 403 });
    }
    expect((await enrolment(st)).status).toBe("active");
  });

  it("terminates with a date and reason, certified and audited, once", async () => {
    const st = s.people.students[2]!.id;
    actAs(s.as.chief);
    const input = { studentId: st, kind: "terminated", reason: "moved abroad" };
    const r = await endTrainingToday(input);
    expect(r.ok).toBe(true);
    expect(await enrolment(st)).toEqual({ status: "withdrawn", ended_on: today(), end_reason: "moved abroad", end_kind: "terminated" });
    const id = r.ok ? r.data.certificationId : "";
    expect(await auditCount(s.school.id, "record.certified", id)).toBe(1);
    await expect(
      sequelize.query(`UPDATE record_certifications SET statement = 'changed afterwards!!!' WHERE id = :id`, { replacements: { id } }),
    ).rejects.toThrow(/permission denied|append-only/);
    expect(await endTrainingToday(input)).toMatchObject({ ok: false, status: 409, field: "studentId" });
  });

  it("refuses a graduation with credited ground time below the course minimum (141.95(a)), naming both, and changes nothing", async () => {
    const st = s.people.students[0]!.id;
    await completeCourse(s, st);
    await attend(st, 420);
    await attend(st, 330);
    expect(await creditedMinutesFor(st, s.course.id)).toBe(750);
    await expectGraduationRefused(st, "Kind: cannot graduate: credited ground time 12.5 h of the course's 35 h minimum");
  });

  it("refuses a graduation with an open make-up item (141.95(a): the course not complete), naming it, and changes nothing", async () => {
    const st = s.people.students[0]!.id;
    for (let n = 0; n < 3; n++) await attend(st, 450); // 750 + 1350 = 2100 min, the 35 h minimum
    await attend(st, 60, "absent", aer03); // an absence opens a make-up item for AER-03
    expect(await creditedMinutesFor(st, s.course.id)).toBe(2100);
    await expectGraduationRefused(st, "Kind: cannot graduate: open make-up items: AER-03");
  });

  it("graduates a student who completed the course; the certificate and the record are theirs to download", async () => {
    const st = s.people.students[0]!.id;
    // the make-up item of the absence, waived by the chief: the course is now complete
    const [m] = await sequelize.query<{ id: string }>(`SELECT id FROM makeup_items WHERE student_id = :st AND state = 'open'`, {
      replacements: { st },
      type: QueryTypes.SELECT,
    });
    await sequelize.transaction((t) =>
      waiveMakeup(s.as.chief, { itemId: m!.id, reason: "covered in the stage check", password: TEST_PASSWORD }, t),
    );
    actAs(s.as.chief);
    const r = await endTrainingToday({ studentId: st, kind: "graduated", reason: "all stages passed" });
    expect(r).toMatchObject({ ok: true, data: { status: "completed" } });
    expect((await enrolment(st)).end_kind).toBe("graduated");

    // the graduate themself, after the enrolment ended
    actAs(s.as.student);
    const cert = await certificateRoute(...req(st, "certificate"));
    expect(cert.status).toBe(200);
    const text = await pdfText(cert);
    const course = `${s.course.code} Test ground course`;
    for (const needed of [
      s.school.name,
      "KSC-4471",
      "Graduation certificate",
      "Student 1",
      course,
      formatDay(today()),
      completionStatement("Student 1", course),
      statement,
      `Certified by Chief, chief instructor, certificate number GI-${s.people.chief.id.slice(0, 6)}`,
    ])
      expect(text).toContain(needed);

    const record = await trainingRecordRoute(...req(st, "training-record"));
    expect(record.status).toBe(200);
    const recordText = await pdfText(record);
    expect(recordText).toContain(`Certified on: ${formatDay(today())}`);
    expect(recordText).toContain("Training ended on");
  });

  it("refuses the certificate to sponsors, to other students and for a student who did not graduate", async () => {
    const graduate = s.people.students[0]!.id;
    actAs(s.as.sponsor);
    expect((await certificateRoute(...req(graduate, "certificate"))).status).toBe(404);
    actAs(s.as.otherStudent);
    expect((await certificateRoute(...req(graduate, "certificate"))).status).toBe(404);
    actAs(s.as.chief);
    expect((await certificateRoute(...req(s.people.students[2]!.id, "certificate"))).status).toBe(404);
  });
});
