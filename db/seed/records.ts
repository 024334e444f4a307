import { QueryTypes } from "sequelize";
import { sequelize } from "../index";
import type { SeedContext } from "./extensions";
import type { CurrentUser } from "@/lib/auth/session";
import type { Role } from "@/lib/auth/roles";
import { recordOralCheck, type QuestionInput } from "../access/records/record-oral-check";
import { signOff, withdrawSignOff } from "../access/records/sign-offs";
import { RecordRefusal } from "../access/records/refusals";
import { now, setClock, resetClock } from "@/lib/clock";
import { DEMO_PASSWORD } from "./scenario";
import type { LevelOfLearning } from "@/lib/records/outcome";

const DAY = 86_400_000;

/**
 * Demo records, written through the Records services so that the audit chain is real:
 * checks and sign-offs for Kestrel students on AER items, one withdrawal with a reason,
 * a late entry and a repeated Not yet (both raise watch notes), and one student ready for
 * the AER stage check.
 */
export async function seedRecords(ctx: SeedContext): Promise<void> {
  const { t } = ctx;
  const people = await sequelize.query<{ id: string; name: string; roles: Role[] }>(
    `SELECT id, name, roles FROM people WHERE school_id = :s`,
    {
      replacements: { s: ctx.schoolId },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  const as = (id: string): CurrentUser => {
    const p = people.find((x) => x.id === id)!;
    return { id: p.id, name: p.name, roles: p.roles, schoolId: ctx.schoolId };
  };
  const tomasz = as(ctx.people.instructor);
  const chief = as(ctx.people.chief);
  const items = new Map(
    (
      await sequelize.query<{ id: string; code: string }>(`SELECT id, code FROM syllabus_items WHERE revision_id = :r`, {
        replacements: { r: ctx.revisionId },
        type: QueryTypes.SELECT,
        transaction: t,
      })
    ).map((i) => [i.code, i.id]),
  );
  const item = (code: string) => items.get(code)!;
  const st = (email: string) => ctx.students[email]!;
  const q = (code: string, text: string, outcome: QuestionInput["outcome"], extra: Partial<QuestionInput> = {}): QuestionInput => ({
    syllabusItemId: item(code),
    questionText: text,
    answerSummary: outcome === "solid" ? "Clear and complete." : outcome === "shaky" ? "Got there with a hint." : "Mixed up the two drags.",
    outcome,
    required: true,
    prompted: outcome !== "solid",
    correctiveGiven: outcome === "not_yet",
    ...extra,
  });
  // Records are written as if entered shortly after they happened (the clock is moved for the
  // write), so that only the deliberate late entry below raises a watch note.
  const start = now();
  const at = async <T>(when: Date, fn: () => Promise<T>): Promise<T> => {
    setClock(() => when);
    try {
      return await fn();
    } finally {
      resetClock();
    }
  };
  const ago = (days: number, plusMinutes = 0) => new Date(start.getTime() - days * DAY + plusMinutes * 60_000);
  const check = (
    user: CurrentUser,
    studentId: string,
    codes: string[],
    daysAgo: number,
    questions: QuestionInput[],
    level: LevelOfLearning = "correlation",
    remarks = "",
    enteredLate = false,
  ) => {
    const write = () =>
      recordOralCheck(t, user, {
        studentId,
        itemIds: codes.map(item),
        levelShown: level,
        remarks,
        durationMinutes: 12,
        occurredAt: ago(daysAgo),
        questions,
      });
    return enteredLate ? write() : at(ago(daysAgo, 25), write);
  };
  const sign = async (user: CurrentUser, studentId: string, code: string, daysAgo: number) => {
    try {
      return await at(ago(daysAgo, 60), () => signOff(t, user, { studentId, itemId: item(code), password: DEMO_PASSWORD }));
    } catch (e) {
      // another area's demo data may leave a make-up item open on this item: then it stays unsigned
      if (e instanceof RecordRefusal) {
        console.log(`[seed] records: ${code} not signed (${e.reason})`);
        return null;
      }
      throw e;
    }
  };

  // Ada Quill: AER-01 and AER-02 checked (she missed their session, so the make-up comes first);
  // AER-03 checked with a generated question, Shaky, not signed yet.
  const ada = st("student@chalkwing.test");
  await check(
    tomasz,
    ada,
    ["AER-01", "AER-02"],
    9,
    [
      q("AER-01", "Name the three parts of zero-lift drag, with an example of each.", "solid"),
      q("AER-01", "What happens to zero-lift drag when the speed doubles?", "solid"),
      q("AER-02", "Why does lift-dependent drag fall as speed rises in level flight?", "solid"),
    ],
    "correlation",
    "Confident; ready to move on.",
  );
  await check(
    tomasz,
    ada,
    ["AER-03"],
    2,
    [
      q("AER-03", "", "shaky", {
        questionText: undefined,
        generated: { kind: "vmd", aircraft: { kind: "reference", id: "lt-2" }, inputs: { massKg: 1000, altitudeFt: 4000 } },
        studentFigure: 77,
      }),
      q("AER-03", "Where on the total-drag curve are the two drags equal?", "solid"),
    ],
    "application",
    "Needs practice with the TAS correction.",
  );

  // Noor Brandt: Not yet on AER-02 twice (a watch note), then Solid.
  const noor = st("noor.brandt@chalkwing.test");
  await check(
    tomasz,
    noor,
    ["AER-02"],
    12,
    [q("AER-02", "Sketch lift-dependent drag against speed.", "not_yet")],
    "understanding",
    "Confuses lift-dependent and zero-lift drag.",
  );
  await check(
    tomasz,
    noor,
    ["AER-02"],
    5,
    [q("AER-02", "What does a higher aspect ratio do to lift-dependent drag?", "not_yet")],
    "rote",
    "Still not there; book a one-to-one.",
  );

  // Kofi Mensah: AER-03 signed, withdrawn with a reason, then signed again on a fresh check.
  const kofi = st("kofi.mensah@chalkwing.test");
  await check(tomasz, kofi, ["AER-03"], 20, [q("AER-03", "Where is Vmd on the total-drag curve, and why?", "solid")], "application");
  const first = await sign(tomasz, kofi, "AER-03", 20);
  if (first) {
    await at(ago(4), () =>
      withdrawSignOff(t, tomasz, {
        signOffId: first.id,
        reason: "Signed against a check of another student's session; re-checked below.",
        password: DEMO_PASSWORD,
      }),
    );
    await check(tomasz, kofi, ["AER-03"], 3, [q("AER-03", "What does 15 % more mass do to Vmd?", "solid")], "application");
    await sign(tomasz, kofi, "AER-03", 3);
  }

  // Elin Haugen: a check entered ten days after it happened (a late-entry watch note).
  await check(
    tomasz,
    st("elin.haugen@chalkwing.test"),
    ["AER-01"],
    10,
    [q("AER-01", "What is skin-friction drag?", "solid")],
    "understanding",
    "Entered late from paper notes.",
    true,
  );

  // Mateo Ferreira: every AER item signed: ready for the AER stage check.
  const mateo = st("mateo.ferreira@chalkwing.test");
  await check(
    tomasz,
    mateo,
    ["AER-01", "AER-02", "AER-03", "AER-04", "AER-05"],
    4,
    [
      q("AER-01", "Parts of zero-lift drag?", "solid"),
      q("AER-02", "Effect of mass on lift-dependent drag?", "solid"),
      q("AER-03", "", "solid", {
        questionText: undefined,
        generated: { kind: "vmd_heavier", aircraft: { kind: "reference", id: "lt-4" }, inputs: { massKg: 1100 } },
      }),
      q("AER-04", "", "solid", {
        questionText: undefined,
        generated: {
          kind: "stability_side",
          aircraft: { kind: "reference", id: "lt-2" },
          inputs: { massKg: 1050, altitudeFt: 2000, speedKt: 60 },
        },
      }),
      q("AER-05", "Where is Vmp relative to Vmd?", "solid"),
    ],
    "correlation",
  );
  for (const code of ["AER-01", "AER-02", "AER-03", "AER-04"]) await sign(tomasz, mateo, code, 4);
  await sign(chief, mateo, "AER-05", 3);

  // Targets for the authorisation harness and the screens: Saoirse has a meeting check on every
  // AER item with four of them signed; Beatriz has a meeting check on AER-01, not signed; Ivo has a
  // check recorded by the chief instructor.
  const saoirse = st("saoirse.dunleavy@chalkwing.test");
  await check(
    tomasz,
    saoirse,
    ["AER-01", "AER-02", "AER-03", "AER-04", "AER-05"],
    6,
    [
      q("AER-01", "What makes up zero-lift drag?", "solid"),
      q("AER-02", "What does weight do to lift-dependent drag?", "solid"),
      q("AER-03", "", "solid", {
        questionText: undefined,
        generated: { kind: "glide_distance", aircraft: { kind: "reference", id: "lt-2" }, inputs: { heightFt: 3000 } },
        studentFigure: 5.6,
      }),
      q("AER-04", "What happens after a gust slows you below Vmd with thrust held?", "solid"),
      q("AER-05", "Why is Vmp used for endurance?", "solid"),
    ],
    "correlation",
  );
  await sign(tomasz, saoirse, "AER-02", 6);
  await sign(chief, saoirse, "AER-03", 6);
  await sign(tomasz, saoirse, "AER-04", 6);
  await sign(chief, saoirse, "AER-05", 6);
  await check(
    tomasz,
    st("beatriz.solano@chalkwing.test"),
    ["AER-01"],
    1,
    [q("AER-01", "Which part of zero-lift drag does a wheel fairing reduce?", "solid")],
    "understanding",
  );
  await check(
    chief,
    st("ivo.petrak@chalkwing.test"),
    ["AER-01"],
    1,
    [q("AER-01", "Why does zero-lift drag grow with the square of speed?", "solid")],
    "understanding",
  );
}
