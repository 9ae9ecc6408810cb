/**
 * Stands in for `@coldtrail/db/testing` when the SQLite database and authorization suites run on
 * PostgreSQL (`COLDTRAIL_PG_SUITE=1 pnpm test:pg`, see vitest.config.mts): the same helpers, each
 * database a fresh schema on the server at COLDTRAIL_PG_URL.
 */
import { createPgTestDb, type TestDb } from "../../packages/db/src/testing";

export type { TestDb };

const url = (): string => {
  const value = process.env.COLDTRAIL_PG_URL?.trim();
  if (!value) throw new Error("COLDTRAIL_PG_URL is not set");
  return value;
};

export const createTestDb = (): Promise<TestDb> => createPgTestDb(url());
export const createSeededTestDb = (): Promise<TestDb> => createPgTestDb(url(), { seeded: true });
