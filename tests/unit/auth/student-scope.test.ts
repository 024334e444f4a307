import { studentScopeFor, SPONSOR_SHARE_FLAGS, type ScopePurpose } from "@/lib/auth/student-scope";

// Which students each role may see, per purpose: the rule as data (lib/auth/student-scope.ts).

const NONE = { school: false, taught: false, examiner: false, own: false, sponsored: null };

describe("studentScopeFor", () => {
  it("gives the chief the whole school for every staff purpose, and nothing for mail", () => {
    for (const p of ["records", "examiner", "progress", "groundlog", "schedule"] as ScopePurpose[])
      expect(studentScopeFor(["chief"], p)).toEqual({ ...NONE, school: true });
    expect(studentScopeFor(["chief"], "mail")).toEqual(NONE);
  });

  it("gives an instructor the students they teach, and as examiner also every student (when designated)", () => {
    expect(studentScopeFor(["instructor"], "records")).toEqual({ ...NONE, taught: true });
    expect(studentScopeFor(["instructor"], "progress")).toEqual({ ...NONE, taught: true });
    expect(studentScopeFor(["instructor"], "examiner")).toEqual({ ...NONE, taught: true, examiner: true });
    expect(studentScopeFor(["instructor"], "mail")).toEqual(NONE);
  });

  it("gives a student themself for progress, Ground log and schedule, never for records or examining", () => {
    for (const p of ["progress", "groundlog", "schedule"] as ScopePurpose[])
      expect(studentScopeFor(["student"], p)).toEqual({ ...NONE, own: true });
    for (const p of ["records", "examiner", "mail"] as ScopePurpose[]) expect(studentScopeFor(["student"], p)).toEqual(NONE);
  });

  it("gives a sponsor the linked students who share that kind of information, never records", () => {
    expect(studentScopeFor(["sponsor"], "progress")).toEqual({ ...NONE, sponsored: ["shares_progress"] });
    expect(studentScopeFor(["sponsor"], "groundlog")).toEqual({ ...NONE, sponsored: ["shares_hours", "shares_attendance"] });
    expect(studentScopeFor(["sponsor"], "schedule")).toEqual({ ...NONE, sponsored: ["shares_schedule"] });
    expect(studentScopeFor(["sponsor"], "mail")).toEqual({ ...NONE, sponsored: ["weekly_letter"] });
    expect(studentScopeFor(["sponsor"], "records")).toEqual(NONE);
    expect(studentScopeFor(["sponsor"], "examiner")).toEqual(NONE);
    expect(SPONSOR_SHARE_FLAGS.records).toBeNull();
  });

  it("adds up the scopes of several roles, and gives no roles nothing", () => {
    expect(studentScopeFor(["chief", "instructor"], "records")).toEqual({ ...NONE, school: true, taught: true });
    expect(studentScopeFor(["instructor", "student"], "progress")).toEqual({ ...NONE, taught: true, own: true });
    expect(studentScopeFor([], "progress")).toEqual(NONE);
  });
});
