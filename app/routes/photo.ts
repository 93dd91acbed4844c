import { and, eq } from "drizzle-orm";
import type { Route } from "./+types/photo";
import { leadPhotos, leads } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { isSignedStage } from "~/lib/leads/lead-status";
import { requireUser } from "~/lib/auth/session.server";
import { readStoredPhoto } from "~/lib/platform/uploads.server";

// Yard photos are never public: the lead's company staff (crew only for their own signed jobs) or the
// homeowner who sent them. Anyone else gets the same 404 as a photo that does not exist.
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const photoId = Number(params.photoId);
  if (!Number.isSafeInteger(photoId) || photoId <= 0) return new Response("Not found", { status: 404 });
  const [row] = await db
    .select({ photo: leadPhotos, lead: { companyId: leads.companyId, homeownerId: leads.homeownerId, crewUserId: leads.crewUserId, status: leads.status } })
    .from(leadPhotos)
    .innerJoin(leads, eq(leads.id, leadPhotos.leadId))
    .where(and(eq(leadPhotos.id, photoId)))
    .limit(1);
  const isAllowed =
    row &&
    (user.role === "homeowner"
      ? row.lead.homeownerId === user.id
      : row.lead.companyId === user.companyId &&
        (user.role !== "crew" || (row.lead.crewUserId === user.id && isSignedStage(row.lead.status))));
  if (!row || !isAllowed) return new Response("Not found", { status: 404 });
  const bytes = await readStoredPhoto(row.photo.storedName);
  return new Response(new Uint8Array(bytes), {
    headers: {
      "Content-Type": row.photo.mimeType,
      "Content-Length": String(bytes.byteLength),
      "Cache-Control": "private, max-age=3600",
      "Content-Disposition": "inline",
      "X-Content-Type-Options": "nosniff",
    },
  });
}
