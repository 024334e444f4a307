import "server-only";
import type { Transaction } from "sequelize";
import { inTransaction, sequelize } from "../../index";

// What the mail worker needs of the database connection itself: a transaction around one piece of
// its work, and closing the pool when the process stops. The queries are in the other files here.

export type { Transaction };
export { inTransaction };

/** Closes the connection pool (the worker's shutdown). */
export async function closeDatabase(): Promise<void> {
  await sequelize.close();
}
