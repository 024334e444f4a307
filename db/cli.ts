import { migrateUp } from "./migrate";

// db/cli.ts migrate | seed | reset — run with tsx (see package.json).
async function main() {
  const cmd = process.argv[2];
  if (cmd === "migrate") {
    const done = await migrateUp();
    console.log(`[db] migrations applied: ${done.length ? done.join(", ") : "none pending"}`);
  } else if (cmd === "seed") {
    const { seedDemo } = await import("./seed/demo");
    await seedDemo();
  } else {
    console.error("usage: tsx db/cli.ts migrate|seed");
    process.exit(2);
  }
  const { sequelize } = await import("./index");
  await sequelize.close();
}

main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
