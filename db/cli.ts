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
    await generateScale(n, { log: console.log });
    // fresh statistics, as autovacuum would gather a minute later: a benchmark run right after
    // the generator must not meet the planner's guesses for empty tables (a 10x slower plan seen)
    const { analyzeAsOwner } = await import("./migrate");
    await analyzeAsOwner();
    console.log("[scale] statistics gathered (ANALYZE)");
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
