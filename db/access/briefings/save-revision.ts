import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import {
  Briefing,
  BriefingRevision,
  BriefingRevisionDemo,
  BriefingRevisionHandout,
  BriefingRevisionItem,
  type BriefingElement,
} from "../../models";
import { HttpError } from "@/lib/http/errors";
import type { CurrentUser } from "@/lib/auth/session";
import { capCreates } from "../shared/create-cap";

// Writing a briefing's next revision (or its first). Revisions are never changed: editing writes
// the next one, and a delivered session keeps pointing at the revision it used.

export interface BriefingInput {
  courseId: string;
  syllabusRevisionId: string;
  title: string;
  objective: string;
  syllabusItemIds: string[];
  elements: BriefingElement[];
  equipment: string;
  demoRevisionIds: string[];
  completionStandard: string;
  handoutIds: string[];
  changeNote: string;
}

/** The current revision of a briefing as editor input (what the next revision starts from). */
export async function briefingAsInput(caller: CurrentUser, briefingId: string, t?: Transaction): Promise<BriefingInput | null> {
  const b = await Briefing.findOne({ where: { id: briefingId, schoolId: caller.schoolId }, transaction: t });
  if (!b?.currentRevisionId) return null;
  const r = (await BriefingRevision.findByPk(b.currentRevisionId, { transaction: t }))!;
  const items = await BriefingRevisionItem.findAll({ where: { briefingRevisionId: r.id }, transaction: t });
  const demos = await BriefingRevisionDemo.findAll({ where: { briefingRevisionId: r.id }, order: [["position", "ASC"]], transaction: t });
  const handouts = await BriefingRevisionHandout.findAll({
    where: { briefingRevisionId: r.id },
    order: [["position", "ASC"]],
    transaction: t,
  });
  return {
    courseId: b.courseId,
    syllabusRevisionId: r.syllabusRevisionId,
    title: r.title,
    objective: r.objective,
    syllabusItemIds: items.map((i) => i.syllabusItemId).sort(),
    elements: r.elements,
    equipment: r.equipment,
    demoRevisionIds: demos.map((d) => d.demoRevisionId),
    completionStandard: r.completionStandard,
    handoutIds: handouts.map((h) => h.handoutId),
    changeNote: "",
  };
}

function sameContent(a: BriefingInput, b: BriefingInput): boolean {
  // A fixed key order, so the comparison does not depend on how the input object was built.
  const norm = (x: BriefingInput) =>
    JSON.stringify([
      x.courseId,
      x.syllabusRevisionId,
      x.title,
      x.objective,
      [...x.syllabusItemIds].sort(),
      x.elements.map((e) => [e.title, e.instructorActions, e.studentActions, e.minutes]),
      x.equipment,
      x.demoRevisionIds,
      x.completionStandard,
      x.handoutIds,
    ]);
  return norm(a) === norm(b);
}

/** Checks that everything the input points at belongs to this school, course and syllabus revision. */
async function checkReferences(caller: CurrentUser, input: BriefingInput, briefingId: string | null, t: Transaction) {
  const [course] = await sequelize.query<{ id: string }>(`SELECT id FROM courses WHERE id = :id AND school_id = :schoolId`, {
    replacements: { id: input.courseId, schoolId: caller.schoolId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if (!course) throw new HttpError(404, "courseId: no such course", "courseId");
  const [syl] = await sequelize.query<{ id: string }>(`SELECT id FROM syllabus_revisions WHERE id = :id AND course_id = :courseId`, {
    replacements: { id: input.syllabusRevisionId, courseId: input.courseId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if (!syl) throw new HttpError(400, "syllabusRevisionId: not a revision of this course's syllabus", "syllabusRevisionId");
  if (input.syllabusItemIds.length > 0) {
    const [n] = await sequelize.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM syllabus_items WHERE id IN (:ids) AND revision_id = :rev`,
      {
        replacements: { ids: input.syllabusItemIds, rev: input.syllabusRevisionId },
        type: QueryTypes.SELECT,
        transaction: t,
      },
    );
    if (n?.n !== new Set(input.syllabusItemIds).size)
      throw new HttpError(400, "syllabusItemIds: an item is not in the chosen syllabus revision", "syllabusItemIds");
  }
  if (input.demoRevisionIds.length > 0) {
    const [n] = await sequelize.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM demo_revisions dr JOIN demos d ON d.id = dr.demo_id
        WHERE dr.id IN (:ids) AND d.school_id = :schoolId AND d.deleted_at IS NULL`,
      { replacements: { ids: input.demoRevisionIds, schoolId: caller.schoolId }, type: QueryTypes.SELECT, transaction: t },
    );
    if (n?.n !== new Set(input.demoRevisionIds).size) throw new HttpError(400, "demoRevisionIds: no such demo", "demoRevisionIds");
  }
  if (input.handoutIds.length > 0) {
    const [n] = await sequelize.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM handouts WHERE id IN (:ids) AND briefing_id = :briefingId`,
      {
        replacements: { ids: input.handoutIds, briefingId: briefingId ?? "00000000-0000-0000-0000-000000000000" },
        type: QueryTypes.SELECT,
        transaction: t,
      },
    );
    if (n?.n !== new Set(input.handoutIds).size)
      throw new HttpError(400, "handoutIds: a handout does not belong to this briefing", "handoutIds");
  }
}

/**
 * Writes a briefing's next revision (or its first, with `briefingId` null). An input identical to
 * the current revision writes nothing and answers the current revision.
 */
export async function saveBriefingRevision(
  caller: CurrentUser,
  briefingId: string | null,
  input: BriefingInput,
  t: Transaction,
): Promise<{ briefingId: string; revisionId: string; number: number; created: boolean }> {
  let briefing: Briefing;
  if (briefingId) {
    const found = await Briefing.findOne({ where: { id: briefingId, schoolId: caller.schoolId }, transaction: t, lock: t.LOCK.UPDATE });
    if (!found) throw new HttpError(404, "briefingId: no such briefing", "briefingId");
    if (found.courseId !== input.courseId) throw new HttpError(400, "courseId: a briefing stays with its course", "courseId");
    briefing = found;
    const before = await briefingAsInput(caller, found.id, t);
    if (before && sameContent(before, input)) {
      const cur = (await BriefingRevision.findByPk(found.currentRevisionId!, { transaction: t }))!;
      return { briefingId: found.id, revisionId: cur.id, number: cur.number, created: false };
    }
  } else {
    await capCreates(t, caller, "briefings");
    briefing = await Briefing.create(
      { schoolId: caller.schoolId, courseId: input.courseId, ownerId: caller.id, currentRevisionId: null },
      { transaction: t },
    );
  }
  await checkReferences(caller, input, briefingId, t);
  const last = (await BriefingRevision.max("number", { where: { briefingId: briefing.id }, transaction: t })) as number | null;
  const rev = await BriefingRevision.create(
    {
      briefingId: briefing.id,
      number: (last ?? 0) + 1,
      title: input.title,
      objective: input.objective,
      elements: input.elements.map((e) => ({
        title: e.title,
        instructorActions: e.instructorActions,
        studentActions: e.studentActions,
        minutes: e.minutes,
      })),
      equipment: input.equipment,
      completionStandard: input.completionStandard,
      syllabusRevisionId: input.syllabusRevisionId,
      changeNote: input.changeNote,
      createdBy: caller.id,
    },
    { transaction: t },
  );
  if (input.syllabusItemIds.length) {
    await BriefingRevisionItem.bulkCreate(
      [...new Set(input.syllabusItemIds)].map((id) => ({ briefingRevisionId: rev.id, syllabusItemId: id })),
      { transaction: t },
    );
  }
  if (input.demoRevisionIds.length) {
    await BriefingRevisionDemo.bulkCreate(
      [...new Set(input.demoRevisionIds)].map((id, i) => ({ briefingRevisionId: rev.id, demoRevisionId: id, position: i + 1 })),
      { transaction: t },
    );
  }
  if (input.handoutIds.length) {
    await BriefingRevisionHandout.bulkCreate(
      [...new Set(input.handoutIds)].map((id, i) => ({ briefingRevisionId: rev.id, handoutId: id, position: i + 1 })),
      { transaction: t },
    );
  }
  await sequelize.query(`UPDATE briefings SET current_revision_id = :rev WHERE id = :id`, {
    replacements: { rev: rev.id, id: briefing.id },
    transaction: t,
  });
  return { briefingId: briefing.id, revisionId: rev.id, number: rev.number, created: true };
}
