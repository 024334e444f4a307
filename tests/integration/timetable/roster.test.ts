import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { createPerson } from "@/db/access/people/create-person";
import { previewRosterImport, commitRosterImport } from "@/db/access/roster/import-roster";
import { moveStudent } from "@/db/access/roster/move-student";
import { rosterPage } from "@/db/access/roster/roster-page";
import { count } from "./helpers";

afterAll(closeDb);

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
beforeAll(async () => {
  s = await makeSchool("roster");
});

const people = (emails: string[]) =>
  count(`SELECT count(*)::int AS n FROM people WHERE lower(email) = ANY(ARRAY[:e]::text[])`, { e: emails.map((e) => e.toLowerCase()) });
const outboxTo = (emails: string[]) =>
  count(`SELECT count(*)::int AS n FROM outbox WHERE lower(to_address) = ANY(ARRAY[:e]::text[])`, {
    e: emails.map((e) => e.toLowerCase()),
  });

describe("roster CSV import", () => {
  it("reads a file with a UTF-8 byte-order mark, ';' delimiters and quoted commas, and imports it in one go", async () => {
    const e1 = `chidi.${s.tag}@example.test`;
    const e2 = `marta.${s.tag}@example.test`;
    const sp = `grace.${s.tag}@example.test`;
    const csv =
      "\uFEFFName;E-mail;Cohort;Sponsor name;Sponsor e-mail\r\n" +
      `"Okafor, Chidi";${e1.toUpperCase()};${s.cohorts.a.name};"Okafor; Grace, Mrs";${sp}\r\n` +
      `Marta Lind;${e2};${s.cohorts.b.name};;\r\n`;
    const preview = await previewRosterImport(s.as.chief, csv);
    expect(preview.delimiter).toBe(";");
    expect(preview.fileProblems).toEqual([]);
    expect(preview.rows.map((r) => [r.line, r.name, r.email, r.sponsorName, r.problems])).toEqual([
      [2, "Okafor, Chidi", e1.toUpperCase(), "Okafor; Grace, Mrs", []],
      [3, "Marta Lind", e2, "", []],
    ]);
    const result = await sequelize.transaction((t) => commitRosterImport(s.as.chief, csv, t));
    expect(result).toEqual({ created: 2, invitations: 3, sponsorsLinked: 1 });
    const [chidi] = await sequelize.query<{ name: string; email: string; roles: string[]; cohort: string; sponsor: string }>(
      `SELECT p.name, p.email, p.roles, c.name AS cohort, sp.name AS sponsor FROM people p
         JOIN cohort_memberships m ON m.student_id = p.id JOIN cohorts c ON c.id = m.cohort_id
         JOIN sponsor_links l ON l.student_id = p.id JOIN people sp ON sp.id = l.sponsor_id WHERE p.email = :e`,
      { replacements: { e: e1 }, type: QueryTypes.SELECT },
    );
    expect(chidi).toEqual({
      name: "Okafor, Chidi",
      email: e1,
      roles: ["student"],
      cohort: s.cohorts.a.name,
      sponsor: "Okafor; Grace, Mrs",
    });
    expect(
      await count(
        `SELECT count(*)::int AS n FROM enrolments e JOIN people p ON p.id = e.student_id WHERE p.email = ANY(ARRAY[:e]::text[]) AND e.status = 'active'`,
        { e: [e1, e2] },
      ),
    ).toBe(2);
    const invites = await sequelize.query<{ kind: string; to_address: string; body_text: string }>(
      `SELECT kind, to_address, body_text FROM outbox WHERE to_address = ANY(ARRAY[:e]::text[]) ORDER BY to_address`,
      { replacements: { e: [e1, e2, sp] }, type: QueryTypes.SELECT },
    );
    expect(invites.map((m) => [m.kind, m.to_address])).toEqual([
      ["invitation", e1],
      ["invitation", sp],
      ["invitation", e2],
    ]);
    expect(invites[0]!.body_text).toMatch(/\/set-password\/[A-Za-z0-9_-]{43}/);
  });

  it("the preview lists every row with its problems and writes nothing", async () => {
    const taken = `taken.${s.tag}@example.test`;
    await createPerson({ schoolId: s.school.id, name: "Already Here", email: taken, roles: ["student"] });
    const ok = `fine.${s.tag}@example.test`;
    const csv = [
      "name,email,cohort",
      `Fine Student,${ok},${s.cohorts.a.name}`,
      `,nobody.${s.tag}@example.test,${s.cohorts.a.name}`,
      `Bad Mail,not-an-address,${s.cohorts.a.name}`,
      `Twin,${ok},${s.cohorts.a.name}`,
      `Old Hand,${taken},${s.cohorts.a.name}`,
      `Lost,lost.${s.tag}@example.test,No such cohort`,
    ].join("\n");
    const p = await previewRosterImport(s.as.chief, csv);
    expect(p.rows.map((r) => r.problems)).toEqual([
      [],
      ["name: missing"],
      ["e-mail: not a valid address"],
      ["e-mail: duplicate of line 2 in this file"],
      ["e-mail: already an account"],
      ['cohort: no cohort named "No such cohort" that you may add to'],
    ]);
    expect(p.readyCount).toBe(1);
    expect(await people([ok, `lost.${s.tag}@example.test`])).toBe(0);
    // an instructor may only add to cohorts they lead
    const asLead = await previewRosterImport(s.as.instructor, `name,email,cohort\nX,x.${s.tag}@example.test,${s.cohorts.b.name}\n`);
    expect(asLead.rows[0]!.problems).toEqual([`cohort: no cohort named "${s.cohorts.b.name}" that you may add to`]);
    const noHeader = await previewRosterImport(s.as.chief, "student,address\nA,b@example.test\n");
    expect(noHeader.fileProblems).toEqual([
      'file: the header has no "name" column',
      'file: the header has no "e-mail" column',
      'file: the header has no "cohort" column',
    ]);
  });

  it("a row that passed the preview but whose e-mail is taken before the import leaves zero people and zero outbox mails", async () => {
    const emails = [1, 2, 3].map((i) => `late${i}.${s.tag}@example.test`);
    const sponsor = `late-sponsor.${s.tag}@example.test`;
    const csv =
      `name,email,cohort,sponsor name,sponsor email\n` +
      `Late One,${emails[0]},${s.cohorts.a.name},Late Sponsor,${sponsor}\n` +
      `Late Two,${emails[1]},${s.cohorts.a.name},,\n` +
      `Late Three,${emails[2]},${s.cohorts.a.name},,\n`;
    const preview = await previewRosterImport(s.as.chief, csv);
    expect(preview.rows.every((r) => r.problems.length === 0)).toBe(true);
    // meanwhile, someone else creates an account with the third e-mail
    await createPerson({ schoolId: s.school.id, name: "Quicker", email: emails[2]!, roles: ["student"] });
    await expect(sequelize.transaction((t) => commitRosterImport(s.as.chief, csv, t))).rejects.toMatchObject({
      status: 409,
      message: "line 4: e-mail: already belongs to an account",
    });
    expect(await people([emails[0]!, emails[1]!, sponsor])).toBe(0);
    expect(await outboxTo([...emails, sponsor])).toBe(0);
    expect(
      await count(
        `SELECT count(*)::int AS n FROM cohort_memberships m JOIN people p ON p.id = m.student_id WHERE p.email = ANY(ARRAY[:e]::text[])`,
        { e: emails },
      ),
    ).toBe(0);
  });
});

describe("two imports racing for one e-mail", () => {
  it("exactly one commits; the other is a 409 naming the line and leaves none of its rows or mails", async () => {
    const shared = `race.${s.tag}@example.test`;
    const onlyA = `race-a.${s.tag}@example.test`;
    const onlyB = `race-b.${s.tag}@example.test`;
    const fileA = `name,email,cohort\nRacer A,${onlyA},${s.cohorts.a.name}\nShared,${shared},${s.cohorts.a.name}\n`;
    const fileB = `name,email,cohort\nRacer B,${onlyB},${s.cohorts.b.name}\nShared,${shared},${s.cohorts.b.name}\n`;
    const results = await Promise.allSettled([
      sequelize.transaction((t) => commitRosterImport(s.as.chief, fileA, t)),
      sequelize.transaction((t) => commitRosterImport(s.as.chief, fileB, t)),
    ]);
    const won = results.filter((r) => r.status === "fulfilled");
    const lost = results.filter((r): r is PromiseRejectedResult => r.status === "rejected");
    expect(won).toHaveLength(1);
    expect(lost).toHaveLength(1);
    expect(lost[0]!.reason).toMatchObject({ status: 409, message: "line 3: e-mail: already belongs to an account" });
    const winner = results[0]!.status === "fulfilled" ? onlyA : onlyB;
    const loser = winner === onlyA ? onlyB : onlyA;
    expect(await people([shared])).toBe(1);
    expect(await people([winner])).toBe(1);
    expect(await people([loser])).toBe(0);
    expect(await outboxTo([loser])).toBe(0);
    expect(await outboxTo([shared])).toBe(1);
  });
});

describe("moving a student between cohorts", () => {
  it("keeps dated membership, and the new lead instructor sees the whole history", async () => {
    const st = s.people.students[0]!;
    await sequelize.transaction((t) => moveStudent(s.as.chief, { studentId: st.id, toCohortId: s.cohorts.b.id, onDate: "2026-10-01" }, t));
    const newLead = { ...s.as.instructor2 };
    const roster = await rosterPage(newLead, { name: st.name });
    const row = roster.rows.find((r) => r.studentId === st.id)!;
    expect(row.cohortName).toBe(s.cohorts.b.name);
    expect(row.history).toEqual([
      { cohortName: s.cohorts.a.name, fromDate: "2026-09-01", toDate: "2026-10-01" },
      { cohortName: s.cohorts.b.name, fromDate: "2026-10-01", toDate: null },
    ]);
    expect((await rosterPage(s.as.instructor, { name: st.name })).rows.some((r) => r.studentId === st.id)).toBe(false);
    // the old lead may no longer move them
    await expect(
      sequelize.transaction((t) => moveStudent(s.as.instructor, { studentId: st.id, toCohortId: s.cohorts.a.id, onDate: "2026-10-05" }, t)),
    ).rejects.toMatchObject({ status: 403, field: "studentId" });
  });
});
