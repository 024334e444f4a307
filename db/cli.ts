import { migrateUp } from "./migrate";

// db/cli.ts migrate | seed | scale --students N — run with tsx (see package.json).
async function main() {
  const cmd = process.argv[2];
  if (cmd === "migrate") {
    const done = await migrateUp();
    console.log(`[db] migrations applied: ${done.length ? done.join(", ") : "none pending"}`);
  } else if (cmd === "seed") {
    const { seedDemo } = await import("./seed/demo");
    await seedDemo();
  } else if (cmd === "scale") {
    const i = process.argv.indexOf("--students");
    const n = Number(i > 0 ? process.argv[i + 1] : process.argv[3]);
    const { generateScale } = await import("./seed/scale");
    const { schoolId } = await generateScale(n, { log: console.log });
    // fresh statistics, as autovacuum would gather a minute later: a benchmark run right after
    // the generator must not meet the planner's guesses for empty tables (a 10x slower plan seen)
    const { analyzeAsOwner } = await import("./migrate");
    await analyzeAsOwner();
    console.log("[scale] statistics gathered (ANALYZE)");
    // the chain verified whole, as the school's visits would have checked it while the events were
    // written one by one; the checkpoint then stands at its head (a refused chain fails the generator)
    // (plain SQL here: `npm run db:scale` runs without the react-server condition server-only modules need)
    const { sequelize } = await import("./index");
    const [chain] = (await sequelize.query(`SELECT ok, checked, head_hash, problem FROM audit_verify(:schoolId)`, {
      replacements: { schoolId },
    })) as [{ ok: boolean; checked: string; head_hash: string; problem: string | null }[], unknown];
    if (!chain[0]?.ok) throw new Error(`[scale] the audit chain does not verify: ${chain[0]?.problem ?? "no answer"}`);
    await sequelize.query(
      `INSERT INTO audit_checkpoints (school_id, chain_pos, head_hash, verified_at) VALUES (:schoolId, :pos, :hash, now())
       ON CONFLICT (school_id) DO UPDATE SET chain_pos = EXCLUDED.chain_pos, head_hash = EXCLUDED.head_hash, verified_at = EXCLUDED.verified_at
        WHERE audit_checkpoints.chain_pos <= EXCLUDED.chain_pos`,
      { replacements: { schoolId, pos: Number(chain[0].checked), hash: chain[0].head_hash } },
    );
    console.log(`[scale] audit chain verified, checkpoint at position ${chain[0].checked}`);
  } else {
    console.error("usage: tsx db/cli.ts migrate|seed|scale --students N");
    process.exit(2);
  }
  const { sequelize } = await import("./index");
  await sequelize.close();
}

main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
