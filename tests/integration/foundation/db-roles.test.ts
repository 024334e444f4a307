// The app connects as a role that owns no table, so even a bug cannot alter or disable the
// history tables; a separate owner role runs the migrations, which are recorded in schema_migrations.
import { readdirSync } from "node:fs";
import path from "node:path";
import { Client } from "pg";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { closeDb } from "@/tests/helpers/factories";

afterAll(closeDb);

async function one<T extends object>(sql: string): Promise<T> {
  const [r] = await sequelize.query<T>(sql, { type: QueryTypes.SELECT });
  if (!r) throw new Error(`no row: ${sql}`);
  return r;
}

test("the app connects as the app role, not the owner and not a superuser", async () => {
  const r = await one<{ me: string; su: boolean }>(`SELECT current_user AS me, rolsuper AS su FROM pg_roles WHERE rolname = current_user`);
  expect(r.me).toBe(process.env.DATABASE_APP_ROLE ?? "chalkwing_app");
  expect(r.su).toBe(false);
});

test("the app role owns no table, view or sequence", async () => {
  const owned = await sequelize.query<{ name: string }>(
    `SELECT schemaname || '.' || tablename AS name FROM pg_tables WHERE tableowner = current_user
     UNION ALL SELECT schemaname || '.' || viewname FROM pg_views WHERE viewowner = current_user
     UNION ALL SELECT c.relname FROM pg_class c JOIN pg_roles r ON r.oid = c.relowner WHERE c.relkind = 'S' AND r.rolname = current_user`,
    { type: QueryTypes.SELECT },
  );
  expect(owned).toEqual([]);
  const foundation = await sequelize.query<{ tablename: string; tableowner: string }>(
    `SELECT tablename, tableowner FROM pg_tables WHERE schemaname = 'public' AND tablename IN ('people', 'schools', 'outbox', 'idempotency_keys', 'sign_in_throttle')`,
    { type: QueryTypes.SELECT },
  );
  expect(foundation).toHaveLength(5);
  for (const t of foundation) expect(t.tableowner).not.toBe(process.env.DATABASE_APP_ROLE ?? "chalkwing_app");
});

test("the app role cannot change a table's shape or switch off its triggers", async () => {
  await expect(sequelize.query(`ALTER TABLE people ADD COLUMN sneaky integer`)).rejects.toThrow(/must be owner/);
  await expect(sequelize.query(`ALTER TABLE people DISABLE TRIGGER ALL`)).rejects.toThrow(/must be owner/);
  await expect(sequelize.query(`DROP TABLE sign_in_throttle`)).rejects.toThrow(/must be owner/);
});

test("every migration file in db/migrations is recorded as applied", async () => {
  const files = readdirSync(path.join(process.cwd(), "db", "migrations"))
    .filter((f) => /^\d{4}-.*\.ts$/.test(f))
    .sort();
  // the migration record belongs to the owner role; the app role may not even read it
  await expect(sequelize.query(`SELECT name FROM schema_migrations`)).rejects.toThrow(/permission denied/);
  const owner = new Client({ connectionString: process.env.DATABASE_OWNER_URL });
  await owner.connect();
  const applied = (
    await owner.query<{ name: string }>(`SELECT name FROM schema_migrations ORDER BY name`).finally(() => owner.end())
  ).rows.map((r) => r.name);
  expect(files).toContain("0001-foundation.ts");
  expect(applied).toEqual(expect.arrayContaining(files));
});
