import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { dateInZone } from "@/lib/time";
import { itemOwnOutcome, type QuestionOutcome, type LevelOfLearning } from "@/lib/records/outcome";
import { itemStatus, outcomesByDate, type ItemStatus } from "@/lib/records/progress";
import { requireStudentFor, type ViewerAccess } from "../shared/student-scope";
import { getSchool } from "../shared/school";
import { creditedMinutesFor } from "../ground-log/ground-hours";
import { transferCreditedItems } from "../transfers/credits";
import { itemsOfRevision } from "./items";
import { stageReadiness, type StageReadiness } from "./stage-readiness";
import { currentSignOffs } from "./sign-offs";
import { listChecksOfStudent, type CheckSummary } from "./check-history";

// The Progress map of one student (cross-area contract: `progressFor(viewer, studentId)`).

export interface ProgressMap {
  student: { id: string; name: string; cohortName: string | null; courseCode: string; courseTitle: string; enrolledOn: string };
  access: ViewerAccess;
  stages: (StageReadiness & {
    items: {
      id: string;
      code: string;
      title: string;
      requiredLevel: LevelOfLearning;
      status: ItemStatus;
      lastOutcome: QuestionOutcome | null;
      lastCheckedOn: string | null;
      signedOn: string | null;
      signerName: string | null;
      /** the passing stage check of the item's stage: its examiner and date */
      stagePassed: { examinerName: string; on: string } | null;
      /** credited by transfer from an earlier school (the school's name and the day of this school's test) */
      transferCredit: { sourceSchool: string; on: string } | null;
    }[];
  })[];
  ground: { minutes: number; minimumMinutes: number } | null;
  checks: CheckSummary[];
  /** per check date: how many question outcomes of each kind */
  chart: { date: string; solid: number; shaky: number; notYet: number }[];
}

/**
 * The Progress map of a student, for the viewer: the student themself, an instructor of their
 * cohorts, the chief, or a sponsor the student shares progress with (as examiner: also a
 * designated check instructor). Remarks reach staff only; a sponsor sees outcomes but not the
 * questions and answers, and ground time only when the student shares hours. Anyone else: 404.
 */
export async function progressFor(viewer: CurrentUser, studentId: string, opts: { asExaminer?: boolean } = {}): Promise<ProgressMap> {
  const { student, access } = await requireStudentFor(viewer, studentId, opts.asExaminer ? "examiner" : "progress");
  const school = await getSchool(viewer.schoolId);
  const items = await itemsOfRevision(student.revisionId);
  const signOffs = await currentSignOffs(student.id);
  const stages = await stageReadiness(student, undefined, { items, signOffs });
  const signed = new Map(signOffs.map((s) => [s.itemId, s]));
  const checks = await listChecksOfStudent(viewer.schoolId, student.id, { withRemarks: access === "staff" });
  const inForce = checks.filter((c) => !c.withdrawn && !c.amendedBy);
  // each item's own result in its latest check in force (over all its questions in that check)
  const last = new Map<string, { outcome: QuestionOutcome; on: string }>();
  for (const c of inForce) {
    const qs = c.questions.map((q) => ({ syllabusItemId: q.itemCode, outcome: q.outcome, required: q.required }));
    for (const code of c.itemCodes) {
      if (last.has(code)) continue;
      const outcome = itemOwnOutcome(code, qs);
      if (outcome) last.set(code, { outcome, on: dateInZone(c.occurredAt, school.timeZone) });
    }
  }
  const taught = new Set(
    (
      await sequelize.query<{ item_id: string }>(
        `SELECT DISTINCT x.item_id FROM ground_log_current g CROSS JOIN LATERAL unnest(g.syllabus_item_ids) AS x(item_id)
          WHERE g.student_id = :id AND g.status IN ('attended','late','left_early')`,
        { replacements: { id: student.id }, type: QueryTypes.SELECT },
      )
    ).map((r) => r.item_id),
  );
  const passedBy = new Map(
    stages.flatMap((s) => {
      const pass = s.attempts.find((a) => a.result === "pass");
      return pass ? [[s.stageId, { examinerName: pass.examinerName, on: dateInZone(pass.occurredAt, school.timeZone) }] as const] : [];
    }),
  );
  const passed = new Set(stages.filter((s) => s.passed).map((s) => s.stageId));
  const transferred = await transferCreditedItems(student.id, student.courseId);
  const checkedItems = new Set(inForce.flatMap((c) => c.itemCodes));
  let ground: ProgressMap["ground"] = {
    minutes: await creditedMinutesFor(student.id, student.courseId),
    minimumMinutes: student.minGroundMinutes,
  };
  if (access === "sponsor") {
    const [link] = await sequelize.query<{ shares_hours: boolean }>(
      `SELECT shares_hours FROM sponsor_links WHERE sponsor_id = :s AND student_id = :st`,
      { replacements: { s: viewer.id, st: student.id }, type: QueryTypes.SELECT },
    );
    if (!link?.shares_hours) ground = null;
  }
  return {
    student: {
      id: student.id,
      name: student.name,
      cohortName: student.cohortName,
      courseCode: student.courseCode,
      courseTitle: student.courseTitle,
      enrolledOn: student.enrolledOn,
    },
    access,
    stages: stages.map((s) => ({
      ...s,
      items: items
        .filter((i) => i.stageId === s.stageId)
        .map((i) => {
          const so = signed.get(i.id);
          const l = last.get(i.code);
          return {
            id: i.id,
            code: i.code,
            title: i.title,
            requiredLevel: i.requiredLevel,
            status: itemStatus({
              stagePassed: passed.has(i.stageId),
              signed: !!so,
              checked: checkedItems.has(i.code),
              taught: taught.has(i.id),
            }),
            lastOutcome: l?.outcome ?? null,
            lastCheckedOn: l?.on ?? null,
            signedOn: so?.signedOn ?? null,
            signerName: so?.signerName ?? null,
            stagePassed: passed.has(i.stageId) ? (passedBy.get(i.stageId) ?? null) : null,
            transferCredit: transferred.get(i.id) ?? null,
          };
        }),
    })),
    ground,
    checks: access === "sponsor" ? checks.map((c) => ({ ...c, questions: [], remarks: undefined })) : checks,
    chart: outcomesByDate(inForce, school.timeZone),
  };
}
