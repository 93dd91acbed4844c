import type { Route } from "./+types/photo";
import { findPhotoFor } from "~/lib/leads/leads.server";
import { requireUser } from "~/lib/auth/session.server";
import { readStoredPhoto } from "~/lib/platform/uploads.server";

// Yard photos are never public: the lead's company staff (crew only for their own signed jobs) or the
// homeowner who sent them. Anyone else gets the same 404 as a photo that does not exist.
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const photoId = Number(params.photoId);
  if (!Number.isSafeInteger(photoId) || photoId <= 0) return new Response("Not found", { status: 404 });
  const photo = await findPhotoFor(user, photoId);
  if (!photo) return new Response("Not found", { status: 404 });
  const bytes = await readStoredPhoto(photo.storedName);
  return new Response(new Uint8Array(bytes), {
    headers: {
      "Content-Type": photo.mimeType,
      "Content-Length": String(bytes.byteLength),
      "Cache-Control": "private, max-age=3600",
      "Content-Disposition": "inline",
      "X-Content-Type-Options": "nosniff",
    },
  });
}
