jest.setTimeout(60_000);

// The test command runs this layer in several jest workers, each on its own copy of the migrated
// database (CHALKWING_INT_DB_COPIES names how many; copies are "<database>_w<worker id>"), so
// no two test files write to one database at the same time. One worker (or none set) keeps the
// database the command exported.
const copies = Number(process.env.CHALKWING_INT_DB_COPIES ?? 0);
const worker = process.env.JEST_WORKER_ID;
if (copies > 1 && worker) {
  const n = ((Number(worker) - 1) % copies) + 1;
  for (const key of ["DATABASE_URL", "DATABASE_OWNER_URL"] as const) {
    const value = process.env[key];
    if (!value) continue;
    const url = new URL(value);
    url.pathname = `${url.pathname.replace(/_w\d+$/, "")}_w${n}`;
    process.env[key] = url.toString();
  }
}
