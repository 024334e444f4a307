import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { Demo, DemoRevision } from "../../models";
import { HttpError } from "@/lib/http/errors";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import type { DemoSpec } from "@/lib/curve-lab/demo-spec";
import { IN_USE_SQL, getDemo } from "./demos";
import { capCreates } from "../shared/create-cap";

/**
 * Saving demos. A demo that is in use (assigned, part of a briefing revision, or called by a
 * student) is never changed under its users: saving it makes a new revision. An unused demo's
 * current revision is updated in place.
 */

/** The demo, locked for a change by `user`: only its owner, or one who may manage every demo, may change it. */
async function lockForChange(user: CurrentUser, demoId: string, t: Transaction): Promise<Demo> {
  const d = await Demo.findOne({ where: { id: demoId, schoolId: user.schoolId, deletedAt: null }, transaction: t, lock: t.LOCK.UPDATE });
  if (!d) throw new HttpError(404, "demoId: no such demo", "demoId");
  if (d.ownerId !== user.id && !can(user, "demos.manage")) {
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
  await capCreates(t, user, "demos");
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
