import { sequelize } from "@/db/index";

/** Runs `work` and counts the SQL queries it sends through Sequelize; its value comes back too. */
export async function countQueriesOf<T>(work: () => Promise<T>): Promise<{ queries: number; value: T }> {
  const spy = jest.spyOn(sequelize, "query");
  try {
    const value = await work();
    return { queries: spy.mock.calls.length, value };
  } finally {
    spy.mockRestore();
  }
}

/** How many SQL queries `work` sends. */
export async function countQueries(work: () => Promise<unknown>): Promise<number> {
  return (await countQueriesOf(work)).queries;
}
