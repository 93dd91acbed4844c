/*
 * The migrated database has every index the schema declares. drizzle-kit's SQL for a libSQL column
 * change drops and recreates every index, and once left out those of tables created in the same
 * migration; a missing unique index turns an upsert into an error and lets duplicates in.
 * The reference is drizzle's own reading of app/db/schema.ts (getTableConfig).
 */
import { is } from "drizzle-orm";
import { getTableConfig, SQLiteTable } from "drizzle-orm/sqlite-core";
import { expect, test } from "vitest";
import * as schema from "~/db/schema";
// Loading the module migrates the database, as a server does on start.
import { client } from "~/lib/platform/db.server";

test("after the migrations, every index and unique index in the schema exists, on the right table and columns", async () => {
  const tables: SQLiteTable[] = (Object.values(schema) as unknown[]).filter((value): value is SQLiteTable =>
    is(value, SQLiteTable),
  );
  const expected = tables.flatMap((table) => {
    const config = getTableConfig(table);
    return config.indexes.map((index) => ({
      name: index.config.name,
      table: config.name,
      unique: Boolean(index.config.unique),
    }));
  });
  expect(expected.length).toBeGreaterThan(20);
  const { rows } = await client.execute(
    "SELECT name, tbl_name, sql FROM sqlite_master WHERE type = 'index' AND sql IS NOT NULL",
  );
  const actual = new Map(
    rows.map((row) => [
      String(row.name),
      { table: String(row.tbl_name), unique: /^CREATE UNIQUE INDEX/i.test(String(row.sql)) },
    ]),
  );
  const missing = expected.filter((index) => !actual.has(index.name)).map((index) => index.name);
  expect(missing).toEqual([]);
  for (const index of expected)
    expect(actual.get(index.name), index.name).toEqual({ table: index.table, unique: index.unique });
});
