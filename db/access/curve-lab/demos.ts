import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { DemoSpec } from "@/lib/curve-lab/demo-spec";
import { demoSpecSchema } from "@/lib/curve-lab/schema";

/**
 * Demos: a parent row (name, owner, current revision) and numbered revisions holding the spec,
 * the same pattern as syllabus revisions. This file reads them; save-demo.ts changes them.
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

/** SQL: demo `d` is in use (assigned, part of a briefing revision, or called by a student). */
export const IN_USE_SQL = `(
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
