import { and, count, eq, gt, gte, inArray, isNull, lt, or, sql, type SQL, type SQLWrapper } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { LEAD_STATUSES, bookings, leadRevisions, leads, users } from "~/db/schema";
import { toCsv } from "~/lib/format/csv";
import { db } from "~/lib/platform/db.server";
import {
  INBOX_PAGE_SIZE,
  inboxSearchParams,
  type InboxFilters,
  type InboxPage,
  type InboxRow,
  type InboxSort,
} from "~/lib/leads/inbox-options";
import { STATUS_LABEL } from "~/lib/leads/lead-status";
import { describeAge, formatZonedDate, formatZonedDateTime, nextDay, startOfZonedDay } from "~/lib/format/zoned-time";

/*
 * The inbox's queries. Every one starts from the company (the leading column of every leads index),
 * so a filter on status, assignee or received date, and the default newest-first order, are index
 * range scans; other sorts order one company's rows.
 */

const assignee = alias(users, "assignee");

// The pipeline's own order, not the alphabet's.
const STATUS_ORDER = sql`CASE ${leads.status} ${sql.join(
  LEAD_STATUSES.map((s, i) => sql`WHEN ${s} THEN ${i}`),
  sql` `,
)} END`;

// The first confirmed consult of a lead (bookings belong to the consult feature; read only here).
const CONSULT_AT = sql<
  string | null
>`(SELECT min(${bookings.startsAt}) FROM ${bookings} WHERE ${bookings.leadId} = ${leads.id} AND ${bookings.status} = 'confirmed')`;

// The design on show is the latest staff revision, if any (revisions never overwrite the lead's own
// design); its price is what the office quotes now. Ids grow with time, so the highest is the latest.
const LATEST_REVISION = sql`(SELECT max(${leadRevisions.id}) FROM ${leadRevisions} WHERE ${leadRevisions.leadId} = ${leads.id})`;
const currentPrice = (revisionColumn: SQLWrapper, leadColumn: SQLWrapper) =>
  sql<
    number | null
  >`CASE WHEN ${LATEST_REVISION} IS NULL THEN ${leadColumn} ELSE (SELECT ${revisionColumn} FROM ${leadRevisions} WHERE ${leadRevisions.id} = ${LATEST_REVISION}) END`;
const CURRENT_PRICE_LOW = currentPrice(leadRevisions.priceLowCents, leads.priceLowCents);
const CURRENT_PRICE_HIGH = currentPrice(leadRevisions.priceHighCents, leads.priceHighCents);

const SORT_COLUMNS: Record<InboxSort, SQL> = {
  received: sql`${leads.createdAt}`,
  status: STATUS_ORDER,
  customer: sql`${leads.customerName} COLLATE NOCASE`,
  town: sql`${leads.town} COLLATE NOCASE`,
  bowl: sql`${leads.bowlDiameterIn}`,
  price: CURRENT_PRICE_LOW,
  consult: CONSULT_AT,
  assignee: sql`${assignee.name} COLLATE NOCASE`,
};

const escapeLike = (text: string) => text.replace(/[\\%_]/g, (c) => `\\${c}`);

/** Conditions for a company's leads under the filters; `withStatus: false` leaves the status out (for the counts). */
function filterConditions(companyId: number, timeZone: string, filters: InboxFilters, withStatus: boolean): SQL {
  const conditions: (SQL | undefined)[] = [eq(leads.companyId, companyId)];
  if (withStatus && filters.status) conditions.push(eq(leads.status, filters.status));
  if (filters.assignee === "none") conditions.push(isNull(leads.assignedUserId));
  else if (filters.assignee !== null) conditions.push(eq(leads.assignedUserId, filters.assignee));
  if (filters.from) conditions.push(gte(leads.createdAt, startOfZonedDay(filters.from, timeZone)));
  if (filters.to) conditions.push(lt(leads.createdAt, startOfZonedDay(nextDay(filters.to), timeZone)));
  if (filters.q) {
    const pattern = `%${escapeLike(filters.q)}%`;
    const like = (column: SQLWrapper) => sql`${column} LIKE ${pattern} ESCAPE '\\'`;
    const matches = [like(leads.customerName), like(leads.email), like(leads.phone), like(leads.town)];
    // "2175550101" should find "+12175550101" (shown as "(217) 555-0101"): compare digits only when the
    // search looks like a phone number.
    const digits = filters.q.replace(/\D/g, "");
    if (digits.length >= 3 && /^[\d\s()+.-]+$/.test(filters.q)) {
      matches.push(
        sql`replace(replace(replace(replace(replace(replace(${leads.phone}, ' ', ''), '(', ''), ')', ''), '-', ''), '.', ''), '+', '') LIKE ${`%${digits}%`}`,
      );
    }
    conditions.push(or(...matches));
  }
  return and(...conditions)!;
}

function orderBy(filters: InboxFilters): SQL[] {
  const column = SORT_COLUMNS[filters.sort];
  const direction = filters.dir === "asc" ? sql`ASC` : sql`DESC`;
  // Rows without a value (no consult, no assignee, no price) go last either way.
  const nullsLast = filters.sort === "received" || filters.sort === "status" ? [] : [sql`(${column}) IS NULL`];
  return [...nullsLast, sql`${column} ${direction}`, sql`${leads.id} ${direction}`];
}

const rowColumns = {
  id: leads.id,
  status: leads.status,
  pausedStage: leads.pausedStage,
  customerName: leads.customerName,
  email: leads.email,
  phone: leads.phone,
  street: leads.street,
  town: leads.town,
  bowlDiameterIn: leads.bowlDiameterIn,
  stoneName: leads.stoneName,
  priceLowCents: CURRENT_PRICE_LOW,
  priceHighCents: CURRENT_PRICE_HIGH,
  stopReason: leads.stopReason,
  createdAt: leads.createdAt,
  assigneeId: assignee.id,
  assigneeName: assignee.name,
};

async function selectRows(companyId: number, timeZone: string, filters: InboxFilters, limit: number, offset: number) {
  return db
    .select(rowColumns)
    .from(leads)
    .leftJoin(assignee, eq(assignee.id, leads.assignedUserId))
    .where(filterConditions(companyId, timeZone, filters, true))
    .orderBy(...orderBy(filters))
    .limit(limit)
    .offset(offset);
}

/** Confirmed consults of some leads: the first one of each. */
async function findConsults(leadIds: number[]): Promise<Map<number, string>> {
  if (leadIds.length === 0) return new Map();
  const rows = await db
    .select({ leadId: bookings.leadId, startsAt: bookings.startsAt })
    .from(bookings)
    .where(and(inArray(bookings.leadId, leadIds), eq(bookings.status, "confirmed")))
    .orderBy(bookings.startsAt);
  const first = new Map<number, string>();
  for (const row of rows) if (!first.has(row.leadId)) first.set(row.leadId, row.startsAt);
  return first;
}

/** Leads per status under the other filters, and their sum as "all". */
export async function countByStatus(
  companyId: number,
  timeZone: string,
  filters: InboxFilters,
): Promise<InboxPage["counts"]> {
  const rows = await db
    .select({ status: leads.status, n: count() })
    .from(leads)
    .where(filterConditions(companyId, timeZone, filters, false))
    .groupBy(leads.status);
  const counts = Object.fromEntries([...LEAD_STATUSES, "all"].map((s) => [s, 0])) as InboxPage["counts"];
  for (const row of rows) {
    counts[row.status] = row.n;
    counts.all += row.n;
  }
  return counts;
}

/** One page of the inbox (25 rows), its counts and unseen marks; times shown in the company's zone. */
export async function loadInboxPage(args: {
  companyId: number;
  timeZone: string;
  filters: InboxFilters;
  unseenSince: string | null;
  now?: Date;
  pageSize?: number;
}): Promise<InboxPage> {
  const { companyId, timeZone, filters, unseenSince } = args;
  const now = args.now ?? new Date();
  const pageSize = args.pageSize ?? INBOX_PAGE_SIZE;
  const [counts, rows, [unseen]] = await Promise.all([
    countByStatus(companyId, timeZone, filters),
    selectRows(companyId, timeZone, filters, pageSize, (filters.page - 1) * pageSize),
    db
      .select({ n: count() })
      .from(leads)
      .where(
        unseenSince
          ? and(eq(leads.companyId, companyId), gt(leads.createdAt, unseenSince))
          : eq(leads.companyId, companyId),
      ),
  ]);
  const consults = await findConsults(rows.map((r) => r.id));
  const total = filters.status ? counts[filters.status] : counts.all;
  return {
    query: inboxSearchParams(filters).toString(),
    filters,
    rows: rows.map((r): InboxRow => {
      const consultAt = consults.get(r.id);
      return {
        id: r.id,
        status: r.status,
        pausedStage: r.pausedStage,
        customerName: r.customerName,
        email: r.email,
        phone: r.phone,
        town: r.town,
        bowlDiameterIn: r.bowlDiameterIn,
        stoneName: r.stoneName,
        priceLowCents: r.priceLowCents,
        priceHighCents: r.priceHighCents,
        consult: consultAt ? { startsAt: consultAt, label: formatZonedDateTime(consultAt, timeZone) } : null,
        assignee: r.assigneeId !== null && r.assigneeName !== null ? { id: r.assigneeId, name: r.assigneeName } : null,
        createdAt: r.createdAt,
        receivedLabel: formatZonedDateTime(r.createdAt, timeZone),
        ageLabel: describeAge(r.createdAt, now),
        isUnseen: unseenSince === null || r.createdAt > unseenSince,
      };
    }),
    total,
    page: filters.page,
    pageCount: Math.max(1, Math.ceil(total / pageSize)),
    pageSize,
    counts,
    unseenCount: unseen?.n ?? 0,
    unseenSince,
    generatedAt: now.toISOString(),
  };
}

// An export is a working list, not a backup: this many rows is far beyond any one contractor.
const MAX_EXPORT_ROWS = 50_000;

const CSV_HEADER = [
  "Request",
  "Received",
  "Stage",
  "Why stopped",
  "Customer",
  "E-mail",
  "Phone",
  "Street",
  "Town",
  "Bowl (in)",
  "Wall stone",
  "Price low (USD)",
  "Price high (USD)",
  "Consult",
  "Estimator",
];

const dollars = (cents: number | null) => (cents === null ? "" : (cents / 100).toFixed(2));

/** Every lead under the filters (all pages, same order) as CSV text. */
export async function exportInboxCsv(companyId: number, timeZone: string, filters: InboxFilters): Promise<string> {
  const rows = await selectRows(companyId, timeZone, filters, MAX_EXPORT_ROWS, 0);
  const consults = await findConsultsInChunks(rows.map((r) => r.id));
  return toCsv(
    CSV_HEADER,
    rows.map((r) => {
      const consultAt = consults.get(r.id);
      return [
        r.id,
        `${formatZonedDate(r.createdAt, timeZone)} ${new Intl.DateTimeFormat("en-US", { timeZone, hour: "numeric", minute: "2-digit" }).format(new Date(r.createdAt))}`,
        STATUS_LABEL[r.status],
        r.stopReason ?? "",
        r.customerName,
        r.email,
        r.phone,
        r.street,
        r.town,
        r.bowlDiameterIn.toFixed(2),
        r.stoneName,
        dollars(r.priceLowCents),
        dollars(r.priceHighCents),
        consultAt ? formatZonedDateTime(consultAt, timeZone) : "",
        r.assigneeName ?? "",
      ];
    }),
  );
}

// SQLite caps bound parameters per statement; look consults up a few hundred leads at a time.
async function findConsultsInChunks(leadIds: number[]): Promise<Map<number, string>> {
  const all = new Map<number, string>();
  for (let i = 0; i < leadIds.length; i += 500) {
    for (const [k, v] of await findConsults(leadIds.slice(i, i + 500))) all.set(k, v);
  }
  return all;
}

/** When the person last opened the inbox page (ISO), or null if they never have. */
export async function inboxSeenAt(userId: number): Promise<string | null> {
  const [me] = await db.select({ inboxSeenAt: users.inboxSeenAt }).from(users).where(eq(users.id, userId)).limit(1);
  return me?.inboxSeenAt ?? null;
}

/** Records that the person has seen the inbox as it was at `at`: later leads count as unseen. Never moves back. */
export async function markInboxSeen(userId: number, at: Date): Promise<void> {
  const iso = at.toISOString();
  await db
    .update(users)
    .set({ inboxSeenAt: iso })
    .where(and(eq(users.id, userId), or(isNull(users.inboxSeenAt), lt(users.inboxSeenAt, iso))));
}
