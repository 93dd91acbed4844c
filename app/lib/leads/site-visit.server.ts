import { and, eq, inArray } from "drizzle-orm";
import { leadEvents, leadPhotos, leads, siteVisits, type Lead, type SiteVisit } from "~/db/schema";
import { db, writeTransaction } from "~/lib/platform/db.server";
import { STATUS_LABEL } from "~/lib/leads/lead-status";
import type { SessionUser } from "~/lib/auth/session.server";
import type { SiteVisitInput } from "~/lib/leads/site-visit-schema";
import { deleteStoredPhotos, type StoredPhoto } from "~/lib/platform/uploads.server";

/** The request's site visit record, if the estimator has made one. */
export async function findSiteVisit(lead: Pick<Lead, "id" | "companyId">): Promise<SiteVisit | null> {
  const [row] = await db
    .select()
    .from(siteVisits)
    .where(and(eq(siteVisits.leadId, lead.id), eq(siteVisits.companyId, lead.companyId)))
    .limit(1);
  return row ?? null;
}

// Recording the visit is what "yard measured" means; later stages keep theirs.
const BEFORE_MEASURED = ["request", "called-back", "consult-booked"] as const;

/**
 * Saves (or updates) the visit with its photos (already checked and stored under generated names):
 * the record, the photos' rows, the stage and a timeline event in one transaction; if that fails the
 * photos are deleted again, so nothing is half-saved.
 */
export async function saveSiteVisit(
  user: SessionUser,
  lead: Lead,
  input: SiteVisitInput,
  photos: StoredPhoto[],
): Promise<void> {
  const storedNames = photos.map((p) => p.storedName);
  const at = new Date().toISOString();
  try {
    await writeTransaction(async (tx) => {
      const values = { ...input, visitedByUserId: user.id, updatedAt: at };
      await tx
        .insert(siteVisits)
        .values({ ...values, companyId: lead.companyId, leadId: lead.id })
        .onConflictDoUpdate({ target: siteVisits.leadId, set: values });
      if (storedNames.length) {
        await tx.insert(leadPhotos).values(
          photos.map((photo) => ({
            companyId: lead.companyId,
            leadId: lead.id,
            storedName: photo.storedName,
            originalName: photo.originalName,
            mimeType: photo.mimeType,
            sizeBytes: photo.sizeBytes,
            source: "site-visit" as const,
          })),
        );
      }
      const moved = await tx
        .update(leads)
        .set({ status: "measured", calledBackAt: lead.calledBackAt ?? at, updatedAt: at })
        .where(
          and(eq(leads.id, lead.id), eq(leads.companyId, lead.companyId), inArray(leads.status, [...BEFORE_MEASURED])),
        )
        .returning({ id: leads.id });
      const photoNote = storedNames.length
        ? ` with ${storedNames.length} photo${storedNames.length === 1 ? "" : "s"}`
        : "";
      await tx.insert(leadEvents).values({
        companyId: lead.companyId,
        leadId: lead.id,
        actorUserId: user.id,
        kind: "site-visit",
        detail: `Site visit recorded${photoNote}: ${input.structureFt} ft to the nearest structure, ${Math.round(input.accessWidthIn)} in access, ${input.slope} ground, ${input.soil}.${moved.length ? ` ${STATUS_LABEL[lead.status]} → ${STATUS_LABEL.measured}.` : ""}`,
        createdAt: at,
      });
    });
  } catch (error) {
    await deleteStoredPhotos(storedNames);
    throw error;
  }
}
