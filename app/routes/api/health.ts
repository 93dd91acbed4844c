import { sql } from "drizzle-orm";
import { db } from "~/lib/platform/db.server";

export async function loader() {
  try {
    await db.run(sql`select 1`);
    return Response.json({ ok: true, db: true }, { headers: { "Cache-Control": "no-store" } });
  } catch {
    return Response.json({ ok: false, db: false }, { status: 503, headers: { "Cache-Control": "no-store" } });
  }
}
