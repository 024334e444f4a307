import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { recordOralCheck, type OralCheckInput, type QuestionInput } from "@/db/access/records/record-oral-check";
import { signOff } from "@/db/access/records/sign-offs";
import { type SignOffInput } from "@/db/access/records/sign-off-plan";
import type { CurrentUser } from "@/lib/auth/session";
import type { makeSchool } from "@/tests/helpers/factories";
import { TEST_PASSWORD } from "@/tests/helpers/factories";

export type School = Awaited<ReturnType<typeof makeSchool>>;

export async function itemId(s: School, code: string): Promise<string> {
  const [r] = await sequelize.query<{ id: string }>(`SELECT id FROM syllabus_items WHERE revision_id = :rev AND code = :code`, {
    replacements: { rev: s.revision.id, code },
    type: QueryTypes.SELECT,
  });
  if (!r) throw new Error(`no item ${code}`);
  return r.id;
}

/** A check on the given items with one Solid required question each (override anything). */
export async function check(
  user: CurrentUser,
  studentId: string,
  items: string[],
  over: Partial<OralCheckInput> & { question?: Partial<QuestionInput> } = {},
) {
  const { question, ...rest } = over;
  return sequelize.transaction((t) =>
    recordOralCheck(t, user, {
      studentId,
      itemIds: items,
      levelShown: "correlation",
      remarks: "internal remark",
      durationMinutes: 10,
      occurredAt: new Date(Date.now() - 60_000),
      questions: items.map((id) => ({
        syllabusItemId: id,
        questionText: "Explain it",
        answerSummary: "explained",
        outcome: "solid",
        required: true,
        prompted: false,
        correctiveGiven: false,
        ...question,
      })),
      ...rest,
    }),
  );
}

export async function sign(user: CurrentUser, input: Omit<SignOffInput, "password"> & { password?: string }) {
  return sequelize.transaction((t) => signOff(t, user, { password: TEST_PASSWORD, ...input }));
}

export async function auditCount(schoolId: string, action: string, recordId?: string): Promise<number> {
  const [r] = await sequelize.query<{ n: number }>(
    `SELECT count(*)::int AS n FROM audit_events WHERE school_id = :schoolId AND action = :action AND (:recordId::uuid IS NULL OR record_id = :recordId::uuid)`,
    { replacements: { schoolId, action, recordId: recordId ?? null }, type: QueryTypes.SELECT },
  );
  return r?.n ?? 0;
}
