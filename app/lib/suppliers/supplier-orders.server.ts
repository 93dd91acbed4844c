import { and, asc, desc, eq, inArray } from "drizzle-orm";
import {
  emailOutbox,
  leadEvents,
  leads,
  supplierOrderDrops,
  supplierOrders,
  suppliers,
  type CatalogItem,
  type Lead,
  type Supplier,
  type SupplierOrder,
  type SupplierOrderDrop,
} from "~/db/schema";
import type { SupplierOrderState } from "~/db/enums";
import { SupplierOrderEmail } from "~/emails/supplier-order-email";
import {
  checkCombine,
  deliveredWeight,
  moveSupplierOrder,
  roundOrderLine,
  type RoundedLine,
  type RoundingProblem,
  type SupplierOrderMove,
} from "~/domain/supplier-order";
import { findSignedProposal, listSignedChangeOrders } from "~/lib/proposals/change-orders.server";
import { getCompany, listCatalog } from "~/lib/catalog/catalog.server";
import { toCsv } from "~/lib/format/csv";
import { db, writeTransaction } from "~/lib/platform/db.server";
import { prepareOutboxRow } from "~/lib/platform/email.server";
import { isSignedStage, STATUS_LABEL } from "~/lib/leads/lead-status";
import { formId } from "~/lib/format/form-fields";
import { describeOrderQuantity, formatDeliveryDay, formatPounds } from "~/lib/suppliers/order-units";
import { formatPhone } from "~/lib/format/phone";
import { getProposalTerms } from "~/lib/proposals/proposal-terms.server";
import type { SessionUser } from "~/lib/auth/session.server";
import { findSiteVisit } from "~/lib/leads/site-visit.server";
import { SLOPE_LABEL, UTILITY_LABEL } from "~/lib/leads/site-visit-schema";
import { readStoredPlan } from "~/lib/design/stored-plan";
import { renderSupplierOrderPdf } from "~/lib/suppliers/supplier-order-pdf.server";
import type { SupplierOrderDocument } from "~/lib/suppliers/supplier-order-document";
import { zonedDay } from "~/lib/format/zoned-time";

/*
 * Supplier orders for signed jobs: the material order of the job as signed (the proposal, or its
 * latest signed change order) rounded to how each yard sells (app/domain/supplier-order.ts), one
 * order per supplier with one drop per job. Sending writes the e-mail (PDF and CSV attached) to the
 * outbox in the same transaction as the state change; every change is on each job's timeline.
 * Owners only: the orders are the company's purchasing.
 */

export const ORDER_STATE_LABEL: Record<SupplierOrderState, string> = {
  drafted: "Draft",
  sent: "Sent",
  confirmed: "Confirmed by the supplier",
  delivered: "Delivered",
  combined: "Combined into another order",
  discarded: "Discarded",
};

/** States an order still counts in (a job has at most one of these per supplier). */
const LIVE_STATES: SupplierOrderState[] = ["drafted", "sent", "confirmed", "delivered"];

export const orderNumber = (id: number) => `SO-${String(id).padStart(4, "0")}`;

export type Failure = { ok: false; status: 400 | 404 | 409; errors: Record<string, string> };

// ---- The job's material order, rounded ----

export type PlannedGroup = {
  supplier: Pick<Supplier, "id" | "name" | "email">;
  lines: RoundedLine[];
  weightLb: number;
  unknownWeights: string[];
};
export type PlannedOrder = { groups: PlannedGroup[]; problems: RoundingProblem[] };

/**
 * The catalog item behind each line of the material order: the design's choice, else the first offered item of the
 * kind.
 */
function itemFor(
  key: string,
  choices: {
    stoneId: number;
    capId: number | null;
    ringId: number | null;
    paverId: number | null;
    borderId: number | null;
  },
  catalog: CatalogItem[],
): CatalogItem | null {
  const byId = (id: number | null) =>
    id === null ? null : (catalog.find((i) => i.id === id && i.kind === key) ?? null);
  const chosen =
    key === "wall-unit"
      ? byId(choices.stoneId)
      : key === "cap"
        ? byId(choices.capId)
        : key === "steel-ring" || key === "firebrick"
          ? byId(choices.ringId)
          : key === "paver"
            ? byId(choices.paverId)
            : key === "border-unit"
              ? byId(choices.borderId)
              : null;
  if (chosen) return chosen;
  // Sundries are priced from the first offered item of their kind (supplyPricesFrom): order the same one.
  return catalog.find((i) => i.kind === key && i.isActive) ?? catalog.find((i) => i.kind === key) ?? null;
}

/** The signed job's material order rounded per supplier, and the lines that cannot be ordered yet (and why). */
export async function planSupplierOrders(lead: Lead): Promise<PlannedOrder | null> {
  const signed = await findSignedProposal(lead);
  if (!signed) return null;
  const latest = (await listSignedChangeOrders(signed)).at(-1) ?? signed;
  const record = readStoredPlan(latest);
  const [catalog, supplierRows] = await Promise.all([
    listCatalog(lead.companyId),
    db.select().from(suppliers).where(eq(suppliers.companyId, lead.companyId)),
  ]);
  const factors = record.design.inputs.factors;
  const density = (key: string): number | null => {
    // The densities the plan turned volumes into tons with (company factors, stored with the plan).
    const value = key === "aggregate" ? factors.baseTonsPerYd3 : key === "bedding-sand" ? factors.sandTonsPerYd3 : null;
    return typeof value === "number" ? value : null;
  };
  const groups = new Map<number, PlannedGroup>();
  const problems: RoundingProblem[] = [];
  for (const line of record.plan.materials) {
    if (line.quantity <= 0) continue;
    const item = itemFor(line.key, record.design.choices, catalog);
    const supplier = item?.supplierId ? supplierRows.find((s) => s.id === item.supplierId) : undefined;
    if (!item || !supplier) {
      problems.push({
        key: line.key,
        item: line.item,
        message: item
          ? `${item.name} has no supplier: choose one in the catalog.`
          : `${line.item} is not in your catalog.`,
      });
      continue;
    }
    const rounded = roundOrderLine(
      { key: line.key, item: item.name, quantity: line.quantity, unit: line.unit },
      {
        orderUnit: item.orderUnit,
        unitsPerOrderUnit: item.unitsPerOrderUnit,
        orderUnitWeightLb: item.orderUnitWeightLb,
      },
      density(line.key),
    );
    if (!rounded.ok) {
      problems.push(rounded.problem);
      continue;
    }
    const group = groups.get(supplier.id) ?? {
      supplier: { id: supplier.id, name: supplier.name, email: supplier.email },
      lines: [],
      weightLb: 0,
      unknownWeights: [],
    };
    group.lines.push(rounded.line);
    groups.set(supplier.id, group);
  }
  for (const group of groups.values())
    Object.assign(
      group,
      (({ weightLb, unknown }) => ({ weightLb, unknownWeights: unknown }))(deliveredWeight(group.lines)),
    );
  return { groups: [...groups.values()].sort((a, b) => a.supplier.name.localeCompare(b.supplier.name)), problems };
}

/** What the driver needs to know from the site visit: the way in, the ground, the marks, and the estimator's notes. */
async function accessNotesFor(lead: Lead): Promise<string> {
  const visit = await findSiteVisit(lead);
  if (!visit) return "";
  return [
    `Narrowest way in from where the truck parks: ${visit.accessWidthIn} in.`,
    `Slope: ${SLOPE_LABEL[visit.slope]}.`,
    `Utility marks: ${UTILITY_LABEL[visit.utilityMarks]}.`,
    visit.notes.trim(),
  ]
    .filter(Boolean)
    .join(" ");
}

const DAY = /^\d{4}-\d{2}-\d{2}$/;

/** A requested delivery day: a real calendar day, today or later in the company's zone, within a year. */
export function checkDeliveryDay(day: string, today: string): string | null {
  if (
    !DAY.test(day) ||
    Number.isNaN(Date.parse(`${day}T00:00:00Z`)) ||
    new Date(`${day}T00:00:00Z`).toISOString().slice(0, 10) !== day
  ) {
    return "Delivery date must be a date like 2026-12-10.";
  }
  if (day < today) return `Delivery date must be today (${today}) or later.`;
  const limit = new Date(`${today}T00:00:00Z`);
  limit.setUTCFullYear(limit.getUTCFullYear() + 1);
  if (day > limit.toISOString().slice(0, 10)) return "Delivery date must be within a year.";
  return null;
}

/** Drafts one order per supplier for a signed job, for delivery on `requestedOn`; each on the job's timeline. */
export async function draftSupplierOrders(
  user: SessionUser,
  lead: Lead,
  requestedOn: string,
): Promise<{ ok: true; orderIds: number[] } | Failure> {
  if (!isSignedStage(lead.status)) {
    return {
      ok: false,
      status: 409,
      errors: { form: `Supplier orders are for signed jobs; this job is at “${STATUS_LABEL[lead.status]}”.` },
    };
  }
  const company = await getCompany(lead.companyId);
  const dayProblem = checkDeliveryDay(requestedOn, zonedDay(new Date(), company.timeZone));
  if (dayProblem) return { ok: false, status: 400, errors: { requestedOn: dayProblem } };
  const planned = await planSupplierOrders(lead);
  if (!planned) return { ok: false, status: 409, errors: { form: "This job has no signed proposal to order from." } };
  if (planned.groups.length === 0)
    return {
      ok: false,
      status: 409,
      errors: { form: "No line of the material order has a supplier yet: set suppliers in the catalog." },
    };
  const accessNotes = await accessNotesFor(lead);
  const siteAddress = `${lead.street}, ${lead.town}`;
  const at = new Date().toISOString();
  return writeTransaction(async (tx) => {
    // Checked inside the transaction: two drafts at once cannot both pass.
    const live = await tx
      .select({ supplierId: supplierOrders.supplierId, id: supplierOrders.id })
      .from(supplierOrderDrops)
      .innerJoin(supplierOrders, eq(supplierOrders.id, supplierOrderDrops.orderId))
      .where(
        and(
          eq(supplierOrderDrops.leadId, lead.id),
          eq(supplierOrderDrops.companyId, lead.companyId),
          inArray(supplierOrders.status, LIVE_STATES),
        ),
      );
    const clash = planned.groups.find((g) => live.some((l) => l.supplierId === g.supplier.id));
    if (clash) {
      const existing = live.find((l) => l.supplierId === clash.supplier.id)!;
      return {
        ok: false,
        status: 409,
        errors: {
          form: `This job already has ${orderNumber(existing.id)} to ${clash.supplier.name}; discard that draft first to draft again.`,
        },
      } as const;
    }
    const orderIds: number[] = [];
    for (const group of planned.groups) {
      const [order] = await tx
        .insert(supplierOrders)
        .values({
          companyId: lead.companyId,
          supplierId: group.supplier.id,
          createdByUserId: user.id,
          createdAt: at,
          updatedAt: at,
        })
        .returning({ id: supplierOrders.id });
      await tx.insert(supplierOrderDrops).values({
        companyId: lead.companyId,
        orderId: order!.id,
        leadId: lead.id,
        requestedOn,
        siteAddress,
        accessNotes,
        linesJson: JSON.stringify(group.lines),
        weightLb: group.weightLb,
        createdAt: at,
      });
      await tx.insert(leadEvents).values({
        companyId: lead.companyId,
        leadId: lead.id,
        actorUserId: user.id,
        kind: "supplier-order",
        detail: `${orderNumber(order!.id)} to ${group.supplier.name} drafted for delivery ${formatDeliveryDay(requestedOn)}: ${group.lines.map((l) => `${describeOrderQuantity(l.orderQuantity, l.orderUnit)} ${l.item}`).join(", ")}; ${formatPounds(group.weightLb)}.`,
        createdAt: at,
      });
      orderIds.push(order!.id);
    }
    return { ok: true, orderIds } as const;
  });
}

// ---- Reading orders ----

export type DropView = Omit<SupplierOrderDrop, "linesJson"> & { lines: RoundedLine[]; customerName: string };
export type OrderView = SupplierOrder & { supplier: Supplier; drops: DropView[]; weightLb: number };

function parseLines(json: string): RoundedLine[] {
  return JSON.parse(json) as RoundedLine[];
}

async function dropsOf(companyId: number, orderIds: number[]): Promise<DropView[]> {
  if (orderIds.length === 0) return [];
  const rows = await db
    .select({ drop: supplierOrderDrops, customerName: leads.customerName })
    .from(supplierOrderDrops)
    .innerJoin(leads, eq(leads.id, supplierOrderDrops.leadId))
    .where(and(eq(supplierOrderDrops.companyId, companyId), inArray(supplierOrderDrops.orderId, orderIds)))
    .orderBy(asc(supplierOrderDrops.requestedOn), asc(supplierOrderDrops.id));
  return rows.map(({ drop: { linesJson, ...drop }, customerName }) => ({
    ...drop,
    lines: parseLines(linesJson),
    customerName,
  }));
}

async function withDrops(
  companyId: number,
  rows: { order: SupplierOrder; supplier: Supplier }[],
): Promise<OrderView[]> {
  const drops = await dropsOf(
    companyId,
    rows.map((r) => r.order.id),
  );
  return rows.map(({ order, supplier }) => {
    const own = drops.filter((d) => d.orderId === order.id);
    return { ...order, supplier, drops: own, weightLb: own.reduce((sum, d) => sum + d.weightLb, 0) };
  });
}

/** Every order of the company except discarded ones, newest first. */
export async function listSupplierOrders(companyId: number): Promise<OrderView[]> {
  const rows = await db
    .select({ order: supplierOrders, supplier: suppliers })
    .from(supplierOrders)
    .innerJoin(suppliers, eq(suppliers.id, supplierOrders.supplierId))
    .where(and(eq(supplierOrders.companyId, companyId), inArray(supplierOrders.status, LIVE_STATES)))
    .orderBy(desc(supplierOrders.id));
  return withDrops(companyId, rows);
}

/** The live orders that deliver to one job. */
export async function listJobSupplierOrders(lead: Lead): Promise<OrderView[]> {
  const ids = await db
    .selectDistinct({ id: supplierOrderDrops.orderId })
    .from(supplierOrderDrops)
    .where(and(eq(supplierOrderDrops.leadId, lead.id), eq(supplierOrderDrops.companyId, lead.companyId)));
  return (await listSupplierOrders(lead.companyId)).filter((o) => ids.some((i) => i.id === o.id));
}

/** One order of the company with its drops; null for another company's or no such order. */
export async function findSupplierOrder(companyId: number, orderId: number): Promise<OrderView | null> {
  const rows = await db
    .select({ order: supplierOrders, supplier: suppliers })
    .from(supplierOrders)
    .innerJoin(suppliers, eq(suppliers.id, supplierOrders.supplierId))
    .where(and(eq(supplierOrders.companyId, companyId), eq(supplierOrders.id, orderId)))
    .limit(1);
  return (await withDrops(companyId, rows))[0] ?? null;
}

/** The company's order by its :orderId, or a 404 (a malformed id, no such order, another company's). */
export async function requireOrder(companyId: number, raw: string | undefined): Promise<OrderView> {
  const id = formId("Not found").safeParse(raw ?? "");
  const order = id.success ? await findSupplierOrder(companyId, id.data) : null;
  // A combined order's page leads to the order it went into.
  if (!order || order.status === "discarded") throw new Response("Not found", { status: 404 });
  return order;
}

// ---- The document: PDF, CSV and e-mail say the same ----

export type { SupplierOrderDocument };

export async function buildOrderDocument(order: OrderView, preparedOn: string): Promise<SupplierOrderDocument> {
  const [company, terms] = await Promise.all([getCompany(order.companyId), getProposalTerms(order.companyId)]);
  const lines = order.drops.flatMap((d) => d.lines);
  return {
    number: orderNumber(order.id),
    preparedOn,
    company: {
      name: company.name,
      email: company.email,
      phone: company.phone ? formatPhone(company.phone) : "",
      address: terms.streetAddress || company.town,
    },
    supplier: {
      name: order.supplier.name,
      email: order.supplier.email,
      phone: order.supplier.phone ? formatPhone(order.supplier.phone) : "",
    },
    drops: order.drops.map((d) => ({
      job: `Job ${d.leadId} (${d.customerName})`,
      requestedOn: d.requestedOn,
      siteAddress: d.siteAddress,
      accessNotes: d.accessNotes,
      lines: d.lines,
      weightLb: d.weightLb,
    })),
    weightLb: order.weightLb,
    unknownWeights: [...new Set(deliveredWeight(lines).unknown)],
  };
}

const CSV_HEADER = [
  "order",
  "job",
  "delivery_date",
  "site_address",
  "item",
  "order_quantity",
  "order_unit",
  "planned_quantity",
  "planned_unit",
  "weight_lb",
];

/** The order as CSV (RFC 4180): one row per line, each drop's address and date repeated. */
export function orderCsv(document: SupplierOrderDocument): string {
  return toCsv(
    CSV_HEADER,
    document.drops.flatMap((d) =>
      d.lines.map((l) => [
        document.number,
        d.job,
        d.requestedOn,
        d.siteAddress,
        l.item,
        l.orderQuantity,
        l.orderUnit,
        l.planQuantity,
        l.planUnit,
        l.weightLb === null ? "" : Math.round(l.weightLb),
      ]),
    ),
  );
}

// ---- Moves ----

type TimelineFor = { leadIds: number[]; detail: string };

function timelineRows(companyId: number, actorUserId: number, at: string, entry: TimelineFor) {
  return [...new Set(entry.leadIds)].map((leadId) => ({
    companyId,
    leadId,
    actorUserId,
    kind: "supplier-order",
    detail: entry.detail,
    createdAt: at,
  }));
}

/**
 * Moves an order one step: send (e-mail with PDF and CSV through the outbox; a signed job becomes
 * "stone ordered"), confirm (the owner records the supplier's confirmation), deliver, or discard a
 * draft. The state is re-checked by the UPDATE itself, so of two moves at once one wins and the
 * other is told why not (409).
 */
export async function moveOrder(
  user: SessionUser,
  order: OrderView,
  move: Exclude<SupplierOrderMove, "combine">,
  note: string,
): Promise<{ ok: true } | Failure> {
  const allowed = moveSupplierOrder(order.status, move);
  if (!allowed.ok) return { ok: false, status: 409, errors: { form: allowed.message } };
  const at = new Date().toISOString();
  const leadIds = order.drops.map((d) => d.leadId);
  const number = orderNumber(order.id);
  const stamp =
    move === "send"
      ? { sentAt: at }
      : move === "confirm"
        ? { confirmedAt: at, confirmationNote: note || null }
        : move === "deliver"
          ? { deliveredAt: at }
          : {};
  let outbox: Awaited<ReturnType<typeof prepareOutboxRow>> | null = null;
  if (move === "send") {
    if (order.drops.length === 0)
      return { ok: false, status: 409, errors: { form: "This order has no deliveries to send." } };
    const company = await getCompany(order.companyId);
    const document = await buildOrderDocument(order, zonedDay(new Date(at), company.timeZone));
    const pdf = await renderSupplierOrderPdf(document, at);
    outbox = await prepareOutboxRow({
      idempotencyKey: `supplier-order/${order.id}`,
      companyId: order.companyId,
      to: order.supplier.email,
      subject: `Order ${number} from ${company.name}`,
      template: SupplierOrderEmail({ document }),
      attachments: [
        { filename: `${number.toLowerCase()}.pdf`, content: pdf.toString("base64"), contentType: "application/pdf" },
        {
          filename: `${number.toLowerCase()}.csv`,
          content: Buffer.from(orderCsv(document)).toString("base64"),
          contentType: "text/csv",
        },
      ],
    });
  }
  const words =
    move === "send"
      ? `sent to ${order.supplier.name} (${order.supplier.email}) with the PDF and CSV`
      : move === "confirm"
        ? `confirmed by ${order.supplier.name}${note ? `: ${note}` : ""}`
        : move === "deliver"
          ? "delivered"
          : "discarded";
  return writeTransaction(async (tx) => {
    const moved = await tx
      .update(supplierOrders)
      .set({ status: allowed.to, ...stamp, updatedAt: at })
      .where(
        and(
          eq(supplierOrders.id, order.id),
          eq(supplierOrders.companyId, order.companyId),
          eq(supplierOrders.status, order.status),
        ),
      )
      .returning({ id: supplierOrders.id });
    if (moved.length === 0) {
      const [now] = await tx
        .select({ status: supplierOrders.status })
        .from(supplierOrders)
        .where(eq(supplierOrders.id, order.id));
      const again = moveSupplierOrder(now?.status ?? order.status, move);
      return {
        ok: false,
        status: 409,
        errors: { form: again.ok ? "This order changed meanwhile; look again." : again.message },
      } as const;
    }
    if (outbox) await tx.insert(emailOutbox).values(outbox);
    if (move === "send") {
      // The stone is on order: a job at "signed" moves on (one further along stays where it is).
      const signedJobs = await tx
        .update(leads)
        .set({ status: "stone-ordered", updatedAt: at })
        .where(and(inArray(leads.id, leadIds), eq(leads.companyId, order.companyId), eq(leads.status, "signed")))
        .returning({ id: leads.id });
      for (const job of signedJobs) {
        await tx.insert(leadEvents).values({
          companyId: order.companyId,
          leadId: job.id,
          actorUserId: user.id,
          kind: "status",
          detail: `${STATUS_LABEL.signed} → ${STATUS_LABEL["stone-ordered"]}`,
          createdAt: at,
        });
      }
    }
    const rows = timelineRows(order.companyId, user.id, at, { leadIds, detail: `${number} ${words}.` });
    if (rows.length) await tx.insert(leadEvents).values(rows);
    return { ok: true } as const;
  });
}

/**
 * Combines drafts to one supplier whose deliveries fall in one week into the oldest of them: the
 * others' drops move to it and they are marked combined. Each job's timeline says so.
 */
export async function combineOrders(
  user: SessionUser,
  companyId: number,
  orderIds: number[],
): Promise<{ ok: true; orderId: number } | Failure> {
  const unique = [...new Set(orderIds)].sort((a, b) => a - b);
  const orders = (await Promise.all(unique.map((id) => findSupplierOrder(companyId, id)))).filter(
    (o): o is OrderView => o !== null,
  );
  if (orders.length !== unique.length)
    return { ok: false, status: 404, errors: { form: "One of those orders does not exist." } };
  const problem = checkCombine(
    orders.map((o) => ({
      id: o.id,
      label: orderNumber(o.id),
      supplierId: o.supplierId,
      state: o.status,
      requestedOn: o.drops.map((d) => d.requestedOn),
    })),
  );
  if (problem) return { ok: false, status: 409, errors: { form: problem } };
  const [target, ...others] = orders as [OrderView, ...OrderView[]];
  const otherIds = others.map((o) => o.id);
  const at = new Date().toISOString();
  return writeTransaction(async (tx) => {
    const still = await tx
      .select({ id: supplierOrders.id })
      .from(supplierOrders)
      .where(
        and(
          inArray(supplierOrders.id, unique),
          eq(supplierOrders.companyId, companyId),
          eq(supplierOrders.status, "drafted"),
        ),
      );
    if (still.length !== unique.length)
      return {
        ok: false,
        status: 409,
        errors: { form: "One of those orders is no longer a draft; look again." },
      } as const;
    await tx
      .update(supplierOrderDrops)
      .set({ orderId: target.id })
      .where(and(inArray(supplierOrderDrops.orderId, otherIds), eq(supplierOrderDrops.companyId, companyId)));
    await tx
      .update(supplierOrders)
      .set({ status: "combined", combinedIntoId: target.id, updatedAt: at })
      .where(inArray(supplierOrders.id, otherIds));
    await tx.update(supplierOrders).set({ updatedAt: at }).where(eq(supplierOrders.id, target.id));
    const rows = timelineRows(companyId, user.id, at, {
      leadIds: orders.flatMap((o) => o.drops.map((d) => d.leadId)),
      detail: `${otherIds.map(orderNumber).join(", ")} combined into ${orderNumber(target.id)} to ${target.supplier.name}: one order for ${orders.reduce((n, o) => n + o.drops.length, 0)} deliveries.`,
    });
    if (rows.length) await tx.insert(leadEvents).values(rows);
    return { ok: true, orderId: target.id } as const;
  });
}
