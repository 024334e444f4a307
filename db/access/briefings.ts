import "server-only";
import { createHash } from "node:crypto";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../index";
import {
  Briefing,
  BriefingRevision,
  BriefingRevisionDemo,
  BriefingRevisionHandout,
  BriefingRevisionItem,
  Handout,
  type BriefingElement,
  type HandoutContentType,
} from "../models";
import { HttpError } from "@/lib/http/errors";

// Briefings (lesson plans): a parent row plus numbered revisions that are never changed.
// Editing writes the next revision; a delivered session keeps pointing at the revision it used.

const existing = new Set<string>();
/** Whether another area's table exists yet (Curve Lab's demos, the Timetable's sessions). Positive answers are cached. */
export async function tableExists(name: string, t?: Transaction): Promise<boolean> {
  if (existing.has(name)) return true;
  const [row] = await sequelize.query<{ ok: boolean }>(`SELECT to_regclass(:n) IS NOT NULL AS ok`, {
    replacements: { n: `public.${name}` },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if (row?.ok) existing.add(name);
  return !!row?.ok;
}

export interface Viewer {
  id: string;
  schoolId: string;
  roles: readonly string[];
}

const isStaff = (v: Viewer) => v.roles.includes("chief") || v.roles.includes("instructor");

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

/**
 * The SQL condition "student :viewer may read briefing b": assigned to them (directly or through
 * their current cohort), or scheduled for them (a session of it they attend or their cohort's).
 */
async function studentVisibilitySql(): Promise<string> {
  const assigned = `EXISTS (SELECT 1 FROM assignment_students s WHERE s.briefing_id = b.id AND s.student_id = :viewer)`;
  if (!(await tableExists("training_sessions")) || !(await tableExists("session_attendees"))) return assigned;
  return `(${assigned} OR EXISTS (
            SELECT 1 FROM training_sessions ts
             WHERE ts.briefing_id = b.id AND ts.school_id = b.school_id AND ts.status <> 'cancelled'
               AND (EXISTS (SELECT 1 FROM session_attendees sa WHERE sa.session_id = ts.id AND sa.student_id = :viewer)
                    OR EXISTS (SELECT 1 FROM cohort_memberships m WHERE m.cohort_id = ts.cohort_id AND m.student_id = :viewer AND m.to_date IS NULL))))`;
}

/** Whether the viewer may read a briefing: staff of the same school, or a student it is assigned or scheduled for. */
export async function canViewBriefing(viewer: Viewer, briefingId: string): Promise<boolean> {
  const cond = isStaff(viewer) ? "true" : viewer.roles.includes("student") ? await studentVisibilitySql() : "false";
  const [row] = await sequelize.query<{ ok: boolean }>(
    `SELECT (${cond}) AS ok FROM briefings b WHERE b.id = :id AND b.school_id = :schoolId`,
    {
      replacements: { id: briefingId, schoolId: viewer.schoolId, viewer: viewer.id },
      type: QueryTypes.SELECT,
    },
  );
  return !!row?.ok;
}

// ---- list ---------------------------------------------------------------------------------------

export type BriefingSort = "title" | "updated" | "minutes" | "revision";
export interface BriefingListQuery {
  q?: string;
  item?: string;
  sort: BriefingSort;
  dir: "asc" | "desc";
  page: number;
  pageSize: number;
}
export interface BriefingListRow {
  id: string;
  title: string;
  revisionNumber: number;
  itemCodes: string[];
  minutes: number;
  handouts: number;
  demos: number;
  updatedAt: Date;
  updatedByName: string;
}

const SORT_SQL: Record<BriefingSort, string> = {
  title: `lower(r.title)`,
  updated: `r.created_at`,
  minutes: `minutes`,
  revision: `r.number`,
};

/** One page of the briefings the viewer may read, filtered and sorted on the server. */
export async function listBriefings(
  viewer: Viewer,
  query: BriefingListQuery,
): Promise<{ rows: BriefingListRow[]; total: number; page: number; pageSize: number }> {
  const visible = isStaff(viewer) ? "true" : viewer.roles.includes("student") ? await studentVisibilitySql() : "false";
  const where = `b.school_id = :schoolId AND ${visible}
      AND (:q::text IS NULL OR r.title ILIKE :qLike OR r.objective ILIKE :qLike)
      AND (:item::text IS NULL OR EXISTS (SELECT 1 FROM briefing_revision_items ri JOIN syllabus_items si ON si.id = ri.syllabus_item_id
                                         WHERE ri.briefing_revision_id = r.id AND si.code ILIKE :itemLike))`;
  const replacements = {
    schoolId: viewer.schoolId,
    viewer: viewer.id,
    q: query.q ?? null,
    qLike: `%${(query.q ?? "").replace(/[\\%_]/g, (c) => `\\${c}`)}%`,
    item: query.item ?? null,
    itemLike: `${(query.item ?? "").replace(/[\\%_]/g, (c) => `\\${c}`)}%`,
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  };
  const [count] = await sequelize.query<{ n: number }>(
    `SELECT count(*)::int AS n FROM briefings b JOIN briefing_revisions r ON r.id = b.current_revision_id WHERE ${where}`,
    { replacements, type: QueryTypes.SELECT },
  );
  const dir = query.dir === "asc" ? "ASC" : "DESC";
  const rows = await sequelize.query<BriefingListRow>(
    `SELECT b.id, r.title, r.number AS "revisionNumber", r.created_at AS "updatedAt", p.name AS "updatedByName",
            COALESCE((SELECT sum((e->>'minutes')::int) FROM jsonb_array_elements(r.elements) e), 0)::int AS minutes,
            ARRAY(SELECT si.code FROM briefing_revision_items ri JOIN syllabus_items si ON si.id = ri.syllabus_item_id
                   WHERE ri.briefing_revision_id = r.id ORDER BY si.code) AS "itemCodes",
            (SELECT count(*)::int FROM briefing_revision_handouts h WHERE h.briefing_revision_id = r.id) AS handouts,
            (SELECT count(*)::int FROM briefing_revision_demos d WHERE d.briefing_revision_id = r.id) AS demos
       FROM briefings b JOIN briefing_revisions r ON r.id = b.current_revision_id JOIN people p ON p.id = r.created_by
      WHERE ${where}
      ORDER BY ${SORT_SQL[query.sort]} ${dir}, b.id
      LIMIT :limit OFFSET :offset`,
    { replacements, type: QueryTypes.SELECT },
  );
  return { rows, total: count?.n ?? 0, page: query.page, pageSize: query.pageSize };
}

// ---- one briefing ---------------------------------------------------------------------------

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

/** A briefing at one revision (default: the current one), or null when missing or not visible to the viewer. */
export async function getBriefing(viewer: Viewer, briefingId: string, revisionNumber?: number): Promise<BriefingView | null> {
  if (!(await canViewBriefing(viewer, briefingId))) return null;
  const b = await Briefing.findOne({ where: { id: briefingId, schoolId: viewer.schoolId } });
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
  const demos = (await tableExists("demo_revisions"))
    ? await sequelize.query<BriefingView["demos"][number]>(
        `SELECT rd.demo_revision_id AS "demoRevisionId", d.id AS "demoId", d.name, dr.number AS "revisionNumber"
           FROM briefing_revision_demos rd JOIN demo_revisions dr ON dr.id = rd.demo_revision_id JOIN demos d ON d.id = dr.demo_id
          WHERE rd.briefing_revision_id = :rev AND d.deleted_at IS NULL ORDER BY rd.position`,
        { replacements: { rev: rev.id }, type: QueryTypes.SELECT },
      )
    : [];
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

/** The current revision of a briefing as editor input (what the next revision starts from). */
export async function briefingAsInput(viewer: Viewer, briefingId: string, t?: Transaction): Promise<BriefingInput | null> {
  const b = await Briefing.findOne({ where: { id: briefingId, schoolId: viewer.schoolId }, transaction: t });
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
async function checkReferences(viewer: Viewer, input: BriefingInput, briefingId: string | null, t: Transaction) {
  const [course] = await sequelize.query<{ id: string }>(`SELECT id FROM courses WHERE id = :id AND school_id = :schoolId`, {
    replacements: { id: input.courseId, schoolId: viewer.schoolId },
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
    if (!(await tableExists("demo_revisions", t))) throw new HttpError(400, "demoRevisionIds: demos are not available", "demoRevisionIds");
    const [n] = await sequelize.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM demo_revisions dr JOIN demos d ON d.id = dr.demo_id
        WHERE dr.id IN (:ids) AND d.school_id = :schoolId AND d.deleted_at IS NULL`,
      { replacements: { ids: input.demoRevisionIds, schoolId: viewer.schoolId }, type: QueryTypes.SELECT, transaction: t },
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
  viewer: Viewer,
  briefingId: string | null,
  input: BriefingInput,
  t: Transaction,
): Promise<{ briefingId: string; revisionId: string; number: number; created: boolean }> {
  let briefing: Briefing;
  if (briefingId) {
    const found = await Briefing.findOne({ where: { id: briefingId, schoolId: viewer.schoolId }, transaction: t, lock: t.LOCK.UPDATE });
    if (!found) throw new HttpError(404, "briefingId: no such briefing", "briefingId");
    if (found.courseId !== input.courseId) throw new HttpError(400, "courseId: a briefing stays with its course", "courseId");
    briefing = found;
    const before = await briefingAsInput(viewer, found.id, t);
    if (before && sameContent(before, input)) {
      const cur = (await BriefingRevision.findByPk(found.currentRevisionId!, { transaction: t }))!;
      return { briefingId: found.id, revisionId: cur.id, number: cur.number, created: false };
    }
  } else {
    briefing = await Briefing.create(
      { schoolId: viewer.schoolId, courseId: input.courseId, ownerId: viewer.id, currentRevisionId: null },
      { transaction: t },
    );
  }
  await checkReferences(viewer, input, briefingId, t);
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
      createdBy: viewer.id,
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

// ---- handouts ----------------------------------------------------------------------------------

export const HANDOUT_MAX_BYTES = 10 * 1024 * 1024;

/** Stores a handout's bytes and writes the briefing's next revision that hands it out. */
export async function addHandout(
  viewer: Viewer,
  briefingId: string,
  file: { fileName: string; contentType: HandoutContentType; bytes: Buffer },
  t: Transaction,
): Promise<{ handoutId: string; revisionNumber: number }> {
  const current = await briefingAsInput(viewer, briefingId, t);
  if (!current) throw new HttpError(404, "briefingId: no such briefing", "briefingId");
  const h = await Handout.create(
    {
      schoolId: viewer.schoolId,
      briefingId,
      fileName: file.fileName,
      contentType: file.contentType,
      byteSize: file.bytes.length,
      sha256: createHash("sha256").update(file.bytes).digest("hex"),
      content: file.bytes,
      uploadedBy: viewer.id,
    },
    { transaction: t },
  );
  const saved = await saveBriefingRevision(
    viewer,
    briefingId,
    { ...current, handoutIds: [...current.handoutIds, h.id], changeNote: `Handout added: ${file.fileName}` },
    t,
  );
  return { handoutId: h.id, revisionNumber: saved.number };
}

/** A handout's bytes for a viewer who may read its briefing; null otherwise (the caller answers 403/404). */
export async function getHandoutFile(
  viewer: Viewer,
  handoutId: string,
): Promise<{ status: "ok"; fileName: string; contentType: HandoutContentType; content: Buffer } | { status: "missing" | "forbidden" }> {
  const [meta] = await sequelize.query<{ briefingId: string }>(
    `SELECT briefing_id AS "briefingId" FROM handouts WHERE id = :id AND school_id = :schoolId`,
    {
      replacements: { id: handoutId, schoolId: viewer.schoolId },
      type: QueryTypes.SELECT,
    },
  );
  if (!meta) return { status: "missing" };
  if (!(await canViewBriefing(viewer, meta.briefingId))) return { status: "forbidden" };
  const h = await Handout.findByPk(handoutId);
  if (!h) return { status: "missing" };
  return { status: "ok", fileName: h.fileName, contentType: h.contentType, content: h.content };
}

// ---- choices for the editor ---------------------------------------------------------------------

export interface EditorChoices {
  courses: { id: string; code: string; title: string }[];
  syllabusRevisions: {
    id: string;
    courseId: string;
    number: number;
    items: { id: string; code: string; title: string; stage: string }[];
  }[];
  demos: { demoRevisionId: string; name: string; revisionNumber: number; current: boolean }[];
}

/** Courses, their syllabus revisions with items, and the school's demos (current revisions plus any `pinned`). */
export async function editorChoices(schoolId: string, pinnedDemoRevisionIds: string[] = []): Promise<EditorChoices> {
  const courses = await sequelize.query<EditorChoices["courses"][number]>(
    `SELECT id, code, title FROM courses WHERE school_id = :schoolId ORDER BY code`,
    {
      replacements: { schoolId },
      type: QueryTypes.SELECT,
    },
  );
  const items = await sequelize.query<{
    revId: string;
    courseId: string;
    number: number;
    id: string;
    code: string;
    title: string;
    stage: string;
  }>(
    `SELECT r.id AS "revId", r.course_id AS "courseId", r.number, i.id, i.code, i.title, s.title AS stage
       FROM syllabus_revisions r JOIN courses c ON c.id = r.course_id
       JOIN syllabus_items i ON i.revision_id = r.id JOIN syllabus_stages s ON s.id = i.stage_id
      WHERE c.school_id = :schoolId ORDER BY r.number DESC, s.position, i.position`,
    { replacements: { schoolId }, type: QueryTypes.SELECT },
  );
  const revs = new Map<string, EditorChoices["syllabusRevisions"][number]>();
  for (const i of items) {
    const r = revs.get(i.revId) ?? { id: i.revId, courseId: i.courseId, number: i.number, items: [] };
    r.items.push({ id: i.id, code: i.code, title: i.title, stage: i.stage });
    revs.set(i.revId, r);
  }
  const demos = (await tableExists("demo_revisions"))
    ? await sequelize.query<EditorChoices["demos"][number]>(
        `SELECT dr.id AS "demoRevisionId", d.name, dr.number AS "revisionNumber", (d.current_revision_id = dr.id) AS current
           FROM demo_revisions dr JOIN demos d ON d.id = dr.demo_id
          WHERE d.school_id = :schoolId AND d.deleted_at IS NULL
            AND (d.current_revision_id = dr.id OR dr.id IN (:pinned))
          ORDER BY d.name, dr.number DESC`,
        {
          replacements: {
            schoolId,
            pinned: pinnedDemoRevisionIds.length ? pinnedDemoRevisionIds : ["00000000-0000-0000-0000-000000000000"],
          },
          type: QueryTypes.SELECT,
        },
      )
    : [];
  return { courses, syllabusRevisions: [...revs.values()], demos };
}
