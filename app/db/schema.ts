import { sql } from "drizzle-orm";
import { blob, index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import {
  BUILD_STATES,
  BUILD_WINDOWS,
  CATALOG_KINDS,
  LEAD_STATUSES,
  ORDER_UNITS,
  ROLES,
  SLOPES,
  SOILS,
  SPOIL_PLANS,
  SUPPLIER_ORDER_STATES,
  UTILITY_MARKS,
} from "~/db/enums";

export * from "~/db/enums";

/*
 * Every company-owned row carries company_id (companyId() below); every query in app/lib scopes by it.
 * Lengths are inches (real), money integer cents, times ISO-8601 UTC text.
 */

const NOW_ISO = sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))`;
const createdAt = () => text("created_at").notNull().default(NOW_ISO);
const updatedAt = () => text("updated_at").notNull().default(NOW_ISO);
/**
 * The refund a row may owe and the refund job's bookkeeping (app/lib/jobs/refund-queue.server.ts): the
 * refund made, tries so far, when the next may run, why the last one failed, when it gave up (shown to
 * the owner), and the lease of the process sending it. Every table with money to give back has them.
 */
const refundColumns = () => ({
  refundId: text("refund_id"),
  refundedAt: text("refunded_at"),
  refundAttempts: integer("refund_attempts").notNull().default(0),
  refundNextAt: text("refund_next_at"),
  refundLastError: text("refund_last_error"),
  refundFailedAt: text("refund_failed_at"),
  refundLeaseOwner: text("refund_lease_owner"),
  refundLeaseExpiresAt: text("refund_lease_expires_at"),
});
const serialId = () => integer("id").primaryKey({ autoIncrement: true });
// Every company-owned row carries this; queries in app/lib scope by it.
const companyId = () =>
  integer("company_id")
    .notNull()
    .references(() => companies.id);

export const companies = sqliteTable("companies", {
  id: serialId(),
  slug: text("slug").notNull().unique(),
  name: text("name").notNull(),
  email: text("email").notNull(),
  phone: text("phone").notNull().default(""),
  town: text("town").notNull().default(""),
  timeZone: text("time_zone").notNull().default("America/Chicago"),
  consultFeeCents: integer("consult_fee_cents").notNull().default(15000),
  // Required distance from the fire to structures and combustibles; local rules range 10–50 ft.
  setbackFt: real("setback_ft").notNull().default(25),
  labourRateCents: integer("labour_rate_cents").notNull().default(7500),
  overheadPct: real("overhead_pct").notNull().default(15),
  marginPct: real("margin_pct").notNull().default(20),
  priceSpreadPct: real("price_spread_pct").notNull().default(12),
  // Design consults: weekly hours as JSON {"1":[[540,1020]], …} (ISO weekday → [start, end) minutes
  // after local midnight), slot length, and how far ahead people may book.
  consultHoursJson: text("consult_hours_json")
    .notNull()
    .default('{"1":[[540,1020]],"2":[[540,1020]],"3":[[540,1020]],"4":[[540,1020]],"5":[[540,960]]}'),
  consultSlotMinutes: integer("consult_slot_minutes").notNull().default(60),
  consultHorizonDays: integer("consult_horizon_days").notNull().default(21),
  // Overrides of the estimating engine's factors (waste, base depth, labour minutes…), JSON.
  factorsJson: text("factors_json").notNull().default("{}"),
  // Builds: the usual crew size, hours on site a day, and the weekdays crews work (0 Sunday … 6 Saturday).
  crewSize: integer("crew_size").notNull().default(2),
  crewDayHours: real("crew_day_hours").notNull().default(8),
  workWeekdaysJson: text("work_weekdays_json").notNull().default("[1,2,3,4,5]"),
  // Raised by triggers whenever this row or any of the company's catalog items changes, so every
  // process can tell whether the company and catalog it keeps in memory are still the stored ones.
  cacheVersion: integer("cache_version").notNull().default(0),
  createdAt: createdAt(),
});

export const users = sqliteTable(
  "users",
  {
    id: serialId(),
    companyId: companyId(),
    email: text("email").notNull(),
    name: text("name").notNull(),
    role: text("role", { enum: ROLES }).notNull(),
    // Null until the person sets a password from their one-time link.
    passwordHash: text("password_hash"),
    isActive: integer("is_active", { mode: "boolean" }).notNull().default(true),
    // Leads newer than this are marked unseen in the inbox.
    inboxSeenAt: text("inbox_seen_at"),
    // SHA-256 of the secret in this person's private build calendar link; null when they have none.
    calendarFeedTokenHash: text("calendar_feed_token_hash"),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("users_email_unique").on(t.email),
    uniqueIndex("users_calendar_feed_unique").on(t.calendarFeedTokenHash),
    index("users_company_role_idx").on(t.companyId, t.role),
  ],
);

// Server-side sessions: the cookie holds only the id, so sign-out and deactivation end a
// session at once, wherever its cookie still lives.
export const sessions = sqliteTable(
  "sessions",
  {
    id: text("id").primaryKey(),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    expiresAt: text("expires_at").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("sessions_user_idx").on(t.userId)],
);

// Rate-limit counters shared by every app process: one row per limiter and key (an address, a
// company and address, an account and address), a fixed window in epoch milliseconds. Spending
// is one INSERT … ON CONFLICT DO UPDATE … RETURNING, so two processes never lose a count.
export const rateLimits = sqliteTable(
  "rate_limits",
  {
    key: text("key").primaryKey(),
    points: integer("points").notNull(),
    windowEndsAt: integer("window_ends_at").notNull(),
  },
  (t) => [index("rate_limits_window_idx").on(t.windowEndsAt)],
);

// One table for the whole stock: each kind uses the dimension columns that describe it
// (validated per kind in app/lib/catalog/catalog-schema.ts), the others stay null.
export const catalogItems = sqliteTable(
  "catalog_items",
  {
    id: serialId(),
    companyId: companyId(),
    kind: text("kind", { enum: CATALOG_KINDS }).notNull(),
    name: text("name").notNull(),
    colourName: text("colour_name").notNull().default(""),
    colourHex: text("colour_hex").notNull().default("#8a8178"),
    faceIn: real("face_in"),
    backIn: real("back_in"),
    depthIn: real("depth_in"),
    heightIn: real("height_in"),
    lengthIn: real("length_in"),
    widthIn: real("width_in"),
    thicknessIn: real("thickness_in"),
    diameterIn: real("diameter_in"),
    priceCents: integer("price_cents").notNull(),
    isActive: integer("is_active", { mode: "boolean" }).notNull().default(true),
    // Where it is bought and how the yard sells it (app/domain/supplier-order.ts rounds to it):
    // pieces in a pallet, cube, bundle or case; for tons and cubic yards the smallest step sold.
    supplierId: integer("supplier_id").references(() => suppliers.id),
    orderUnit: text("order_unit", { enum: ORDER_UNITS }).notNull().default("each"),
    unitsPerOrderUnit: real("units_per_order_unit").notNull().default(1),
    // Weight of one order unit as delivered (a full pallet with its pallet, one bag, one piece), lb.
    orderUnitWeightLb: real("order_unit_weight_lb"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("catalog_company_kind_idx").on(t.companyId, t.kind, t.isActive, t.name)],
);

// The yards and dealers a company buys from; catalog items name one.
export const suppliers = sqliteTable(
  "suppliers",
  {
    id: serialId(),
    companyId: companyId(),
    name: text("name").notNull(),
    email: text("email").notNull(),
    // E.164 (app/lib/phone.ts), or empty.
    phone: text("phone").notNull().default(""),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("suppliers_company_name_unique").on(t.companyId, t.name)],
);

export type Supplier = typeof suppliers.$inferSelect;

export type Company = typeof companies.$inferSelect;
export type User = typeof users.$inferSelect;
export type CatalogItem = typeof catalogItems.$inferSelect;

// A homeowner's request. The design, the computed plan and the price are a snapshot taken when it
// was sent, so later catalog or price changes never alter what the customer saw.
export const leads = sqliteTable(
  "leads",
  {
    id: serialId(),
    companyId: companyId(),
    homeownerId: integer("homeowner_id").references(() => users.id),
    // Unguessable handle for the homeowner's confirmation page (ids are sequential).
    ref: text("ref").notNull().unique(),
    // The job's stage (app/lib/leads/lead-status.ts names them).
    status: text("status", { enum: LEAD_STATUSES }).notNull().default("request"),
    // Why a job is on hold or not going ahead (the column kept its first name).
    stopReason: text("lost_reason"),
    // The step an on-hold or not-going-ahead job stopped at, so it can pick up there again.
    pausedStage: text("paused_stage", { enum: LEAD_STATUSES }),
    // When the office first reached the homeowner; the stage falls back to it when a consult is cancelled.
    calledBackAt: text("called_back_at"),
    assignedUserId: integer("assigned_user_id").references(() => users.id),
    // The crew member who builds a signed job.
    crewUserId: integer("crew_user_id").references(() => users.id),
    customerName: text("customer_name").notNull(),
    email: text("email").notNull(),
    phone: text("phone").notNull(),
    street: text("street").notNull(),
    town: text("town").notNull(),
    buildWindow: text("build_window", { enum: BUILD_WINDOWS }).notNull(),
    notes: text("notes").notNull().default(""),
    designJson: text("design_json").notNull(),
    planJson: text("plan_json").notNull(),
    stoneName: text("stone_name").notNull(),
    bowlDiameterIn: real("bowl_diameter_in").notNull(),
    priceLowCents: integer("price_low_cents"),
    priceHighCents: integer("price_high_cents"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("leads_company_created_idx").on(t.companyId, t.createdAt),
    index("leads_company_status_created_idx").on(t.companyId, t.status, t.createdAt),
    index("leads_company_assignee_idx").on(t.companyId, t.assignedUserId, t.createdAt),
    index("leads_company_email_idx").on(t.companyId, t.email),
    index("leads_company_town_idx").on(t.companyId, t.town),
    index("leads_homeowner_idx").on(t.homeownerId),
    index("leads_company_crew_idx").on(t.companyId, t.crewUserId),
    index("leads_company_name_idx").on(t.companyId, t.customerName),
    index("leads_company_price_idx").on(t.companyId, t.priceLowCents),
  ],
);

// Staff revisions of a lead's design; the homeowner's original stays on the lead untouched.
export const leadRevisions = sqliteTable(
  "lead_revisions",
  {
    id: serialId(),
    companyId: companyId(),
    leadId: integer("lead_id")
      .notNull()
      .references(() => leads.id),
    authorUserId: integer("author_user_id")
      .notNull()
      .references(() => users.id),
    designJson: text("design_json").notNull(),
    planJson: text("plan_json").notNull(),
    priceLowCents: integer("price_low_cents"),
    priceHighCents: integer("price_high_cents"),
    // When staff sent this revision to the homeowner (shown on their page and e-mailed); null until then.
    sentAt: text("sent_at"),
    createdAt: createdAt(),
  },
  (t) => [index("lead_revisions_lead_idx").on(t.leadId, t.createdAt)],
);

export const leadPhotos = sqliteTable(
  "lead_photos",
  {
    id: serialId(),
    companyId: companyId(),
    leadId: integer("lead_id")
      .notNull()
      .references(() => leads.id),
    // A generated name; the customer's file name is kept only as a label.
    storedName: text("stored_name").notNull().unique(),
    originalName: text("original_name").notNull(),
    mimeType: text("mime_type").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    // Sent by the homeowner with the request, taken by the estimator at the site visit, by the crew
    // during the build, or as the finished job's photo set.
    source: text("source", { enum: ["homeowner", "site-visit", "progress", "final"] })
      .notNull()
      .default("homeowner"),
    createdAt: createdAt(),
  },
  (t) => [index("lead_photos_lead_idx").on(t.leadId)],
);

export const leadEvents = sqliteTable(
  "lead_events",
  {
    id: serialId(),
    companyId: companyId(),
    leadId: integer("lead_id")
      .notNull()
      .references(() => leads.id),
    actorUserId: integer("actor_user_id").references(() => users.id),
    kind: text("kind").notNull(),
    detail: text("detail").notNull().default(""),
    createdAt: createdAt(),
  },
  (t) => [index("lead_events_lead_idx").on(t.leadId, t.createdAt)],
);

// "cancelled": a scheduled message (a consult reminder) that is no longer wanted.
export const OUTBOX_STATUSES = ["pending", "sent", "failed", "cancelled"] as const;

// Transactional outbox: written in the same batch as the row that triggers the e-mail; a worker
// sends it with the idempotency key, so each message goes out once even across retries.
export const emailOutbox = sqliteTable(
  "email_outbox",
  {
    id: serialId(),
    companyId: integer("company_id").references(() => companies.id),
    idempotencyKey: text("idempotency_key").notNull().unique(),
    toAddress: text("to_address").notNull(),
    subject: text("subject").notNull(),
    html: text("html").notNull(),
    text: text("text").notNull(),
    attachmentsJson: text("attachments_json").notNull().default("[]"),
    status: text("status", { enum: OUTBOX_STATUSES }).notNull().default("pending"),
    attempts: integer("attempts").notNull().default(0),
    sendAfter: text("send_after")
      .notNull()
      .default(sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))`),
    lastError: text("last_error"),
    providerId: text("provider_id"),
    sentAt: text("sent_at"),
    // The worker process that claimed the row, until when (app/lib/jobs/jobs.server.ts).
    leaseOwner: text("lease_owner"),
    leaseExpiresAt: text("lease_expires_at"),
    createdAt: createdAt(),
  },
  (t) => [
    index("email_outbox_due_idx").on(t.status, t.sendAfter),
    index("email_outbox_company_status_idx").on(t.companyId, t.status),
  ],
);

// One-time links (set a password, accept an invitation). Only the SHA-256 of the token is kept.
export const oneTimeTokens = sqliteTable(
  "one_time_tokens",
  {
    tokenHash: text("token_hash").primaryKey(),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    // "confirm-request": adds one request sent with this address to the account's own list.
    purpose: text("purpose", { enum: ["set-password", "invite", "confirm-request"] }).notNull(),
    // The request this link confirms: a request joins the account that owns its e-mail address
    // only when someone uses a link sent to that address.
    leadId: integer("lead_id").references(() => leads.id),
    expiresAt: text("expires_at").notNull(),
    usedAt: text("used_at"),
    createdAt: createdAt(),
  },
  (t) => [index("one_time_tokens_user_idx").on(t.userId)],
);

export type Lead = typeof leads.$inferSelect;
export type LeadPhoto = typeof leadPhotos.$inferSelect;

export const consultBlockedDays = sqliteTable(
  "consult_blocked_days",
  {
    id: serialId(),
    companyId: companyId(),
    /** A local calendar day in the company's time zone, YYYY-MM-DD. */
    day: text("day").notNull(),
  },
  (t) => [uniqueIndex("consult_blocked_days_unique").on(t.companyId, t.day)],
);

export const BOOKING_STATUSES = ["held", "confirmed", "cancelled", "expired"] as const;
export type BookingStatus = (typeof BOOKING_STATUSES)[number];

// A paid design consult. A slot is held while checkout is open and confirmed by the signed
// webhook. The partial unique index is what makes "one booking per slot" true under any race.
export const bookings = sqliteTable(
  "bookings",
  {
    id: serialId(),
    companyId: companyId(),
    leadId: integer("lead_id")
      .notNull()
      .references(() => leads.id),
    homeownerId: integer("homeowner_id").references(() => users.id),
    startsAt: text("starts_at").notNull(),
    endsAt: text("ends_at").notNull(),
    status: text("status", { enum: BOOKING_STATUSES }).notNull().default("held"),
    holdExpiresAt: text("hold_expires_at").notNull(),
    amountCents: integer("amount_cents").notNull(),
    // ISO 4217, lower case as the payment service writes it; a paid event must name the same.
    currency: text("currency").notNull().default("usd"),
    // The homeowner's own time zone (from their browser), for e-mails in their local time.
    customerTimeZone: text("customer_time_zone"),
    checkoutSessionId: text("checkout_session_id").unique(),
    paymentIntentId: text("payment_intent_id"),
    isPaid: integer("is_paid", { mode: "boolean" }).notNull().default(false),
    ...refundColumns(),
    cancelledBy: text("cancelled_by"),
    cancelReason: text("cancel_reason"),
    // The consult's calendar file revision (RFC 5545 3.8.7.4 SEQUENCE): 0 when booked, raised by
    // each move to another time, so calendars replace the event they hold under the same UID.
    calendarSequence: integer("calendar_sequence").notNull().default(0),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("bookings_slot_taken_unique")
      .on(t.companyId, t.startsAt)
      .where(sql`status in ('held', 'confirmed')`),
    index("bookings_company_starts_idx").on(t.companyId, t.startsAt),
    index("bookings_lead_idx").on(t.leadId),
    index("bookings_status_hold_idx").on(t.status, t.holdExpiresAt),
    index("bookings_refund_due_idx")
      .on(t.refundNextAt)
      .where(sql`status = 'cancelled' and is_paid = 1 and refund_id is null and refund_failed_at is null`),
  ],
);

// Every payment-service event id, recorded once in the same transaction as its effect.
export const paymentEvents = sqliteTable("payment_events", {
  id: text("id").primaryKey(),
  type: text("type").notNull(),
  bookingId: integer("booking_id").references(() => bookings.id),
  receivedAt: createdAt(),
});

export type Booking = typeof bookings.$inferSelect;

// Work that is not about one row (the sweep of stray uploads): one lease row per job name, so
// one process at a time runs it, with the same attempts and backoff as the row jobs.
export const jobLeases = sqliteTable("job_leases", {
  name: text("name").primaryKey(),
  leaseOwner: text("lease_owner"),
  leaseExpiresAt: text("lease_expires_at"),
  nextRunAt: text("next_run_at").notNull(),
  attempts: integer("attempts").notNull().default(0),
  lastError: text("last_error"),
  lastRunAt: text("last_run_at"),
});
export type LeadRevision = typeof leadRevisions.$inferSelect;

// What the estimator measured in the yard at the consult; one record per request, updated in place.

export const siteVisits = sqliteTable(
  "site_visits",
  {
    id: serialId(),
    companyId: companyId(),
    leadId: integer("lead_id")
      .notNull()
      .references(() => leads.id),
    visitedByUserId: integer("visited_by_user_id").references(() => users.id),
    // Distances from the centre of the pit, feet; null when there is none (no branches over the spot).
    structureFt: real("structure_ft").notNull(),
    propertyLineFt: real("property_line_ft").notNull(),
    branchesFt: real("branches_ft"),
    slope: text("slope", { enum: SLOPES }).notNull(),
    soil: text("soil", { enum: SOILS }).notNull(),
    // Narrowest point on the way in from where the truck parks, inches.
    accessWidthIn: real("access_width_in").notNull(),
    utilityMarks: text("utility_marks", { enum: UTILITY_MARKS }).notNull(),
    spoil: text("spoil", { enum: SPOIL_PLANS }).notNull(),
    notes: text("notes").notNull().default(""),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("site_visits_lead_unique").on(t.leadId)],
);

export const PROPOSAL_KINDS = ["proposal", "change-order"] as const;
// sent → accepted (signed, deposit not yet paid) → signed (deposit paid; change orders: signed at once);
// sent or accepted → withdrawn or expired. Never backwards.
export const PROPOSAL_STATES = ["sent", "accepted", "signed", "withdrawn", "expired"] as const;
export type ProposalState = (typeof PROPOSAL_STATES)[number];

// A proposal (or a change order to a signed one) as sent: its document is frozen at sending, the
// homeowner's acceptance is frozen with the exact PDF they accepted and its SHA-256, and the deposit
// follows the consult booking's payment rules (own idempotency keys, webhook applied once).
export const proposals = sqliteTable(
  "proposals",
  {
    id: serialId(),
    companyId: companyId(),
    leadId: integer("lead_id")
      .notNull()
      .references(() => leads.id),
    kind: text("kind", { enum: PROPOSAL_KINDS }).notNull(),
    // A change order's signed proposal.
    parentId: integer("parent_id"),
    // The unguessable handle of /p/:token (256 bits).
    token: text("token").notNull().unique(),
    revisionId: integer("revision_id").references(() => leadRevisions.id),
    // The whole document as sent (app/lib/proposals/proposal-document.ts), and the design it was written from.
    documentJson: text("document_json").notNull(),
    designJson: text("design_json").notNull(),
    planJson: text("plan_json").notNull(),
    // Fixed price with allowances, before add-ons; for a change order the difference it makes.
    priceCents: integer("price_cents").notNull(),
    status: text("status", { enum: PROPOSAL_STATES }).notNull().default("sent"),
    expiresAt: text("expires_at").notNull(),
    sentByUserId: integer("sent_by_user_id").references(() => users.id),
    sentAt: text("sent_at").notNull(),
    firstOpenedAt: text("first_opened_at"),
    lastOpenedAt: text("last_opened_at"),
    openCount: integer("open_count").notNull().default(0),
    withdrawnAt: text("withdrawn_at"),
    withdrawReason: text("withdraw_reason"),
    // The acceptance: who, when, from where, what they chose, and the hash of the PDF they accepted.
    signerName: text("signer_name"),
    signedAt: text("signed_at"),
    signerIp: text("signer_ip"),
    signerUserAgent: text("signer_user_agent"),
    chosenAddOnsJson: text("chosen_add_ons_json"),
    totalCents: integer("total_cents"),
    depositCents: integer("deposit_cents"),
    acceptedPdfSha256: text("accepted_pdf_sha256"),
    acceptedPdf: blob("accepted_pdf", { mode: "buffer" }),
    signedPdf: blob("signed_pdf", { mode: "buffer" }),
    // The deposit through the payment service.
    checkoutSessionId: text("checkout_session_id").unique(),
    checkoutAttempt: integer("checkout_attempt").notNull().default(0),
    paymentIntentId: text("payment_intent_id"),
    depositPaidAt: text("deposit_paid_at"),
    // A refund owed (asked for by the owner with a reason, or a payment that arrived too late).
    refundReason: text("refund_reason"),
    refundOwedAt: text("refund_owed_at"),
    ...refundColumns(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("proposals_lead_idx").on(t.leadId, t.createdAt),
    index("proposals_status_expires_idx").on(t.status, t.expiresAt),
    index("proposals_refund_owed_idx").on(t.refundOwedAt, t.refundId),
    index("proposals_refund_due_idx")
      .on(t.refundNextAt)
      .where(sql`refund_owed_at is not null and refund_id is null and refund_failed_at is null`),
  ],
);

// Each company's proposal terms and letterhead; a row appears the first time an owner saves them.
export const DEPOSIT_KINDS = ["percent", "fixed"] as const;
export const proposalTerms = sqliteTable("proposal_terms", {
  companyId: integer("company_id")
    .primaryKey()
    .references(() => companies.id),
  depositKind: text("deposit_kind", { enum: DEPOSIT_KINDS }).notNull().default("percent"),
  // Basis points of the total (3000 = 30 %), or a fixed amount in cents.
  depositBasisPoints: integer("deposit_basis_points").notNull().default(3000),
  depositFixedCents: integer("deposit_fixed_cents").notNull().default(0),
  validDays: integer("valid_days").notNull().default(30),
  includedText: text("included_text").notNull(),
  excludedText: text("excluded_text").notNull(),
  streetAddress: text("street_address").notNull().default(""),
  licenceNumber: text("licence_number").notNull().default(""),
  // Access narrower than this (inches) adds the narrow-access allowance; a steep yard the slope allowance.
  narrowAccessIn: real("narrow_access_in").notNull().default(36),
  narrowAccessAllowanceCents: integer("narrow_access_allowance_cents").notNull().default(0),
  steepSlopeAllowanceCents: integer("steep_slope_allowance_cents").notNull().default(0),
  updatedAt: updatedAt(),
});

export type SiteVisit = typeof siteVisits.$inferSelect;
export type Proposal = typeof proposals.$inferSelect;
export type ProposalTerms = typeof proposalTerms.$inferSelect;

// An order to one supplier: one drop (delivery) per job, each with its own lines. Drafts of several
// jobs to the same supplier for the same week can be combined: their drops move to one order and
// the others are marked "combined" (combinedIntoId), so every job keeps its history.
export const supplierOrders = sqliteTable(
  "supplier_orders",
  {
    id: serialId(),
    companyId: companyId(),
    supplierId: integer("supplier_id")
      .notNull()
      .references(() => suppliers.id),
    status: text("status", { enum: SUPPLIER_ORDER_STATES }).notNull().default("drafted"),
    combinedIntoId: integer("combined_into_id"),
    createdByUserId: integer("created_by_user_id").references(() => users.id),
    sentAt: text("sent_at"),
    confirmedAt: text("confirmed_at"),
    // The supplier's own reference or the name of who confirmed, as the owner typed it.
    confirmationNote: text("confirmation_note"),
    deliveredAt: text("delivered_at"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("supplier_orders_company_status_idx").on(t.companyId, t.status, t.supplierId)],
);

export const supplierOrderDrops = sqliteTable(
  "supplier_order_drops",
  {
    id: serialId(),
    companyId: companyId(),
    orderId: integer("order_id")
      .notNull()
      .references(() => supplierOrders.id),
    leadId: integer("lead_id")
      .notNull()
      .references(() => leads.id),
    // A local calendar day, YYYY-MM-DD.
    requestedOn: text("requested_on").notNull(),
    siteAddress: text("site_address").notNull(),
    accessNotes: text("access_notes").notNull().default(""),
    // The rounded lines (app/domain/supplier-order.ts RoundedLine[]) as drafted, and their weight, lb.
    linesJson: text("lines_json").notNull(),
    weightLb: real("weight_lb").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("supplier_order_drops_order_idx").on(t.orderId), index("supplier_order_drops_lead_idx").on(t.leadId)],
);

export type SupplierOrder = typeof supplierOrders.$inferSelect;
export type SupplierOrderDrop = typeof supplierOrderDrops.$inferSelect;

// A build on the calendar: one per job at a time (cancelled ones stay for the record). Its days are
// calendar days in the company's time zone; `sequence` is the iCalendar SEQUENCE, raised on every
// move or cancellation so calendars replace what they hold (app/lib/builds/build-calendar.ts).
export const builds = sqliteTable(
  "builds",
  {
    id: serialId(),
    companyId: companyId(),
    leadId: integer("lead_id")
      .notNull()
      .references(() => leads.id),
    status: text("status", { enum: BUILD_STATES }).notNull().default("booked"),
    /** JSON array of "YYYY-MM-DD", in order. */
    datesJson: text("dates_json").notNull(),
    firstDay: text("first_day").notNull(),
    lastDay: text("last_day").notNull(),
    sequence: integer("sequence").notNull().default(0),
    labourHours: real("labour_hours").notNull(),
    notes: text("notes").notNull().default(""),
    // The job's stage before the build was booked, to go back to if it is cancelled.
    stageBefore: text("stage_before", { enum: LEAD_STATUSES }).notNull(),
    bookedByUserId: integer("booked_by_user_id").references(() => users.id),
    cancelledAt: text("cancelled_at"),
    cancelReason: text("cancel_reason"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("builds_company_days_idx").on(t.companyId, t.firstDay, t.lastDay),
    uniqueIndex("builds_one_booked_per_lead")
      .on(t.leadId)
      .where(sql`status = 'booked'`),
  ],
);

export const buildCrew = sqliteTable(
  "build_crew",
  {
    buildId: integer("build_id")
      .notNull()
      .references(() => builds.id),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id),
    companyId: companyId(),
  },
  (t) => [primaryKey({ columns: [t.buildId, t.userId] }), index("build_crew_user_idx").on(t.userId)],
);

export type Build = typeof builds.$inferSelect;

/*
 * The crew's record of a job on site. Rows a phone sends carry the phone's own id for the change
 * (`clientId`), so a change queued with no signal and sent twice is kept once.
 */

// A build step ticked (or unticked) on site; the latest change by the phone's clock wins.
export const jobStepTicks = sqliteTable(
  "job_step_ticks",
  {
    id: serialId(),
    companyId: companyId(),
    leadId: integer("lead_id")
      .notNull()
      .references(() => leads.id),
    stepKey: text("step_key").notNull(),
    done: integer("done", { mode: "boolean" }).notNull(),
    // When the phone recorded the change (ISO-8601 UTC), which orders changes sent late.
    changedAt: text("changed_at").notNull(),
    clientId: text("client_id").notNull(),
    byUserId: integer("by_user_id").references(() => users.id),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("job_step_ticks_lead_step_idx").on(t.leadId, t.stepKey)],
);

// Hours one person worked on a job on one calendar day (company time zone).
export const jobHours = sqliteTable(
  "job_hours",
  {
    id: serialId(),
    companyId: companyId(),
    leadId: integer("lead_id")
      .notNull()
      .references(() => leads.id),
    workerUserId: integer("worker_user_id")
      .notNull()
      .references(() => users.id),
    day: text("day").notNull(),
    hours: real("hours").notNull(),
    clientId: text("client_id").notNull(),
    recordedByUserId: integer("recorded_by_user_id").references(() => users.id),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("job_hours_lead_worker_day_idx").on(t.leadId, t.workerUserId, t.day),
    index("job_hours_company_day_idx").on(t.companyId, t.day),
  ],
);

// Material used beyond the order (a broken cap, another bag of base), at its cost.
export const jobExtras = sqliteTable(
  "job_extras",
  {
    id: serialId(),
    companyId: companyId(),
    leadId: integer("lead_id")
      .notNull()
      .references(() => leads.id),
    catalogItemId: integer("catalog_item_id").references(() => catalogItems.id),
    description: text("description").notNull(),
    quantity: real("quantity").notNull(),
    costCents: integer("cost_cents").notNull(),
    clientId: text("client_id").notNull().unique(),
    recordedByUserId: integer("recorded_by_user_id").references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index("job_extras_lead_idx").on(t.leadId)],
);

export type JobStepTick = typeof jobStepTicks.$inferSelect;
export type JobHours = typeof jobHours.$inferSelect;
export type JobExtra = typeof jobExtras.$inferSelect;

/*
 * The balance a job owes once built: the signed proposal's total (add-ons included) plus its signed
 * change orders, less the deposit paid, worked out when the job is marked built (app/domain/job-money.ts).
 * Its parts are kept beside the amount so the homeowner and the office see how it was reached. Paid
 * through Checkout like the deposit (own idempotency keys, every webhook applied once, session,
 * amount and currency checked); a payment that arrives when nothing is owed is refunded by the worker.
 */
export const jobBalances = sqliteTable(
  "job_balances",
  {
    id: serialId(),
    companyId: companyId(),
    leadId: integer("lead_id")
      .notNull()
      .references(() => leads.id),
    proposalId: integer("proposal_id")
      .notNull()
      .references(() => proposals.id),
    // The parts, cents: the proposal's price before add-ons, the add-ons chosen, the signed change
    // orders' differences (negative is a credit), the deposit paid; amount = the first three − deposit.
    proposalPriceCents: integer("proposal_price_cents").notNull(),
    addOnsCents: integer("add_ons_cents").notNull(),
    changeOrdersCents: integer("change_orders_cents").notNull(),
    depositCents: integer("deposit_cents").notNull(),
    amountCents: integer("amount_cents").notNull(),
    // When the job was marked built and the balance fell due.
    openedAt: text("opened_at").notNull(),
    checkoutSessionId: text("checkout_session_id").unique(),
    checkoutAttempt: integer("checkout_attempt").notNull().default(0),
    paymentIntentId: text("payment_intent_id"),
    paidAt: text("paid_at"),
    // Money owed back on the job: a second payment for a balance already paid (the whole of it), or
    // a credit the change orders left (refund_amount_cents of the deposit's payment). The payment
    // intent it goes back to, and why.
    refundPaymentIntentId: text("refund_payment_intent_id"),
    refundAmountCents: integer("refund_amount_cents"),
    refundReason: text("refund_reason"),
    refundOwedAt: text("refund_owed_at"),
    ...refundColumns(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("job_balances_lead_unique").on(t.leadId),
    index("job_balances_company_opened_idx").on(t.companyId, t.openedAt),
    index("job_balances_refund_due_idx")
      .on(t.refundNextAt)
      .where(sql`refund_owed_at is not null and refund_id is null and refund_failed_at is null`),
  ],
);

export type JobBalance = typeof jobBalances.$inferSelect;
