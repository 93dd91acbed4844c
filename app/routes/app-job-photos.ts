import { data, redirect } from "react-router";
import type { Route } from "./+types/app-job-photos";
import { requireUser } from "~/lib/auth/session.server";
import { findLeadFor, parseLeadId } from "~/lib/auth/staff.server";
import { isBuildable, markBuiltWithPhotos, recordJobPhotos } from "~/lib/builds/job-site.server";
import { isSignedStage } from "~/lib/leads/lead-status";
import { PhotoQuotaExceeded } from "~/lib/leads/leads.server";
import {
  checkReceivedPhotos,
  discardReceivedPhotos,
  readLeadForm,
  storeReceivedPhotos,
} from "~/lib/platform/uploads.server";
import { postOnly } from "~/lib/platform/post-only.server";

export const loader = postOnly("The job page posts its photos here.");

/*
 * Photos from the build, posted by the job page: progress photos, or the finished job's photos that
 * mark it built. The same rules as every other photo: streamed to disk under the same limits,
 * checked by their bytes, decoded and encoded again, stored under generated names.
 */
export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ["owner", "crew"] });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead || !isSignedStage(lead.status)) throw new Response("Not found", { status: 404 });
  const reading = await readLeadForm(request);
  if (!reading.ok) return data({ errors: reading.errors }, { status: reading.status });
  const { fields, photos: received } = reading;
  const intent = fields.intent;
  if (intent !== "progress" && intent !== "built") {
    await discardReceivedPhotos(received);
    return data({ errors: { form: "Say what the photos are for: progress or built." } }, { status: 400 });
  }
  if (received.length === 0) {
    return data(
      {
        errors: {
          photos:
            intent === "built"
              ? "Add at least one photo of the finished pit to mark the job built."
              : "Choose at least one photo.",
        },
      },
      { status: 400 },
    );
  }
  if (intent === "built" && !isBuildable(lead.status)) {
    await discardReceivedPhotos(received);
    return data({ errors: { form: "This job is marked built already." } }, { status: 409 });
  }
  const quick = await checkReceivedPhotos(received);
  if (!quick.ok) {
    await discardReceivedPhotos(received);
    return data({ errors: { photos: quick.message } }, { status: 400 });
  }
  const stored = await storeReceivedPhotos(received);
  if (!stored.ok) return data({ errors: { photos: stored.message } }, { status: 400 });
  if (intent === "built") {
    const result = await markBuiltWithPhotos(user, lead, stored.photos);
    if (!result.ok) return data({ errors: result.errors }, { status: result.status });
    return redirect(`/app/jobs/${lead.id}?saved=built#built`);
  }
  try {
    await recordJobPhotos(user, lead, stored.photos, "progress");
  } catch (error) {
    if (error instanceof PhotoQuotaExceeded) return data({ errors: { photos: error.message } }, { status: 429 });
    throw error;
  }
  return redirect(`/app/jobs/${lead.id}?saved=photos#build-photos`);
}
