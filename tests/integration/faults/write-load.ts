// Child process of restarts.test.ts (run with tsx and the react-server condition, DATABASE_URL
// pointing at a throwaway cluster): a write load of oral checks, each through the same steps as
// runAction with an idempotency key, retried with the same key on connection errors. Prints
// "READY" once its school exists, then one "ACK <key> <checkId>" per acknowledged write, and at the
// end one "SUMMARY <json>" read with the same Sequelize instance (so its pool has recovered). It
// writes at least FAULT_WRITES and goes on until the test writes "DONE" on its stdin (after the
// last fault), so a fast machine cannot finish the load before the faults.
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool } from "@/tests/helpers/factories";
import { lockIdempotencyKey, priorIdempotentResult, storeIdempotentResult, withTransaction } from "@/db/access/shared/transaction";
import { recordOralCheck } from "@/db/access/records/record-oral-check";
import { verifyChain } from "@/db/access/records/audit-chain";

const WRITES = Number(process.env.FAULT_WRITES ?? 200);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
let done = false;
process.stdin.on("data", (d: Buffer) => {
  if (d.toString().includes("DONE")) done = true;
});

/** Errors of a lost or refused connection: the client cannot know whether the write committed. */
function isConnectionError(e: unknown): boolean {
  const err = e as { name?: string; message?: string; original?: { code?: string }; parent?: { code?: string } };
  const code = err.original?.code ?? err.parent?.code ?? "";
  if (["57P01", "57P02", "57P03", "08000", "08003", "08006", "08001", "08004", "ECONNREFUSED", "ECONNRESET"].includes(code)) return true;
  if (/^Sequelize(Connection|ConnectionRefused|ConnectionAcquireTimeout|HostNotReachable)Error$/.test(err.name ?? "")) return true;
  return /terminat|ECONNREFUSED|ECONNRESET|Connection terminated|not yet accepting|shutting down|starting up|closed/i.test(
    err.message ?? "",
  );
}

async function main() {
  const s = await makeSchool("fault");
  const [item] = await sequelize.query<{ id: string }>(`SELECT id FROM syllabus_items WHERE revision_id = :rev ORDER BY code LIMIT 1`, {
    replacements: { rev: s.revision.id },
    type: QueryTypes.SELECT,
  });
  const user = s.as.chief;
  process.stdout.write(`READY ${s.school.id} ${user.id}\n`);
  let retries = 0;
  for (let i = 0; i < WRITES || !done; i++) {
    const key = `fault-load-${String(i).padStart(4, "0")}`;
    const studentId = s.people.students[i % s.people.students.length]!.id;
    for (;;) {
      try {
        const out = await withTransaction(async (t) => {
          await lockIdempotencyKey(t, user.id, key);
          const prior = await priorIdempotentResult<{ id: string }>(t, user.id, key);
          if (prior) return prior.result.data;
          const check = await recordOralCheck(t, user, {
            studentId,
            itemIds: [item!.id],
            levelShown: "correlation",
            remarks: `write ${i}`,
            durationMinutes: 10,
            occurredAt: new Date(Date.now() - 60_000),
            questions: [
              {
                syllabusItemId: item!.id,
                questionText: "What sets the minimum-drag speed?",
                answerSummary: "Induced and parasite drag equal",
                outcome: "solid",
                required: true,
                prompted: false,
                correctiveGiven: false,
              },
            ],
          });
          const data = { id: check.id };
          await storeIdempotentResult(t, user.id, key, "fault.check", data);
          return data;
        });
        process.stdout.write(`ACK ${key} ${out.id}\n`);
        break;
      } catch (e) {
        if (!isConnectionError(e)) throw e;
        retries++;
        await sleep(150);
      }
    }
  }
  // the same process and pool, after the restarts
  const rows = await sequelize.query<{ checks: number; keys: number; audited: number; unaudited: number }>(
    `SELECT (SELECT count(*)::int FROM oral_checks WHERE school_id = :s) AS checks,
            (SELECT count(*)::int FROM idempotency_keys WHERE person_id = :p AND scope = 'fault.check') AS keys,
            (SELECT count(DISTINCT record_id)::int FROM audit_events WHERE school_id = :s AND record_type = 'oral_check') AS audited,
            (SELECT count(*)::int FROM oral_checks c WHERE c.school_id = :s
                AND NOT EXISTS (SELECT 1 FROM audit_events a WHERE a.record_type = 'oral_check' AND a.record_id = c.id)) AS unaudited`,
    { replacements: { s: s.school.id, p: user.id }, type: QueryTypes.SELECT },
  );
  const chain = await verifyChain(s.school.id);
  process.stdout.write(`SUMMARY ${JSON.stringify({ ...rows[0], retries, chainOk: chain.ok })}\n`);
  await sequelize.close();
}

main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
