import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { Briefing, BriefingRevision, type BriefingElement, type HandoutContentType } from "../../models";
import type { CurrentUser } from "@/lib/auth/session";
import { canViewBriefing } from "./visibility";

// Briefings (lesson plans): a parent row plus numbered revisions that are never changed.
// Reading one briefing at one of its revisions.

export interface BriefingView {
  id: string;
  courseId: string;
  ownerId: string;
  currentNumber: number;
  revision: {
    id: string;
    number: number;
    title: string;
    objective: string;
    elements: BriefingElement[];
    equipment: string;
    completionStandard: string;
    syllabusRevisionId: string;
    syllabusRevisionNumber: number;
    changeNote: string;
    createdByName: string;
    createdAt: Date;
  };
  items: { id: string; code: string; title: string; completionStandard: string }[];
  demos: { demoRevisionId: string; demoId: string; name: string; revisionNumber: number }[];
  handouts: { id: string; fileName: string; contentType: HandoutContentType; byteSize: number }[];
  revisions: { number: number; createdAt: Date; createdByName: string; changeNote: string }[];
}

/** A briefing at one revision (default: the current one), or null when missing or not visible to the caller. */
export async function getBriefing(caller: CurrentUser, briefingId: string, revisionNumber?: number): Promise<BriefingView | null> {
  if (!(await canViewBriefing(caller, briefingId))) return null;
  const b = await Briefing.findOne({ where: { id: briefingId, schoolId: caller.schoolId } });
  if (!b || !b.currentRevisionId) return null;
  const revisions = await sequelize.query<{ id: string; number: number; createdAt: Date; createdByName: string; changeNote: string }>(
    `SELECT r.id, r.number, r.created_at AS "createdAt", p.name AS "createdByName", r.change_note AS "changeNote"
       FROM briefing_revisions r JOIN people p ON p.id = r.created_by WHERE r.briefing_id = :id ORDER BY r.number DESC`,
    { replacements: { id: briefingId }, type: QueryTypes.SELECT },
  );
  const current = revisions.find((r) => r.id === b.currentRevisionId)!;
  const chosen = revisionNumber === undefined ? current : revisions.find((r) => r.number === revisionNumber);
  if (!chosen) return null;
  const rev = (await BriefingRevision.findByPk(chosen.id))!;
  const [syl] = await sequelize.query<{ number: number }>(`SELECT number FROM syllabus_revisions WHERE id = :id`, {
    replacements: { id: rev.syllabusRevisionId },
    type: QueryTypes.SELECT,
  });
  const items = await sequelize.query<BriefingView["items"][number]>(
    `SELECT si.id, si.code, si.title, si.completion_standard AS "completionStandard"
       FROM briefing_revision_items ri JOIN syllabus_items si ON si.id = ri.syllabus_item_id
      WHERE ri.briefing_revision_id = :rev ORDER BY si.code`,
    { replacements: { rev: rev.id }, type: QueryTypes.SELECT },
  );
  const demos = await sequelize.query<BriefingView["demos"][number]>(
    `SELECT rd.demo_revision_id AS "demoRevisionId", d.id AS "demoId", d.name, dr.number AS "revisionNumber"
       FROM briefing_revision_demos rd JOIN demo_revisions dr ON dr.id = rd.demo_revision_id JOIN demos d ON d.id = dr.demo_id
      WHERE rd.briefing_revision_id = :rev AND d.deleted_at IS NULL ORDER BY rd.position`,
    { replacements: { rev: rev.id }, type: QueryTypes.SELECT },
  );
  const handouts = await sequelize.query<BriefingView["handouts"][number]>(
    `SELECT h.id, h.file_name AS "fileName", h.content_type AS "contentType", h.byte_size AS "byteSize"
       FROM briefing_revision_handouts rh JOIN handouts h ON h.id = rh.handout_id
      WHERE rh.briefing_revision_id = :rev ORDER BY rh.position`,
    { replacements: { rev: rev.id }, type: QueryTypes.SELECT },
  );
  return {
    id: b.id,
    courseId: b.courseId,
    ownerId: b.ownerId,
    currentNumber: current.number,
    revision: {
      id: rev.id,
      number: rev.number,
      title: rev.title,
      objective: rev.objective,
      elements: rev.elements,
      equipment: rev.equipment,
      completionStandard: rev.completionStandard,
      syllabusRevisionId: rev.syllabusRevisionId,
      syllabusRevisionNumber: syl?.number ?? 0,
      changeNote: rev.changeNote,
      createdByName: chosen.createdByName,
      createdAt: rev.createdAt,
    },
    items,
    demos,
    handouts,
    revisions: revisions.map(({ number, createdAt, createdByName, changeNote }) => ({ number, createdAt, createdByName, changeNote })),
  };
}
