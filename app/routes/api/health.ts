import { pingDatabase } from "~/lib/platform/health.server";

export async function loader() {
  try {
    await pingDatabase();
    return Response.json({ ok: true, db: true }, { headers: { "Cache-Control": "no-store" } });
  } catch {
    return Response.json({ ok: false, db: false }, { status: 503, headers: { "Cache-Control": "no-store" } });
  }
}
