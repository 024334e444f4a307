import "server-only";
import { createHash } from "node:crypto";
import { QueryTypes, type Transaction } from "sequelize";
import { inTransaction, sequelize } from "../../index";
import { Handout, type HandoutContentType } from "../../models";
import { HttpError } from "@/lib/http/errors";
import type { CurrentUser } from "@/lib/auth/session";
import { canViewBriefing } from "./visibility";
import { briefingAsInput, saveBriefingRevision } from "./save-revision";

// Handouts: files a briefing hands out. Adding one writes the briefing's next revision.

export const HANDOUT_MAX_BYTES = 10 * 1024 * 1024;

/** Stores a handout's bytes and writes the briefing's next revision that hands it out. */
export async function addHandout(
  caller: CurrentUser,
  briefingId: string,
  file: { fileName: string; contentType: HandoutContentType; bytes: Buffer },
  t: Transaction,
): Promise<{ handoutId: string; revisionNumber: number }> {
  const current = await briefingAsInput(caller, briefingId, t);
  if (!current) throw new HttpError(404, "briefingId: no such briefing", "briefingId");
  const h = await Handout.create(
    {
      schoolId: caller.schoolId,
      briefingId,
      fileName: file.fileName,
      contentType: file.contentType,
      byteSize: file.bytes.length,
      sha256: createHash("sha256").update(file.bytes).digest("hex"),
      content: file.bytes,
      uploadedBy: caller.id,
    },
    { transaction: t },
  );
  const saved = await saveBriefingRevision(
    caller,
    briefingId,
    { ...current, handoutIds: [...current.handoutIds, h.id], changeNote: `Handout added: ${file.fileName}` },
    t,
  );
  return { handoutId: h.id, revisionNumber: saved.number };
}

/** `addHandout` in a transaction of its own (the upload route's one write). */
export async function uploadHandout(
  caller: CurrentUser,
  briefingId: string,
  file: { fileName: string; contentType: HandoutContentType; bytes: Buffer },
): Promise<{ handoutId: string; revisionNumber: number }> {
  return inTransaction((t) => addHandout(caller, briefingId, file, t));
}

/** A handout's bytes for a caller who may read its briefing; null otherwise (the caller answers 403/404). */
export async function getHandoutFile(
  caller: CurrentUser,
  handoutId: string,
): Promise<{ status: "ok"; fileName: string; contentType: HandoutContentType; content: Buffer } | { status: "missing" | "forbidden" }> {
  const [meta] = await sequelize.query<{ briefingId: string }>(
    `SELECT briefing_id AS "briefingId" FROM handouts WHERE id = :id AND school_id = :schoolId`,
    {
      replacements: { id: handoutId, schoolId: caller.schoolId },
      type: QueryTypes.SELECT,
    },
  );
  if (!meta) return { status: "missing" };
  if (!(await canViewBriefing(caller, meta.briefingId))) return { status: "forbidden" };
  const h = await Handout.findByPk(handoutId);
  if (!h) return { status: "missing" };
  return { status: "ok", fileName: h.fileName, contentType: h.contentType, content: h.content };
}
export type { HandoutContentType };
