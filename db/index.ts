import { Sequelize, Transaction } from "sequelize";
import pg from "pg";
import { env } from "@/lib/env";

// One Sequelize instance per process, shared across bundles and hot reloads.
// `date` columns come back as "YYYY-MM-DD" strings, never shifted by a time zone.
pg.types.setTypeParser(1082, (v: string) => v);

const g = globalThis as unknown as { __chalkwingSequelize?: Sequelize };

export const sequelize: Sequelize =
  g.__chalkwingSequelize ??
  (g.__chalkwingSequelize = new Sequelize(env().DATABASE_URL, {
    dialect: "postgres",
    dialectModule: pg,
    logging: false,
    pool: { max: 10, min: 0, idle: 10_000 },
    define: { underscored: true, timestamps: false },
  }));

export { Transaction };

/** Run `fn` in one transaction; everything written inside commits or rolls back together. */
export async function inTransaction<T>(fn: (t: Transaction) => Promise<T>): Promise<T> {
  return sequelize.transaction(fn);
}
