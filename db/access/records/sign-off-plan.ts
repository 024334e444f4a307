import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { addDays, format, parseISO } from "date-fns";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone, formatDay } from "@/lib/time";
import { LEVEL_LABEL, levelReaches, type ItemOutcome, type LevelOfLearning } from "@/lib/records/outcome";
import { requireStudentFor } from "../shared/student-scope";
import { getSchool } from "../shared/school";
import type { StudentRef } from "../shared/enrolment";
import { itemsOfRevision, assertStageOpen, openMakeupItemIds, type ItemRef } from "./items";
import { RecordRefusal } from "./refusals";
import { refuseUnlessStanding } from "./signer-standing";

export { signerStanding } from "./signer-standing";

// Whether an item may be signed off, and the statement the signer signs: every rule that must
// hold before a sign-off, in order, each refusal naming its reason.

export interface SignOffInput {
  studentId: string;
  itemId: string;
  basisCheckId?: string | undefined;
  /** the date the sign-off is for (school calendar); default today */
  signedOn?: string | undefined;
  password: string;
}

interface BasisCheck {
  id: string;
  occurredAt: Date;
  levelShown: LevelOfLearning;
  itemOutcomes: ItemOutcome[];
  instructorName: string;
  withdrawn: boolean;
  superseded: boolean;
}

export interface SignOffPlan {
  student: StudentRef;
  item: ItemRef;
  basis: BasisCheck;
  signedOn: string;
  statement: string;
  signerName: string;
}

async function checksCovering(studentId: string, itemId: string, t?: Transaction): Promise<BasisCheck[]> {
  return sequelize.query<BasisCheck>(
    `SELECT c.id, c.occurred_at AS "occurredAt", c.level_shown AS "levelShown", c.item_outcomes AS "itemOutcomes", p.name AS "instructorName",
            EXISTS (SELECT 1 FROM oral_check_withdrawals w WHERE w.check_id = c.id) AS withdrawn,
            EXISTS (SELECT 1 FROM oral_checks a WHERE a.amends_id = c.id) AS superseded
       FROM oral_checks c JOIN oral_check_items ci ON ci.check_id = c.id JOIN people p ON p.id = c.instructor_id
      WHERE c.student_id = :studentId AND ci.syllabus_item_id = :itemId
      ORDER BY c.occurred_at DESC, c.recorded_at DESC`,
    { replacements: { studentId, itemId }, type: QueryTypes.SELECT, transaction: t },
  );
}

function statementText(p: {
  signerName: string;
  studentName: string;
  item: ItemRef;
  basis: BasisCheck;
  signedOn: string;
  timeZone: string;
}): string {
  return (
    `I, ${p.signerName}, certify that ${p.studentName} has met the completion standard of syllabus item ${p.item.code} "${p.item.title}" ` +
    `at the level of ${LEVEL_LABEL[p.item.requiredLevel].toLowerCase()} or above, on the basis of the oral check of ${formatDay(p.basis.occurredAt, p.timeZone)} ` +
    `recorded by ${p.basis.instructorName}. Signed for ${formatDay(p.signedOn)}.`
  );
}

/**
 * Everything that must hold before a sign-off, in order; throws a RecordRefusal naming the
 * reason. Used by the signing form (to show the statement) and by the signing itself.
 */
export async function planSignOff(user: CurrentUser, input: Omit<SignOffInput, "password">, t?: Transaction): Promise<SignOffPlan> {
  const { student } = await requireStudentFor(user, input.studentId, "records", t);
  const all = await itemsOfRevision(student.revisionId, t);
  const item = all.find((i) => i.id === input.itemId);
  if (!item) throw new HttpError(400, "itemId: not an item of the student's syllabus revision", "itemId");
  const school = await getSchool(user.schoolId, t);
  const today = dateInZone(now(), school.timeZone);
  const signedOn = input.signedOn ?? today;
  if (signedOn > today) throw new HttpError(400, "signedOn: cannot be in the future", "signedOn");

  await refuseUnlessStanding(user.id, student, signedOn, "sign off items", t);
  await assertStageOpen(student, [item], all, "itemId", t);
  if ((await openMakeupItemIds(student.id, t)).has(item.id))
    throw new RecordRefusal("makeup_open", `itemId: ${item.code} has an open make-up item; close it before signing off`, "itemId");

  const candidates = (await checksCovering(student.id, item.id, t)).filter((c) => !c.superseded);
  let basis: BasisCheck | undefined;
  if (input.basisCheckId) {
    basis = candidates.find((c) => c.id === input.basisCheckId);
    if (!basis)
      throw new RecordRefusal(
        "no_check",
        `basisCheckId: that check does not cover ${item.code} for this student, or was amended`,
        "basisCheckId",
      );
  } else {
    const inForce = candidates.filter((c) => !c.withdrawn);
    if (candidates.length === 0) throw new RecordRefusal("no_check", `itemId: no oral check of this student covers ${item.code}`, "itemId");
    if (inForce.length === 0) basis = candidates[0];
    else basis = inForce.find((c) => c.itemOutcomes.find((o) => o.itemId === item.id)?.meets) ?? inForce[0];
  }
  if (!basis) throw new RecordRefusal("no_check", `itemId: no oral check of this student covers ${item.code}`, "itemId");
  if (basis.withdrawn)
    throw new RecordRefusal(
      "check_withdrawn",
      `basisCheckId: the oral check of ${formatDay(basis.occurredAt, school.timeZone)} on ${item.code} was withdrawn`,
      "basisCheckId",
    );
  if (!levelReaches(basis.levelShown, item.requiredLevel)) {
    throw new RecordRefusal(
      "level_below_required",
      `basisCheckId: the check showed ${LEVEL_LABEL[basis.levelShown].toLowerCase()}; ${item.code} requires ${LEVEL_LABEL[item.requiredLevel].toLowerCase()}`,
      "basisCheckId",
    );
  }
  if (!basis.itemOutcomes.find((o) => o.itemId === item.id)?.meets) {
    throw new RecordRefusal(
      "not_meeting_standard",
      `basisCheckId: no oral check of this student on ${item.code} meets the standard`,
      "basisCheckId",
    );
  }
  const checkDate = dateInZone(basis.occurredAt, school.timeZone);
  const oldest = format(addDays(parseISO(signedOn), -school.settings.checkValidityDays), "yyyy-MM-dd");
  if (checkDate < oldest) {
    throw new RecordRefusal(
      "check_expired",
      `basisCheckId: the check of ${formatDay(checkDate)} is older than the school's limit of ${school.settings.checkValidityDays} days`,
      "basisCheckId",
    );
  }
  return {
    student,
    item,
    basis,
    signedOn,
    statement: statementText({ signerName: user.name, studentName: student.name, item, basis, signedOn, timeZone: school.timeZone }),
    signerName: user.name,
  };
}
