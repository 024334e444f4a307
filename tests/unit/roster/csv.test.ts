import { checkRosterRows, firstBlockingProblem, readRosterCsv, ROSTER_MAX_ROWS, type ExistingAccount } from "@/lib/roster/csv";

// Roster files as a school's office exports them (Chalkwing's own rules; the CSV dialects are those
// lib/csv.ts reads: ',' or ';', quoted fields, an optional UTF-8 byte-order mark).

const cohorts = new Map([["alpha 2026", "cohort-a"]]);
const none = new Map<string, ExistingAccount>();

describe("readRosterCsv", () => {
  it("matches columns by several spellings, ignores unknown ones, and numbers lines from the header", () => {
    const csv =
      "\uFEFFFull name;E-mail;Cohort;Phone;Sponsor e-mail;Sponsor\r\n" +
      '"Okafor, Chidi"; chidi@example.test ;Alpha 2026;555;grace@example.test;"Okafor; Grace"\r\n';
    const r = readRosterCsv(csv);
    expect(r.delimiter).toBe(";");
    expect(r.fileProblems).toEqual([]);
    expect(r.rows).toEqual([
      {
        line: 2,
        name: "Okafor, Chidi",
        email: "chidi@example.test",
        cohort: "Alpha 2026",
        sponsorName: "Okafor; Grace",
        sponsorEmail: "grace@example.test",
      },
    ]);
  });

  it("names every missing required column", () => {
    expect(readRosterCsv("student,address\nA,b@example.test\n").fileProblems).toEqual([
      'file: the header has no "name" column',
      'file: the header has no "e-mail" column',
      'file: the header has no "cohort" column',
    ]);
  });

  it(`refuses more than ${ROSTER_MAX_ROWS} rows`, () => {
    const body = Array.from({ length: ROSTER_MAX_ROWS + 1 }, (_, i) => `S${i},s${i}@example.test,Alpha 2026`).join("\n");
    expect(readRosterCsv(`name,email,cohort\n${body}\n`).fileProblems).toEqual([`file: more than ${ROSTER_MAX_ROWS} rows`]);
  });
});

describe("checkRosterRows", () => {
  const rows = (text: string) => readRosterCsv(`name,email,cohort,sponsor name,sponsor email\n${text}`).rows;

  it("lists each row's problems: missing, malformed, duplicate, taken, unknown cohort", () => {
    const existing = new Map<string, ExistingAccount>([
      ["taken@example.test", { id: "p1", sameSchool: true, isSponsor: false }],
      ["elsewhere@example.test", { id: "p2", sameSchool: false, isSponsor: false }],
    ]);
    const out = checkRosterRows(
      rows(
        [
          "Fine,fine@example.test,Alpha 2026,,",
          ",nobody@example.test,alpha 2026,,",
          "Bad,not-an-address,Alpha 2026,,",
          "Twin,FINE@example.test,Alpha 2026,,",
          "Old,taken@example.test,Alpha 2026,,",
          "Away,elsewhere@example.test,Alpha 2026,,",
          "Lost,lost@example.test,Beta,,",
        ].join("\n"),
      ),
      cohorts,
      existing,
    );
    expect(out.map((r) => r.problems)).toEqual([
      [],
      ["name: missing"],
      ["e-mail: not a valid address"],
      ["e-mail: duplicate of line 2 in this file"],
      ["e-mail: already an account"],
      ["e-mail: already an account at another school"],
      ['cohort: no cohort named "Beta" that you may add to'],
    ]);
    expect(out[0]!.cohortId).toBe("cohort-a");
    expect(out[1]!.cohortId).toBe("cohort-a");
    expect(out[6]!.cohortId).toBeNull();
  });

  it("checks the sponsor: valid address, not the student, an existing account must be a sponsor of this school, a new one needs a name", () => {
    const existing = new Map<string, ExistingAccount>([
      ["sponsor@example.test", { id: "s1", sameSchool: true, isSponsor: true }],
      ["teacher@example.test", { id: "t1", sameSchool: true, isSponsor: false }],
    ]);
    const out = checkRosterRows(
      rows(
        [
          "A,a@example.test,Alpha 2026,,sponsor@example.test",
          "B,b@example.test,Alpha 2026,Someone,teacher@example.test",
          "C,c@example.test,Alpha 2026,Self,c@example.test",
          "D,d@example.test,Alpha 2026,,new@example.test",
          "E,e@example.test,Alpha 2026,Only Name,",
          "F,f@example.test,Alpha 2026,X,not-mail",
        ].join("\n"),
      ),
      cohorts,
      existing,
    );
    expect(out.map((r) => r.problems)).toEqual([
      [],
      ["sponsor e-mail: belongs to an account that is not a sponsor of this school"],
      ["sponsor e-mail: the same as the student's"],
      ["sponsor name: missing (needed for a new sponsor)"],
      ["sponsor e-mail: missing"],
      ["sponsor e-mail: not a valid address"],
    ]);
  });

  it("has nothing to say about a clean file", () => {
    expect(checkRosterRows(rows("A,a@example.test,Alpha 2026,,"), cohorts, none)[0]!.problems).toEqual([]);
  });
});

describe("firstBlockingProblem", () => {
  const rows = (text: string) => readRosterCsv(`name,email,cohort,sponsor email\n${text}`).rows;
  const names = new Set(cohorts.keys());

  it("names the first line that cannot be written", () => {
    expect(firstBlockingProblem(rows("A,a@example.test,Alpha 2026,\nB,b@example.test,Beta,\n"), names)).toBe(
      "line 3: cohort: not one you may add to",
    );
    expect(firstBlockingProblem(rows("A,a@example.test,Alpha 2026,\nA2,A@example.test,Alpha 2026,\n"), names)).toBe(
      "line 3: e-mail: duplicate in this file",
    );
    expect(firstBlockingProblem(rows(",a@example.test,Alpha 2026,\n"), names)).toBe("line 2: name: missing");
    expect(firstBlockingProblem(rows("A,a@example.test,Alpha 2026,bad\n"), names)).toBe("line 2: sponsor e-mail: not a valid address");
  });

  it("passes a file whose rows can all be written", () => {
    expect(firstBlockingProblem(rows("A,a@example.test,Alpha 2026,s@example.test\nB,b@example.test,alpha 2026,\n"), names)).toBeNull();
  });
});
