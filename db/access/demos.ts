import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../index";
import { Demo, DemoRevision, DemoCall, type CallMarkerKind } from "../models";
import { HttpError } from "@/lib/http/errors";
import type { DemoSpec } from "@/components/charts/demo-spec";
import { demoSpecSchema } from "@/components/charts/demo-spec-schema";
import type { CurrentUser } from "@/lib/auth/session";

/**
 * Demos: a parent row (name, owner, current revision) and numbered revisions holding the spec,
 * the same pattern as syllabus revisions. A demo that is in use (assigned, part of a briefing
 * revision, or called by a student) is never changed under its users: saving it makes a new
 * revision. An unused demo's current revision is updated in place.
 */

export interface DemoSummary {
  id: string;
  name: string;
  ownerId: string;
  ownerName: string;
  revisionId: string;
  revisionNumber: number;
  airframeName: string;
  caseCount: number;
  inUse: boolean;
  updatedAt: string;
}

export interface DemoRevisionView {
  id: string;
  demoId: string;
  demoName: string;
  number: number;
  spec: DemoSpec;
  createdAt: string;
}

export interface DemoView {
  id: string;
  name: string;
  ownerId: string;
  ownerName: string;
  inUse: boolean;
  revision: DemoRevisionView;
}

const IN_USE_SQL = `(
  EXISTS (SELECT 1 FROM assignments a WHERE a.demo_id = d.id)
  OR EXISTS (SELECT 1 FROM briefing_revision_demos b JOIN demo_revisions r2 ON r2.id = b.demo_revision_id WHERE r2.demo_id = d.id)
  OR EXISTS (SELECT 1 FROM demo_calls c JOIN demo_revisions r3 ON r3.id = c.demo_revision_id WHERE r3.demo_id = d.id)
)`;

/** Every live demo of the school, for instructors and the chief. */
export async function listDemos(schoolId: string): Promise<DemoSummary[]> {
  const rows = await sequelize.query<Omit<DemoSummary, "updatedAt"> & { updatedAt: Date }>(
    `SELECT d.id, d.name, d.owner_id AS "ownerId", p.name AS "ownerName", r.id AS "revisionId", r.number AS "revisionNumber",
            r.spec->'airframe'->>'name' AS "airframeName", jsonb_array_length(r.spec->'cases')::int AS "caseCount",
            ${IN_USE_SQL} AS "inUse", d.updated_at AS "updatedAt"
       FROM demos d JOIN demo_revisions r ON r.id = d.current_revision_id JOIN people p ON p.id = d.owner_id
      WHERE d.school_id = :schoolId AND d.deleted_at IS NULL
      ORDER BY d.updated_at DESC, d.name`,
    { replacements: { schoolId }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ ...r, updatedAt: new Date(r.updatedAt).toISOString() }));
}

function revisionView(r: {
  id: string;
  demoId: string;
  demoName: string;
  number: number;
  spec: unknown;
  createdAt: Date;
}): DemoRevisionView {
  return {
    id: r.id,
    demoId: r.demoId,
    demoName: r.demoName,
    number: r.number,
    spec: demoSpecSchema.parse(r.spec),
    createdAt: new Date(r.createdAt).toISOString(),
  };
}

/** One revision of a school's demo (for other areas: briefings, assignments). Null when not of this school. */
export async function getDemoRevision(schoolId: string, demoRevisionId: string): Promise<DemoRevisionView | null> {
  if (!/^[0-9a-f-]{36}$/i.test(demoRevisionId)) return null;
  const [r] = await sequelize.query<{ id: string; demoId: string; demoName: string; number: number; spec: unknown; createdAt: Date }>(
    `SELECT r.id, r.demo_id AS "demoId", d.name AS "demoName", r.number, r.spec, r.created_at AS "createdAt"
       FROM demo_revisions r JOIN demos d ON d.id = r.demo_id
      WHERE r.id = :demoRevisionId AND d.school_id = :schoolId`,
    { replacements: { schoolId, demoRevisionId }, type: QueryTypes.SELECT },
  );
  return r ? revisionView(r) : null;
}

/** A live demo with its current revision. */
export async function getDemo(schoolId: string, demoId: string, t?: Transaction): Promise<DemoView | null> {
  if (!/^[0-9a-f-]{36}$/i.test(demoId)) return null;
  const [d] = await sequelize.query<{ id: string; name: string; ownerId: string; ownerName: string; inUse: boolean; revisionId: string }>(
    `SELECT d.id, d.name, d.owner_id AS "ownerId", p.name AS "ownerName", ${IN_USE_SQL} AS "inUse", d.current_revision_id AS "revisionId"
       FROM demos d JOIN people p ON p.id = d.owner_id
      WHERE d.id = :demoId AND d.school_id = :schoolId AND d.deleted_at IS NULL`,
    { replacements: { schoolId, demoId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!d) return null;
  const revision = await getDemoRevision(schoolId, d.revisionId);
  if (!revision) return null;
  return { id: d.id, name: d.name, ownerId: d.ownerId, ownerName: d.ownerName, inUse: d.inUse, revision };
}

export async function listDemoRevisions(schoolId: string, demoId: string): Promise<{ id: string; number: number; createdAt: string }[]> {
  const rows = await sequelize.query<{ id: string; number: number; createdAt: Date }>(
    `SELECT r.id, r.number, r.created_at AS "createdAt" FROM demo_revisions r JOIN demos d ON d.id = r.demo_id
      WHERE d.id = :demoId AND d.school_id = :schoolId ORDER BY r.number DESC`,
    { replacements: { schoolId, demoId }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ ...r, createdAt: new Date(r.createdAt).toISOString() }));
}

/** The demo, locked for a change by `user`: only its owner or a chief instructor may change it. */
async function lockForChange(user: CurrentUser, demoId: string, t: Transaction): Promise<Demo> {
  const d = await Demo.findOne({ where: { id: demoId, schoolId: user.schoolId, deletedAt: null }, transaction: t, lock: t.LOCK.UPDATE });
  if (!d) throw new HttpError(404, "demoId: no such demo", "demoId");
  if (d.ownerId !== user.id && !user.roles.includes("chief")) {
    throw new HttpError(
      403,
      "demoId: only the demo's owner or the chief instructor can change it; duplicate it to make your own",
      "demoId",
    );
  }
  return d;
}

async function inUse(demoId: string, t: Transaction): Promise<boolean> {
  const [r] = await sequelize.query<{ used: boolean }>(`SELECT ${IN_USE_SQL} AS used FROM demos d WHERE d.id = :demoId`, {
    replacements: { demoId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  return r?.used ?? false;
}

export async function createDemo(user: CurrentUser, name: string, spec: DemoSpec, t: Transaction) {
  const d = await Demo.create(
    { schoolId: user.schoolId, name, ownerId: user.id, currentRevisionId: null, deletedAt: null },
    { transaction: t },
  );
  const r = await DemoRevision.create({ demoId: d.id, number: 1, spec, createdBy: user.id }, { transaction: t });
  await d.update({ currentRevisionId: r.id }, { transaction: t });
  return { demoId: d.id, revisionId: r.id, revisionNumber: 1, newRevision: true };
}

/** Saves a spec: a new numbered revision when the demo is in use, otherwise over the current one. */
export async function saveDemoSpec(user: CurrentUser, demoId: string, spec: DemoSpec, t: Transaction) {
  const d = await lockForChange(user, demoId, t);
  if (await inUse(demoId, t)) {
    const last = (await DemoRevision.max("number", { where: { demoId }, transaction: t })) as number | null;
    const r = await DemoRevision.create({ demoId, number: (last ?? 0) + 1, spec, createdBy: user.id }, { transaction: t });
    await d.update({ currentRevisionId: r.id, updatedAt: new Date() }, { transaction: t });
    return { demoId, revisionId: r.id, revisionNumber: r.number, newRevision: true };
  }
  const current = await DemoRevision.findOne({ where: { id: d.currentRevisionId!, demoId }, transaction: t });
  if (!current) throw new HttpError(404, "demoId: the demo has no revision", "demoId");
  await current.update({ spec }, { transaction: t });
  await d.update({ updatedAt: new Date() }, { transaction: t });
  return { demoId, revisionId: current.id, revisionNumber: current.number, newRevision: false };
}

export async function renameDemo(user: CurrentUser, demoId: string, name: string, t: Transaction) {
  const d = await lockForChange(user, demoId, t);
  await d.update({ name, updatedAt: new Date() }, { transaction: t });
  return { demoId, name };
}

/** Any instructor may duplicate a school demo; the copy is theirs, starting at revision 1. */
export async function duplicateDemo(user: CurrentUser, demoId: string, t: Transaction) {
  const source = await getDemo(user.schoolId, demoId, t);
  if (!source) throw new HttpError(404, "demoId: no such demo", "demoId");
  return createDemo(user, `Copy of ${source.name}`.slice(0, 120), source.revision.spec, t);
}

/** Deletes (hides) an unused demo; a demo in use is kept for those who use it. */
export async function deleteDemo(user: CurrentUser, demoId: string, t: Transaction) {
  const d = await lockForChange(user, demoId, t);
  if (await inUse(demoId, t)) {
    throw new HttpError(
      409,
      "demoId: this demo is assigned, part of a briefing or already called by students, so it is kept; duplicate it or leave it",
      "demoId",
    );
  }
  await d.update({ deletedAt: new Date() }, { transaction: t });
  return { demoId, deleted: true };
}

export async function recordCall(
  input: {
    schoolId: string;
    demoRevisionId: string;
    studentId: string;
    markerKind: CallMarkerKind;
    speedAxis: "equivalent" | "true";
    predictedMs: number;
    actualMs: number;
  },
  t: Transaction,
) {
  const c = await DemoCall.create({ ...input, errorMs: input.predictedMs - input.actualMs }, { transaction: t });
  return { id: c.id, predictedMs: c.predictedMs, actualMs: c.actualMs, errorMs: c.errorMs, createdAt: c.createdAt.toISOString() };
}

export interface CallRow {
  id: string;
  studentId: string;
  studentName: string;
  revisionNumber: number;
  markerKind: CallMarkerKind;
  speedAxis: "equivalent" | "true";
  predictedMs: number;
  actualMs: number;
  errorMs: number;
  createdAt: string;
}

/**
 * Calls made on a demo (any of its revisions), scoped to the viewer: the chief instructor sees
 * all; an instructor sees the calls of students in the cohorts they lead; a student their own.
 */
export async function listCallsForDemo(viewer: CurrentUser, demoId: string): Promise<CallRow[]> {
  const chief = viewer.roles.includes("chief");
  const instructor = viewer.roles.includes("instructor");
  const rows = await sequelize.query<Omit<CallRow, "createdAt"> & { createdAt: Date }>(
    `SELECT c.id, c.student_id AS "studentId", p.name AS "studentName", r.number AS "revisionNumber", c.marker_kind AS "markerKind",
            c.speed_axis AS "speedAxis", c.predicted_ms AS "predictedMs", c.actual_ms AS "actualMs", c.error_ms AS "errorMs", c.created_at AS "createdAt"
       FROM demo_calls c JOIN demo_revisions r ON r.id = c.demo_revision_id JOIN demos d ON d.id = r.demo_id JOIN people p ON p.id = c.student_id
      WHERE d.id = :demoId AND d.school_id = :schoolId AND c.school_id = :schoolId
        AND (:chief OR c.student_id = :viewerId OR (:instructor AND EXISTS (
              SELECT 1 FROM cohort_memberships m JOIN cohorts co ON co.id = m.cohort_id
               WHERE m.student_id = c.student_id AND m.to_date IS NULL AND co.lead_instructor_id = :viewerId)))
      ORDER BY c.created_at DESC`,
    { replacements: { demoId, schoolId: viewer.schoolId, chief, instructor, viewerId: viewer.id }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ ...r, createdAt: new Date(r.createdAt).toISOString() }));
}
