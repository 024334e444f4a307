import { creditFor, isAbsence } from "@/lib/timetable/crediting";
import { HttpError } from "@/lib/http/errors";

// The ground-time crediting rule (Chalkwing's own rule, no outside source): the session's length
// less late arrival and early departure; an absence earns nothing; a figure given by hand may only lower it.

const line = (
  status: "attended" | "late" | "left_early" | "absent_excused" | "absent",
  late = 0,
  early = 0,
  creditedMinutes?: number | "",
) => ({
  status,
  lateMinutes: late,
  earlyMinutes: early,
  creditedMinutes,
});

describe("creditFor", () => {
  it("attended earns the session length, late and left early lose their minutes, absence earns none", () => {
    expect(creditFor(90, line("attended")).credited).toBe(90);
    expect(creditFor(90, line("late", 15))).toEqual({ late: 15, early: 0, credited: 75 });
    expect(creditFor(90, line("left_early", 0, 30))).toEqual({ late: 0, early: 30, credited: 60 });
    expect(creditFor(90, line("absent")).credited).toBe(0);
    expect(creditFor(90, line("absent_excused")).credited).toBe(0);
  });

  it("ignores late and early minutes that do not belong to the status", () => {
    // minutes typed for "late" stay in the form when the status changes to attended or absent
    expect(creditFor(90, line("attended", 20, 10))).toEqual({ late: 0, early: 0, credited: 90 });
    expect(creditFor(90, line("left_early", 20, 10))).toEqual({ late: 0, early: 10, credited: 80 });
    expect(creditFor(90, line("absent", 20, 10))).toEqual({ late: 0, early: 0, credited: 0 });
  });

  it("a figure given by hand may lower the credit but never raise it", () => {
    expect(creditFor(90, line("attended", 0, 0, 80)).credited).toBe(80);
    expect(creditFor(90, line("late", 15, 0, 75)).credited).toBe(75);
    expect(creditFor(90, line("attended", 0, 0, 0)).credited).toBe(0);
    expect(creditFor(90, line("attended", 0, 0, "")).credited).toBe(90);
    expect(() => creditFor(90, line("attended", 0, 0, 95))).toThrow(/creditedMinutes: at most 90/);
    expect(() => creditFor(90, line("late", 15, 0, 80))).toThrow(/creditedMinutes: at most 75/);
  });

  it("an absence earns no minutes, even by hand", () => {
    expect(creditFor(90, line("absent", 0, 0, 0)).credited).toBe(0);
    expect(() => creditFor(90, line("absent", 0, 0, 10))).toThrow(/absence earns no minutes/);
  });

  it("refuses late or early without minutes, and lateness that uses up the whole session, naming the field", () => {
    const fieldOf = (f: () => unknown) => {
      try {
        f();
      } catch (e) {
        expect(e).toBeInstanceOf(HttpError);
        return [(e as HttpError).status, (e as HttpError).field];
      }
      throw new Error("expected a refusal");
    };
    expect(fieldOf(() => creditFor(90, line("late", 0)))).toEqual([400, "lateMinutes"]);
    expect(fieldOf(() => creditFor(90, line("left_early", 0, 0)))).toEqual([400, "earlyMinutes"]);
    expect(fieldOf(() => creditFor(60, line("late", 60)))).toEqual([400, "lateMinutes"]);
    expect(fieldOf(() => creditFor(90, line("attended", 0, 0, 95)))).toEqual([400, "creditedMinutes"]);
    expect(creditFor(60, line("late", 59)).credited).toBe(1);
  });
});

describe("isAbsence", () => {
  it("counts both kinds of absence and nothing else", () => {
    expect(["attended", "late", "left_early", "absent_excused", "absent"].filter((st) => isAbsence(st as never))).toEqual([
      "absent_excused",
      "absent",
    ]);
  });
});
