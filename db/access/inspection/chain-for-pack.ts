import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { verifyChain, chainHead, type VerifyRow } from "../records/audit-chain";
import type { PackInput } from "@/lib/inspection/content";

// The audit chain's verification printed in an inspection pack. A walk of the whole chain takes
// seconds per 100,000 events (11 s at 250,000), so the pack builds on the latest full walk that
// ended ok (asked for on the chain page, run in the background): that walk's last hash must still
// be the hash of the one row at its last position (and that row's content must still give it), and every event after it is checked now from
// there. With no such walk, a later walk that found a break, or a changed row at the walk's last
// position, the whole chain is walked here. The pack says which it was.

/** The chain as the pack prints it (its shape is the pack content's, lib/inspection/content.ts). */
export type PackChain = PackInput["chain"];

export async function chainForPack(schoolId: string): Promise<PackChain> {
  // the head first, then the walk (which may reach rows written in between)
  const head = await chainHead(schoolId);
  const [walk] = await sequelize.query<{ state: string; checked: string; checked_hash: string; finished_at: Date; by: string | null }>(
    `SELECT w.state, w.checked, w.checked_hash, w.finished_at, p.name AS by
       FROM audit_walks w LEFT JOIN people p ON p.id = w.requested_by
      WHERE w.school_id = :schoolId AND w.state IN ('ok', 'broken') ORDER BY w.finished_at DESC, w.id DESC LIMIT 1`,
    { replacements: { schoolId }, type: QueryTypes.SELECT },
  );
  if (walk?.state === "ok" && Number(walk.checked) > 0) {
    const through = Number(walk.checked);
    // the one row at the walk's last position still carries the walk's hash, and its content still gives it
    const atThrough = await sequelize.query<{ hash: string; intact: boolean }>(
      `SELECT e.hash, e.hash = audit_hash(e.prev_hash, e) AS intact FROM audit_events e
        WHERE e.school_id = :schoolId AND e.chain_pos = :through LIMIT 2`,
      { replacements: { schoolId, through }, type: QueryTypes.SELECT },
    );
    if (atThrough.length === 1 && atThrough[0]!.intact && atThrough[0]!.hash === walk.checked_hash) {
      const [r] = await sequelize.query<VerifyRow>(`SELECT * FROM audit_verify_from(:schoolId, :through, :hash)`, {
        replacements: { schoolId, through, hash: walk.checked_hash },
        type: QueryTypes.SELECT,
      });
      if (!r) throw new Error("audit_verify_from returned nothing");
      const checked = Number(r.checked);
      return {
        ok: r.ok,
        checked,
        headHash: r.ok ? r.head_hash : head.hash,
        headPosition: r.ok ? checked : head.position,
        lastGoodHash: r.head_hash,
        broken: r.ok ? null : { position: Number(r.broken_pos), problem: r.problem ?? "" },
        basis: { through, finishedAt: walk.finished_at, requestedBy: walk.by },
      };
    }
  }
  const chain = await verifyChain(schoolId);
  return {
    ok: chain.ok,
    checked: chain.checked,
    // a verified chain: the head the walk reached; a broken one: the newest row, and the last good link apart
    headHash: chain.ok ? chain.headHash : head.hash,
    headPosition: chain.ok ? chain.checked : head.position,
    lastGoodHash: chain.headHash,
    broken: chain.broken ? { position: chain.broken.position, problem: chain.broken.problem } : null,
    basis: null,
  };
}
