/*
 * A second process on the test's database file, for the multi-process tests in
 * tests/unit/db-processes.test.ts. MODE=migrate prints "ready", waits for "go" on its standard
 * input, then loads the database module as a server does on start (which migrates) and prints the
 * journal's length.
 * MODE=hold opens the file, takes the write lock, prints "locked", keeps it HOLD_MS and commits.
 */
import { createClient } from "@libsql/client";

const mode = process.env.MODE;
if (mode === "migrate") {
  // Load everything but the database module first, so that after "go" the processes reach the
  // file within a few milliseconds of each other (starting tsx takes seconds on a busy machine).
  await Promise.all([
    import("drizzle-orm/libsql"),
    import("drizzle-orm/libsql/migrator"),
    import("~/db/schema"),
    import("~/lib/platform/env.server"),
  ]);
  console.log("ready");
  await new Promise<void>((resolve) => process.stdin.once("data", () => resolve()));
  process.stdin.pause();
  try {
    const { client } = await import("~/lib/platform/db.server");
    const { rows } = await client.execute("SELECT count(*) AS n FROM __drizzle_migrations");
    console.log(`migrated ${rows[0]!.n}`);
  } catch (error) {
    console.log(`failed ${(error as Error).message}`);
    process.exit(1);
  }
} else if (mode === "hold") {
  const client = createClient({ url: process.env.DATABASE_URL! });
  const tx = await client.transaction("write");
  await tx.execute("INSERT INTO probe (who) VALUES ('holder')");
  console.log("locked");
  await new Promise((r) => setTimeout(r, Number(process.env.HOLD_MS ?? 500)));
  await tx.commit();
  console.log("released");
}
