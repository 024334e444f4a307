import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { watchNoteKey, type WatchNote, type WatchNoteKind, type WatchNoteReview } from "@/lib/records/watch-notes";
import { writeAudit } from "./audit-chain";

// The chief's reviews of watch notes: appended (never changed or deleted) and audited in the
// same transaction. A note is named by its record, kind and item (notes are derived).

export interface ReviewInput {
  recordType: WatchNote["recordType"];
  recordId: string;
  kind: WatchNoteKind;
  itemCode?: string | null | undefined;
  remark: string;
}

/**
 * Marks a watch note reviewed. `notes` are the school's current watch notes (from the register):
 * a note that is not among them is a 404 naming the record.
 */
export async function reviewWatchNote(t: Transaction, user: CurrentUser, input: ReviewInput, notes: WatchNote[]) {
  const key = watchNoteKey(input);
  const note = notes.find((n) => watchNoteKey(n) === key);
  if (!note) throw new HttpError(404, "recordId: no such watch note", "recordId");
  const at = now();
  const remark = input.remark.trim();
  const [row] = await sequelize.query<{ id: string }>(
    `INSERT INTO watch_note_reviews (school_id, record_type, record_id, kind, item_code, remark, reviewed_by, reviewed_at)
     VALUES (:schoolId, :type, :id, :kind, :item, :remark, :by, :at) RETURNING id`,
    {
      replacements: {
        schoolId: user.schoolId,
        type: note.recordType,
        id: note.recordId,
        kind: note.kind,
        item: note.itemCode ?? "",
        remark,
        by: user.id,
        at,
      },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  if (!row) throw new Error("review not written");
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "watchnote.reviewed",
    recordType: note.recordType,
    recordId: note.recordId,
    after: { reviewId: row.id, kind: note.kind, itemCode: note.itemCode, detail: note.detail, remark },
    occurredAt: at,
  });
  return { id: row.id, reviewedAt: at };
}

/** Every review of the school's watch notes, by note key, newest last. */
export async function watchNoteReviews(schoolId: string): Promise<Map<string, WatchNoteReview[]>> {
  const rows = await sequelize.query<{
    record_type: WatchNote["recordType"];
    record_id: string;
    kind: WatchNoteKind;
    item_code: string;
    remark: string;
    reviewer: string;
    reviewed_at: Date;
  }>(
    `SELECT r.record_type, r.record_id, r.kind, r.item_code, r.remark, p.name AS reviewer, r.reviewed_at
       FROM watch_note_reviews r JOIN people p ON p.id = r.reviewed_by
      WHERE r.school_id = :schoolId ORDER BY r.reviewed_at`,
    { replacements: { schoolId }, type: QueryTypes.SELECT },
  );
  const out = new Map<string, WatchNoteReview[]>();
  for (const r of rows) {
    const key = watchNoteKey({ recordType: r.record_type, recordId: r.record_id, kind: r.kind, itemCode: r.item_code || null });
    const list = out.get(key) ?? [];
    list.push({ remark: r.remark, reviewerName: r.reviewer, reviewedAt: r.reviewed_at });
    out.set(key, list);
  }
  return out;
}
