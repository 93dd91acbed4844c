import { and, asc, desc, eq, inArray, isNull, like, or } from "drizzle-orm";
import type Stripe from "stripe";
import { markJobBuilt } from "~/lib/builds/mark-built.server";
import { findJobBalance, recordBalancePaidByHand } from "~/lib/builds/job-balance.server";
import { alias } from "drizzle-orm/sqlite-core";
import {
  bookings,
  emailOutbox,
  leadEvents,
  leadPhotos,
  leadRevisions,
  leads,
  users,
  type Lead,
  type LeadStatus,
} from "~/db/schema";
import { formatInches } from "~/domain/units";
import { db } from "~/lib/platform/db.server";
import { allowedMoves, isSignedStage, STATUS_LABEL } from "~/lib/leads/lead-status";
import { formatMoneyWhole } from "~/lib/format/money";
import type { SessionUser } from "~/lib/auth/session.server";
import {
  readStoredPlan,
  writeStoredPlan,
  type StoredDesign,
  type StoredPlan,
  type StoredPlanRecord,
} from "~/lib/design/stored-plan";
import { findActiveStaff } from "~/lib/auth/team.server";
import { RevisionSentEmail, StaffAssignedEmail } from "~/emails/lead-emails";
import { getCompany } from "~/lib/catalog/catalog.server";
import { writeTransaction } from "~/lib/platform/db.server";
import { expireCheckoutSessions } from "~/lib/platform/payments.server";
import { withdrawOpenPapers } from "~/lib/proposals/withdraw-open.server";
import { prepareOutboxRow } from "~/lib/platform/email.server";
import { moveMailKeys } from "~/lib/consults/booking.server";

/*
 * Reading and changing one lead from the workspace. Every change writes the lead and its timeline
 * event in one batch (both or neither), scoped by the company as well as the id.
 */

export type DesignVersion = {
  /** null for the homeowner's original request. */
  revisionId: number | null;
  authorName: string | null;
  createdAt: string;
  design: StoredDesign;
  plan: StoredPlan;
  priceLowCents: number | null;
  priceHighCents: number | null;
  /** When staff sent a revision to the homeowner; null for the original and for revisions kept in the office. */
  sentAt: string | null;
};

export type TimelineEntry = { key: string; kind: string; detail: string; actorName: string | null; createdAt: string };

/** The homeowner's design as it was sent: never changed after. */
export function originalVersion(lead: Lead): DesignVersion {
  return {
    revisionId: null,
    authorName: null,
    createdAt: lead.createdAt,
    ...readStoredPlan(lead),
    priceLowCents: lead.priceLowCents,
    priceHighCents: lead.priceHighCents,
    sentAt: null,
  };
}

const author = alias(users, "author");

/** Every staff revision of a lead, oldest first. */
export async function listRevisions(lead: Lead): Promise<DesignVersion[]> {
  const rows = await db
    .select({ revision: leadRevisions, authorName: author.name })
    .from(leadRevisions)
    .leftJoin(author, eq(author.id, leadRevisions.authorUserId))
    .where(and(eq(leadRevisions.leadId, lead.id), eq(leadRevisions.companyId, lead.companyId)))
    .orderBy(asc(leadRevisions.createdAt), asc(leadRevisions.id));
  return rows.map(({ revision, authorName }) => ({
    revisionId: revision.id,
    authorName,
    createdAt: revision.createdAt,
    ...readStoredPlan(revision),
    priceLowCents: revision.priceLowCents,
    priceHighCents: revision.priceHighCents,
    sentAt: revision.sentAt,
  }));
}

/** The design the job is built to: the latest revision, or the original when there is none. */
export async function currentVersion(lead: Lead): Promise<DesignVersion> {
  return (await listRevisions(lead)).at(-1) ?? originalVersion(lead);
}

const actor = alias(users, "actor");

const CONSULT_MAIL_KINDS = [
  "consult-confirmed",
  "consult-confirmed-company",
  "consult-reminder",
  "consult-cancelled",
  "consult-cancelled-company",
] as const;

const MAIL_STATE: Record<string, string> = {
  sent: "sent",
  failed: "could not be sent",
  pending: "waiting to be sent",
  cancelled: "withdrawn before it was sent",
};

/** The lead's timeline, newest first: its events plus the e-mails sent about it and its consults. */
export async function listTimeline(lead: Lead): Promise<TimelineEntry[]> {
  // Consult e-mails are keyed by booking ("consult-confirmed/<bookingId>"), so find the lead's bookings first.
  const leadBookings = await db
    .select({ id: bookings.id, calendarSequence: bookings.calendarSequence })
    .from(bookings)
    .where(and(eq(bookings.leadId, lead.id), eq(bookings.companyId, lead.companyId)));
  // A moved consult adds its notes and its new reminder under "<kind>/<bookingId>/<sequence>".
  const consultKeys = leadBookings.flatMap((b) => [
    ...CONSULT_MAIL_KINDS.map((kind) => `${kind}/${b.id}`),
    ...moveMailKeys(b),
  ]);
  const [events, mails] = await Promise.all([
    db
      .select({
        id: leadEvents.id,
        kind: leadEvents.kind,
        detail: leadEvents.detail,
        createdAt: leadEvents.createdAt,
        actorName: actor.name,
      })
      .from(leadEvents)
      .leftJoin(actor, eq(actor.id, leadEvents.actorUserId))
      .where(and(eq(leadEvents.leadId, lead.id), eq(leadEvents.companyId, lead.companyId)))
      .orderBy(desc(leadEvents.createdAt), desc(leadEvents.id)),
    // The lead's own e-mails carry keys like "lead-received/<id>" (see leads.server.ts).
    db
      .select({
        id: emailOutbox.id,
        to: emailOutbox.toAddress,
        subject: emailOutbox.subject,
        status: emailOutbox.status,
        createdAt: emailOutbox.createdAt,
        sentAt: emailOutbox.sentAt,
      })
      .from(emailOutbox)
      .where(
        and(
          eq(emailOutbox.companyId, lead.companyId),
          or(
            like(emailOutbox.idempotencyKey, `lead-%/${lead.id}`),
            consultKeys.length ? inArray(emailOutbox.idempotencyKey, consultKeys) : undefined,
          ),
        ),
      ),
  ]);
  const entries: TimelineEntry[] = [
    ...events.map((e) => ({
      key: `e${e.id}`,
      kind: e.kind,
      detail: e.detail,
      actorName: e.actorName,
      createdAt: e.createdAt,
    })),
    ...mails.map((m) => ({
      key: `m${m.id}`,
      kind: "email",
      detail: `“${m.subject}” to ${m.to}: ${MAIL_STATE[m.status] ?? "waiting to be sent"}.`,
      actorName: null,
      createdAt: m.sentAt ?? m.createdAt,
    })),
  ];
  return entries.sort((x, y) =>
    x.createdAt < y.createdAt ? 1 : x.createdAt > y.createdAt ? -1 : x.key < y.key ? 1 : -1,
  );
}

export function listPhotos(lead: Lead) {
  return db
    .select({ id: leadPhotos.id, originalName: leadPhotos.originalName, source: leadPhotos.source })
    .from(leadPhotos)
    .where(and(eq(leadPhotos.leadId, lead.id), eq(leadPhotos.companyId, lead.companyId)))
    .orderBy(asc(leadPhotos.id));
}

export type ActionResult = { ok: true } | { ok: false; status: number; errors: Record<string, string> };

const now = () => new Date().toISOString();

function scoped(lead: Lead) {
  return and(eq(leads.id, lead.id), eq(leads.companyId, lead.companyId));
}

/**
 * Moves a job by hand: called back, on hold or not going ahead (with a reason), picked up again where
 * it stopped, or along the build's steps. Stages that follow an event (consult, visit, proposal,
 * deposit) are refused here: the event sets them.
 */
export async function changeStage(
  user: SessionUser,
  lead: Lead,
  to: LeadStatus,
  reason: string,
  payments?: Pick<Stripe, "checkout">,
): Promise<ActionResult> {
  const move = allowedMoves(lead.status, lead.pausedStage).find((m) => m.to === to);
  if (!move) {
    const choices = allowedMoves(lead.status, lead.pausedStage)
      .map((m) => `“${m.label}”`)
      .join(", ");
    return {
      ok: false,
      status: 400,
      errors: {
        status: `From “${STATUS_LABEL[lead.status]}” the job can move to ${choices || "no other stage by hand"}.`,
      },
    };
  }
  if (move.needsReason && reason.length < 3) {
    return {
      ok: false,
      status: 400,
      errors: {
        reason: `Say why (3 to 200 characters), e.g. “waiting for the town's permit” or “went with another contractor”.`,
      },
    };
  }
  // Built and paid in full have their own effects (the balance falls due; the balance is settled).
  // A built job picked up again after a hold is built already: its balance stays as it was opened.
  if (to === "built" && lead.status !== "on-hold") {
    const built = await markJobBuilt({ companyId: lead.companyId, leadId: lead.id, actorUserId: user.id });
    return built.ok ? { ok: true } : { ok: false, status: built.status, errors: { status: built.message } };
  }
  if (to === "paid-in-full" && (await findJobBalance(lead))) {
    const refused = await recordBalancePaidByHand({
      lead,
      actorUserId: user.id,
      how: "marked paid in full by the office",
    });
    return refused ? { ok: false, status: 409, errors: { status: refused } } : { ok: true };
  }
  const isStopping = to === "on-hold" || to === "not-going-ahead";
  const at = now();
  const detail = `${STATUS_LABEL[lead.status]} → ${STATUS_LABEL[to]}${move.needsReason ? `: ${reason}` : ""}`;
  const result = await writeTransaction(async (tx) => {
    const moved = await tx
      .update(leads)
      .set({
        status: to,
        stopReason: isStopping ? reason : null,
        // Stopping remembers the step (a job on hold that is then dropped keeps the step it held at).
        pausedStage: isStopping ? (lead.status === "on-hold" ? lead.pausedStage : lead.status) : null,
        ...(to === "called-back" && !lead.calledBackAt ? { calledBackAt: at } : {}),
        updatedAt: at,
      })
      .where(and(scoped(lead), eq(leads.status, lead.status)))
      .returning({ id: leads.id });
    // Moved meanwhile by someone else (or a payment): nothing is written, the timeline included.
    if (moved.length === 0) return null;
    await tx.insert(leadEvents).values({
      companyId: lead.companyId,
      leadId: lead.id,
      actorUserId: user.id,
      kind: "status",
      detail,
      createdAt: at,
    });
    if (to !== "not-going-ahead") return [];
    // A job not going ahead takes its proposals and change orders still out off the table, so no
    // deposit or change is paid for or signed on it.
    return withdrawOpenPapers(tx, {
      lead,
      actorUserId: user.id,
      at,
      reason: `The job is not going ahead: ${reason}`,
      because: "the job is not going ahead.",
    });
  });
  if (result === null)
    return {
      ok: false,
      status: 409,
      errors: { status: "This job changed a moment ago: reload the page to see where it stands." },
    };
  await expireCheckoutSessions(result, payments);
  return { ok: true };
}

/** Adds a staff note to the timeline. */
export async function addNote(user: SessionUser, lead: Lead, note: string): Promise<ActionResult> {
  const at = now();
  await db.batch([
    db.update(leads).set({ updatedAt: at }).where(scoped(lead)),
    db.insert(leadEvents).values({
      companyId: lead.companyId,
      leadId: lead.id,
      actorUserId: user.id,
      kind: "note",
      detail: note,
      createdAt: at,
    }),
  ]);
  return { ok: true };
}

async function nameOf(userId: number | null): Promise<string | null> {
  if (userId === null) return null;
  const [row] = await db.select({ name: users.name }).from(users).where(eq(users.id, userId)).limit(1);
  return row?.name ?? null;
}

/**
 * The e-mail telling a staff member a request (or a job to build) is theirs now; none when they
 * gave it to themselves. Its key ends in the lead's id, so the lead's timeline lists it.
 */
async function assignedEmail(args: {
  user: SessionUser;
  lead: Lead;
  to: { id: number; name: string; email: string };
  asCrew: boolean;
  at: string;
  origin: string;
}) {
  if (args.to.id === args.user.id) return [];
  const company = await getCompany(args.lead.companyId);
  return [
    await prepareOutboxRow({
      idempotencyKey: `lead-${args.asCrew ? "crew" : "assigned"}-${Date.parse(args.at)}-${args.to.id}/${args.lead.id}`,
      companyId: args.lead.companyId,
      to: args.to.email,
      subject: args.asCrew
        ? `Job to build: ${args.lead.customerName}, ${args.lead.town}`
        : `Request assigned to you: ${args.lead.customerName}, ${args.lead.town}`,
      template: StaffAssignedEmail({
        companyName: company.name,
        recipientName: args.to.name,
        assignedBy: args.user.name,
        customerName: args.lead.customerName,
        town: args.lead.town,
        asCrew: args.asCrew,
        stage: STATUS_LABEL[args.lead.status],
        link: `${args.origin}/app/leads/${args.lead.id}`,
      }),
    }),
  ];
}

/** Assigns the lead to an owner or estimator of the company (or to nobody), and e-mails the one assigned. */
export async function assignEstimator(
  user: SessionUser,
  lead: Lead,
  assigneeId: number | null,
  origin: string,
): Promise<ActionResult> {
  if (assigneeId === lead.assignedUserId) {
    return { ok: false, status: 400, errors: { assigneeId: "The request is already assigned that way." } };
  }
  const assignee =
    assigneeId === null ? null : await findActiveStaff(lead.companyId, assigneeId, ["owner", "estimator"]);
  if (assigneeId !== null && !assignee) {
    return { ok: false, status: 400, errors: { assigneeId: "Choose an active owner or estimator of your company." } };
  }
  const previous = await nameOf(lead.assignedUserId);
  const at = now();
  const mail = assignee ? await assignedEmail({ user, lead, to: assignee, asCrew: false, at, origin }) : [];
  await db.batch([
    db.update(leads).set({ assignedUserId: assigneeId, updatedAt: at }).where(scoped(lead)),
    ...mail.map((row) => db.insert(emailOutbox).values(row).onConflictDoNothing()),
    db.insert(leadEvents).values({
      companyId: lead.companyId,
      leadId: lead.id,
      actorUserId: user.id,
      kind: "assigned",
      detail: assignee
        ? `Assigned to ${assignee.name}${previous ? ` (was ${previous})` : ""}`
        : `Unassigned${previous ? ` (was ${previous})` : ""}`,
      createdAt: at,
    }),
  ]);
  return { ok: true };
}

/** Gives a signed job to a crew member of the company (or takes it back), and e-mails the crew member. */
export async function assignCrew(
  user: SessionUser,
  lead: Lead,
  crewUserId: number | null,
  origin: string,
): Promise<ActionResult> {
  if (!isSignedStage(lead.status)) {
    return {
      ok: false,
      status: 400,
      errors: { crewUserId: "A job goes to a crew once it is signed and the deposit is paid." },
    };
  }
  if (crewUserId === lead.crewUserId) {
    return { ok: false, status: 400, errors: { crewUserId: "The job is already with that crew." } };
  }
  const crew = crewUserId === null ? null : await findActiveStaff(lead.companyId, crewUserId, ["crew"]);
  if (crewUserId !== null && !crew) {
    return { ok: false, status: 400, errors: { crewUserId: "Choose an active crew member of your company." } };
  }
  const previous = await nameOf(lead.crewUserId);
  const at = now();
  const mail = crew ? await assignedEmail({ user, lead, to: crew, asCrew: true, at, origin }) : [];
  await db.batch([
    db.update(leads).set({ crewUserId, updatedAt: at }).where(scoped(lead)),
    ...mail.map((row) => db.insert(emailOutbox).values(row).onConflictDoNothing()),
    db.insert(leadEvents).values({
      companyId: lead.companyId,
      leadId: lead.id,
      actorUserId: user.id,
      kind: "crew-assigned",
      detail: crew
        ? `Job given to ${crew.name}${previous ? ` (was ${previous})` : ""}`
        : `Job taken back from ${previous ?? "the crew"}`,
      createdAt: at,
    }),
  ]);
  return { ok: true };
}

/** Saves a staff revision of the design with its freshly computed plan; the original stays as sent. */
export async function saveRevision(user: SessionUser, lead: Lead, record: StoredPlanRecord): Promise<number> {
  const { plan } = record;
  const at = now();
  const low = plan.price?.lowCents ?? null;
  const high = plan.price?.highCents ?? null;
  const [inserted] = await db.batch([
    db
      .insert(leadRevisions)
      .values({
        companyId: lead.companyId,
        leadId: lead.id,
        authorUserId: user.id,
        ...writeStoredPlan(record),
        priceLowCents: low,
        priceHighCents: high,
        createdAt: at,
      })
      .returning({ id: leadRevisions.id }),
    db.update(leads).set({ updatedAt: at }).where(scoped(lead)),
    db.insert(leadEvents).values({
      companyId: lead.companyId,
      leadId: lead.id,
      actorUserId: user.id,
      kind: "revision",
      detail: `Design revised: ${formatInches(plan.ring.bowlDiameterIn)} bowl, ${plan.ring.unitsPerCourse} units a course, ${plan.ring.courses} courses${plan.caps ? `, ${plan.caps.count} caps` : ""}${low !== null && high !== null ? `; ${formatMoneyWhole(low)}–${formatMoneyWhole(high)}` : ""}`,
      createdAt: at,
    }),
  ]);
  return inserted[0]!.id;
}

/**
 * Sends a staff revision to the homeowner: marks it sent (once; a second send is refused), notes it
 * on the timeline and e-mails the homeowner through the outbox, all in one transaction.
 */
export async function sendRevision(
  user: SessionUser,
  lead: Lead,
  revisionId: number,
  origin: string,
): Promise<ActionResult> {
  const [row] = await db
    .select({ revision: leadRevisions, authorName: author.name })
    .from(leadRevisions)
    .leftJoin(author, eq(author.id, leadRevisions.authorUserId))
    .where(
      and(
        eq(leadRevisions.id, revisionId),
        eq(leadRevisions.leadId, lead.id),
        eq(leadRevisions.companyId, lead.companyId),
      ),
    )
    .limit(1);
  if (!row) return { ok: false, status: 404, errors: { revisionId: "That revision is not one of this request's." } };
  if (row.revision.sentAt)
    return { ok: false, status: 409, errors: { revisionId: "This revision was already sent to the homeowner." } };
  const company = await getCompany(lead.companyId);
  const { design } = readStoredPlan(row.revision);
  const low = row.revision.priceLowCents;
  const high = row.revision.priceHighCents;
  const at = now();
  const mail = await prepareOutboxRow({
    idempotencyKey: `lead-revision-${revisionId}/${lead.id}`,
    companyId: lead.companyId,
    to: lead.email,
    subject: `Your revised fire-pit design from ${company.name}`,
    template: RevisionSentEmail({
      companyName: company.name,
      companyPhone: company.phone,
      recipientName: lead.customerName,
      authorName: row.authorName ?? user.name,
      summary: design.summary,
      price: low !== null && high !== null ? `${formatMoneyWhole(low)} – ${formatMoneyWhole(high)}` : null,
      link: `${origin}/my#revision-${revisionId}`,
    }),
  });
  return writeTransaction(async (tx) => {
    // Re-checked by the write: of two sends at once, one marks it and the other is told.
    const marked = await tx
      .update(leadRevisions)
      .set({ sentAt: at })
      .where(and(eq(leadRevisions.id, revisionId), isNull(leadRevisions.sentAt)))
      .returning({ id: leadRevisions.id });
    if (marked.length === 0)
      return {
        ok: false as const,
        status: 409,
        errors: { revisionId: "This revision was already sent to the homeowner." },
      };
    await tx.update(leads).set({ updatedAt: at }).where(scoped(lead));
    await tx.insert(leadEvents).values({
      companyId: lead.companyId,
      leadId: lead.id,
      actorUserId: user.id,
      kind: "revision-sent",
      detail: `Revised design sent to ${lead.customerName} (${lead.email}).`,
      createdAt: at,
    });
    await tx.insert(emailOutbox).values(mail).onConflictDoNothing();
    return { ok: true as const };
  });
}
