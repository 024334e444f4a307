import path from "node:path";
import { Sequelize } from "sequelize";
import pg from "pg";
import { Umzug, SequelizeStorage } from "umzug";
import { env } from "@/lib/env";

export interface MigrationContext {
  sequelize: Sequelize;
  appRole: string;
}

/** Migrations run as the owner role; the app role only gets the grants it needs. */
export function migrator(ownerUrl = env().DATABASE_OWNER_URL) {
  const sequelize = new Sequelize(ownerUrl, { dialect: "postgres", dialectModule: pg, logging: false });
  const umzug = new Umzug<MigrationContext>({
    migrations: {
      glob: ["migrations/*.ts", { cwd: path.join(process.cwd(), "db"), ignore: ["**/*.d.ts"] }],
    },
    context: { sequelize, appRole: env().DATABASE_APP_ROLE },
    storage: new SequelizeStorage({ sequelize, tableName: "schema_migrations" }),
    logger: undefined,
  });
  return { umzug, sequelize };
}

export async function migrateUp(ownerUrl?: string) {
  const { umzug, sequelize } = migrator(ownerUrl);
  try {
    const done = await umzug.up();
    return done.map((m) => m.name);
  } finally {
    await sequelize.close();
  }
}

/** ANALYZE every table of the public schema as their owner (the app role may not). */
export async function analyzeAsOwner(ownerUrl = env().DATABASE_OWNER_URL) {
  const sequelize = new Sequelize(ownerUrl, { dialect: "postgres", dialectModule: pg, logging: false });
  try {
    const [tables] = (await sequelize.query(`SELECT tablename FROM pg_tables WHERE schemaname = 'public'`)) as [
      { tablename: string }[],
      unknown,
    ];
    for (const { tablename } of tables) await sequelize.query(`ANALYZE "${tablename}"`);
  } finally {
    await sequelize.close();
  }
}
