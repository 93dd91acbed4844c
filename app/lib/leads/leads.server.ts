import { and, desc, eq, gt, sum } from "drizzle-orm";
import {
  emailOutbox,
  leadEvents,
  leadPhotos,
  leads,
  users,
  type Company,
  type Lead,
  type LeadPhoto,
} from "~/db/schema";
import type { SessionUser } from "~/lib/auth/session.server";
import { crewJobCondition } from "~/lib/auth/staff.server";
import type { DesignSummaryLine } from "~/emails/design-summary";
import { LeadReceivedEmail } from "~/emails/lead-received";
import { NewLeadEmail } from "~/emails/new-lead";
import { db, writeTransaction } from "~/lib/platform/db.server";
import { prepareOutboxRow } from "~/lib/platform/email.server";
import type { LeadFormInput } from "~/lib/leads/lead-schema";
import { writeStoredPlan, type StoredPlanRecord } from "~/lib/design/stored-plan";
import { createRef, issueOneTimeToken, oneTimeLinkPath } from "~/lib/auth/tokens.server";
import {
  deleteStoredPhotos,
  MAX_COMPANY_PHOTO_BYTES_PER_DAY,
  sweepOrphanPhotos,
  type StoredPhoto,
} from "~/lib/platform/uploads.server";

export type LeadSnapshot = {
  /** The design, the parts and prices it was planned with, and the plan: kept as sent, forever. */
  record: StoredPlanRecord;
  stoneName: string;
  bowlDiameterIn: number;
  priceLowCents: number | null;
  priceHighCents: number | null;
  summary: DesignSummaryLine[];
};

const SET_PASSWORD_DAYS = 7;
const CONFIRM_REQUEST_DAYS = 30;

/**
 * Saves a homeowner's request: photos on disk first (generated names), then in one transaction the
 * lead with its design snapshot, its photos, a timeline event, the homeowner's account, a one-time
 * link that puts the request in that account's list (and sets a password if it has none) and two
 * outbox e-mails. If the transaction fails the photos are
 * deleted again, so nothing is half-saved; the outbox worker sends the e-mails later.
 */
export async function createLead(args: {
  company: Company;
  form: LeadFormInput;
  snapshot: LeadSnapshot;
  /** Already checked and stored; deleted again if the request cannot be saved. */
  photos: StoredPhoto[];
  origin: string;
}): Promise<Pick<Lead, "id" | "ref">> {
  const { company, form, snapshot, photos, origin } = args;
  const email = form.email.toLowerCase();
  const storedNames = photos.map((p) => p.storedName);
  try {
    return await writeTransaction(async (tx) => {
      // Checked inside the write transaction, so two requests at once cannot both slip under the cap.
      if (photos.length) {
        const incoming = photos.reduce((total, p) => total + p.sizeBytes, 0);
        if ((await photoBytesToday(tx, company.id)) + incoming > MAX_COMPANY_PHOTO_BYTES_PER_DAY)
          throw new PhotoQuotaExceeded();
      }
      const [existing] = await tx.select().from(users).where(eq(users.email, email)).limit(1);
      // The account the address belongs to (a new one for a new address). The request joins that
      // account's list only when someone uses the link mailed to the address: whoever typed the
      // address into the form may not be its owner.
      let accountId: number | null = null;
      if (!existing) {
        const [created] = await tx
          .insert(users)
          .values({ companyId: company.id, email, name: form.customerName, role: "homeowner" })
          .returning({ id: users.id });
        accountId = created!.id;
      } else if (existing.role === "homeowner") {
        accountId = existing.id;
      }

      const ref = createRef();
      const [lead] = await tx
        .insert(leads)
        .values({
          companyId: company.id,
          homeownerId: null,
          ref,
          customerName: form.customerName,
          email,
          phone: form.phone,
          street: form.street,
          town: form.town,
          buildWindow: form.buildWindow,
          notes: form.notes,
          ...writeStoredPlan(snapshot.record),
          stoneName: snapshot.stoneName,
          bowlDiameterIn: snapshot.bowlDiameterIn,
          priceLowCents: snapshot.priceLowCents,
          priceHighCents: snapshot.priceHighCents,
        })
        .returning({ id: leads.id, ref: leads.ref });
      const leadId = lead!.id;

      let accountLink: string | null = null;
      let confirmLink: string | null = null;
      if (accountId !== null) {
        const hasPassword = Boolean(existing?.passwordHash);
        const token = await issueOneTimeToken(tx, {
          userId: accountId,
          purpose: hasPassword ? "confirm-request" : "set-password",
          days: hasPassword ? CONFIRM_REQUEST_DAYS : SET_PASSWORD_DAYS,
          leadId,
        });
        if (hasPassword) confirmLink = `${origin}${oneTimeLinkPath(token)}`;
        else accountLink = `${origin}${oneTimeLinkPath(token)}`;
      }

      if (storedNames.length) {
        await tx.insert(leadPhotos).values(
          storedNames.map((storedName, i) => ({
            companyId: company.id,
            leadId,
            storedName,
            originalName: photos[i]!.originalName,
            mimeType: photos[i]!.mimeType,
            sizeBytes: photos[i]!.sizeBytes,
          })),
        );
      }
      await tx.insert(leadEvents).values({
        companyId: company.id,
        leadId,
        kind: "received",
        detail: `Request sent from the configurator with ${storedNames.length} photo${storedNames.length === 1 ? "" : "s"}.`,
      });

      // Rendering is local CPU work; nothing here waits on the network.
      const outbox = await Promise.all([
        prepareOutboxRow({
          idempotencyKey: `lead-received/${leadId}`,
          companyId: company.id,
          to: email,
          subject: `${company.name} received your fire-pit request`,
          template: LeadReceivedEmail({
            companyName: company.name,
            companyPhone: company.phone,
            customerName: form.customerName,
            summary: snapshot.summary,
            accountLink,
            confirmLink,
            requestLink: `${origin}/my`,
          }),
        }),
        prepareOutboxRow({
          idempotencyKey: `lead-new/${leadId}`,
          companyId: company.id,
          to: company.email,
          subject: `New fire-pit request: ${form.customerName}, ${form.town}`,
          template: NewLeadEmail({
            companyName: company.name,
            customerName: form.customerName,
            town: form.town,
            photoCount: storedNames.length,
            summary: snapshot.summary,
            leadLink: `${origin}/app/leads/${leadId}`,
          }),
        }),
      ]);
      await tx.insert(emailOutbox).values(outbox);
      return { id: leadId, ref };
    });
  } catch (error) {
    await deleteStoredPhotos(storedNames);
    throw error;
  }
}

/** Thrown when a company has taken in its day's photo storage; nothing of the request is saved. */
export class PhotoQuotaExceeded extends Error {
  readonly message =
    "This contractor has received all the photos it can take today. Send your request without photos, or try again tomorrow.";
}

/** Photo bytes a company stored in the last 24 hours. */
export async function photoBytesToday(executor: Pick<typeof db, "select"> = db, companyId: number): Promise<number> {
  const since = new Date(Date.now() - 86_400_000).toISOString();
  const [row] = await executor
    .select({ total: sum(leadPhotos.sizeBytes) })
    .from(leadPhotos)
    .where(and(eq(leadPhotos.companyId, companyId), gt(leadPhotos.createdAt, since)));
  return Number(row?.total ?? 0);
}

/** A lead by its public reference, scoped to the company whose page it came from. */
export async function findLeadByRef(companyId: number, ref: string): Promise<Lead | null> {
  const [row] = await db
    .select()
    .from(leads)
    .where(and(eq(leads.companyId, companyId), eq(leads.ref, ref)))
    .limit(1);
  return row ?? null;
}

/** A homeowner's own requests, newest first. */
export function listHomeownerLeads(homeownerId: number) {
  return db.select().from(leads).where(eq(leads.homeownerId, homeownerId)).orderBy(desc(leads.createdAt));
}

/** Deletes photo files that no lead names (a crash between writing them and saving the lead). */
export async function sweepUnrecordedPhotos(olderThanMs?: number): Promise<number> {
  const rows = await db.select({ storedName: leadPhotos.storedName }).from(leadPhotos);
  return sweepOrphanPhotos(new Set(rows.map((r) => r.storedName)), olderThanMs);
}

/**
 * A yard photo the user may see, or null: the lead's company staff (crew only for signed jobs given
 * to them or whose booked build they are on) or the homeowner who sent it. Anyone else gets the same
 * null as a photo that does not exist.
 */
export async function findPhotoFor(
  user: Pick<SessionUser, "id" | "role" | "companyId">,
  photoId: number,
): Promise<LeadPhoto | null> {
  const [row] = await db
    .select({
      photo: leadPhotos,
      lead: {
        companyId: leads.companyId,
        homeownerId: leads.homeownerId,
      },
    })
    .from(leadPhotos)
    .innerJoin(leads, eq(leads.id, leadPhotos.leadId))
    .where(eq(leadPhotos.id, photoId))
    .limit(1);
  if (!row) return null;
  if (user.role === "homeowner") return row.lead.homeownerId === user.id ? row.photo : null;
  if (row.lead.companyId !== user.companyId) return null;
  if (user.role !== "crew") return row.photo;
  // Crew: a signed job given to them, or whose booked build they are on.
  const [job] = await db
    .select({ id: leads.id })
    .from(leads)
    .where(and(eq(leads.id, row.photo.leadId), eq(leads.companyId, user.companyId), crewJobCondition(user.id)))
    .limit(1);
  return job ? row.photo : null;
}
