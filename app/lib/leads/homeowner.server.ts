import { and, desc, eq, inArray, isNotNull } from "drizzle-orm";
import { bookings, companies, leadPhotos, leadRevisions, leads, proposals, type Booking, type Lead } from "~/db/schema";
import { db } from "~/lib/platform/db.server";

/**
 * What a homeowner's "my requests" page shows beside their own leads: photos, live consults, the
 * companies, and proposals. Only rows of the leads passed in, which must be the homeowner's own.
 */
export async function loadHomeownerRequestDetails(ownLeads: Pick<Lead, "id" | "companyId">[]) {
  const ids = ownLeads.map((l) => l.id);
  if (!ids.length) return { photos: [], liveBookings: [], companies: [], proposals: [], sentRevisions: [] };
  const [photoRows, liveBookings, companyRows, proposalRows, sentRevisions] = await Promise.all([
    db
      .select({
        id: leadPhotos.id,
        leadId: leadPhotos.leadId,
        originalName: leadPhotos.originalName,
        source: leadPhotos.source,
      })
      .from(leadPhotos)
      .where(inArray(leadPhotos.leadId, ids)),
    db
      .select()
      .from(bookings)
      .where(and(inArray(bookings.leadId, ids), inArray(bookings.status, ["held", "confirmed"]))),
    db
      .select({
        id: companies.id,
        slug: companies.slug,
        name: companies.name,
        timeZone: companies.timeZone,
        phone: companies.phone,
      })
      .from(companies)
      .where(
        inArray(
          companies.id,
          ownLeads.map((l) => l.companyId),
        ),
      ),
    db
      .select({
        leadId: proposals.leadId,
        kind: proposals.kind,
        token: proposals.token,
        status: proposals.status,
        documentJson: proposals.documentJson,
        sentAt: proposals.sentAt,
      })
      .from(proposals)
      .where(inArray(proposals.leadId, ids))
      .orderBy(desc(proposals.sentAt)),
    // Only the revisions staff sent to them; those still being worked on in the office stay there.
    db
      .select({
        id: leadRevisions.id,
        leadId: leadRevisions.leadId,
        designJson: leadRevisions.designJson,
        planJson: leadRevisions.planJson,
        priceLowCents: leadRevisions.priceLowCents,
        priceHighCents: leadRevisions.priceHighCents,
        sentAt: leadRevisions.sentAt,
      })
      .from(leadRevisions)
      .where(and(inArray(leadRevisions.leadId, ids), isNotNull(leadRevisions.sentAt)))
      .orderBy(desc(leadRevisions.sentAt), desc(leadRevisions.id)),
  ]);
  return { photos: photoRows, liveBookings, companies: companyRows, proposals: proposalRows, sentRevisions };
}

/** A booking on one of this homeowner's own requests, or null (anything else is "not found"). */
export async function findHomeownerBooking(homeownerId: number, bookingId: number): Promise<Booking | null> {
  const [row] = await db
    .select({ booking: bookings })
    .from(bookings)
    .innerJoin(leads, eq(leads.id, bookings.leadId))
    .where(and(eq(bookings.id, bookingId), eq(leads.homeownerId, homeownerId)))
    .limit(1);
  return row?.booking ?? null;
}
