/*
 * Supplier orders end to end through their routes: drafting from a signed job's stored plan (the
 * rounding is checked against the plan's own lines and the catalog's pack sizes, worked here), the
 * forward-only states with a clear 4xx for a wrong move, the e-mail in the outbox with its PDF
 * (starts "%PDF-", ISO 32000) and CSV (RFC 4180 header), combining same-week drafts, and the catalog
 * and supplier forms' bad input.
 */
import { and, eq, like } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import {
  catalogItems,
  emailOutbox,
  leadEvents,
  leads,
  supplierOrderDrops,
  supplierOrders,
  suppliers,
  type Lead,
} from "~/db/schema";
import { readStoredPlan } from "~/lib/design/stored-plan";
import { findSignedProposal, listSignedChangeOrders } from "~/lib/proposals/change-orders.server";
import { db } from "~/lib/platform/db.server";
import { nextDay, zonedDay } from "~/lib/format/zoned-time";
import { action as catalogItemAction } from "~/routes/app-catalog-item";
import { action as jobOrdersAction, loader as jobOrdersLoader } from "~/routes/app-lead-supplier-orders";
import { action as orderAction, loader as orderLoader } from "~/routes/app-supplier-order";
import { action as ordersAction } from "~/routes/app-supplier-orders";
import { action as suppliersAction } from "~/routes/app-suppliers";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";

let owner = "";
let otherOwner = "";
let companyId = 0;
let today = "";
const byName = async (name: string) =>
  (
    await db
      .select()
      .from(leads)
      .where(and(eq(leads.companyId, companyId), eq(leads.customerName, name)))
  )[0]!;

const post = (url: string, cookie: string, fields: Record<string, string | string[]>) => {
  const body = new URLSearchParams();
  for (const [k, v] of Object.entries(fields)) for (const one of [v].flat()) body.append(k, one);
  return requestWithCookie(url, cookie, {
    method: "POST",
    body,
    headers: { "Content-Type": "application/x-www-form-urlencoded" },
  });
};

/** What an action answered: its status and, for data(), the errors it carries. */
async function answer(
  run: () => Promise<unknown>,
): Promise<{ status: number; location?: string; errors?: Record<string, string> }> {
  let value: unknown;
  try {
    value = await run();
  } catch (thrown) {
    value = thrown;
  }
  if (value instanceof Response) return { status: value.status, location: value.headers.get("Location") ?? undefined };
  const v = value as { init?: { status?: number }; data?: { errors?: Record<string, string> } };
  return { status: v.init?.status ?? 200, errors: v.data?.errors };
}

const draft = (lead: Lead, requestedOn: string, cookie = owner) =>
  answer(() =>
    jobOrdersAction(
      routeArgs(post(`/app/leads/${lead.id}/supplier-orders`, cookie, { requestedOn }), { leadId: String(lead.id) }),
    ),
  );
const move = (orderId: number, fields: Record<string, string>) =>
  answer(() =>
    orderAction(routeArgs(post(`/app/supplier-orders/${orderId}`, owner, fields), { orderId: String(orderId) })),
  );
const ordersOf = async (leadId: number) =>
  db
    .select({ order: supplierOrders, drop: supplierOrderDrops, supplier: suppliers })
    .from(supplierOrderDrops)
    .innerJoin(supplierOrders, eq(supplierOrders.id, supplierOrderDrops.orderId))
    .innerJoin(suppliers, eq(suppliers.id, supplierOrders.supplierId))
    .where(eq(supplierOrderDrops.leadId, leadId));

beforeAll(async () => {
  const { company } = await demoCompany();
  const other = await demoCompany("north-ridge");
  companyId = company.id;
  owner = await loginAs(company.id, "owner");
  otherOwner = await loginAs(other.company.id, "owner");
  today = zonedDay(new Date(), company.timeZone);
});

/** The Monday of the week after next, and the Friday of that week: the same ISO week. */
function nextWeek(): { monday: string; friday: string } {
  let day = nextDay(today);
  while (new Date(`${day}T00:00:00Z`).getUTCDay() !== 1) day = nextDay(day);
  day = Array.from({ length: 7 }).reduce<string>((d) => nextDay(d), day);
  let friday = day;
  for (let i = 0; i < 4; i += 1) friday = nextDay(friday);
  return { monday: day, friday };
}

describe("drafting from a signed job", () => {
  test("a signed job with a patio and firebrick: one order per supplier, each line rounded from the job's signed plan", async () => {
    const lead = await byName("Mirela Castellanos");
    expect(lead.status).toBe("signed");
    const { monday } = nextWeek();
    expect(await draft(lead, monday)).toMatchObject({
      status: 302,
      location: `/app/leads/${lead.id}/supplier-orders?drafted=2`,
    });

    const rows = await ordersOf(lead.id);
    expect(rows.map((r) => r.supplier.name).sort()).toEqual(["Kestrel Hearth Supply", "Millbrook Stone Yard"]);
    const yard = rows.find((r) => r.supplier.name === "Millbrook Stone Yard")!;
    expect(yard.order.status).toBe("drafted");
    expect(yard.drop.requestedOn).toBe(monday);
    expect(yard.drop.siteAddress).toBe("305 Kestrel Avenue, Copperfield Mills");
    expect(yard.drop.accessNotes).toMatch(/^Narrowest way in from where the truck parks: \d+(\.\d+)? in\./);

    // The plan the job was signed on: its wall units go on pallets of 90 (the demo catalog's Ridgeback Taper).
    const signed = (await findSignedProposal(lead))!;
    const plan = readStoredPlan((await listSignedChangeOrders(signed)).at(-1) ?? signed).plan;
    const wall = plan.materials.find((m) => m.key === "wall-unit")!;
    const lines = JSON.parse(yard.drop.linesJson) as {
      key: string;
      orderQuantity: number;
      orderUnit: string;
      weightLb: number | null;
    }[];
    const pallets = Math.ceil(wall.quantity / 90);
    expect(lines.find((l) => l.key === "wall-unit")).toMatchObject({
      orderQuantity: pallets,
      orderUnit: "pallet",
      weightLb: pallets * 2030,
    });
    // Base aggregate in half tons: the plan's tons rounded up to the next 0.5.
    const base = plan.materials.find((m) => m.key === "aggregate")!;
    expect(lines.find((l) => l.key === "aggregate")).toMatchObject({
      orderQuantity: Math.ceil(base.quantity * 2 - 1e-9) / 2,
      orderUnit: "ton",
    });
    // Delivered weight is the sum of the lines.
    expect(yard.drop.weightLb).toBeCloseTo(
      lines.reduce((sum, l) => sum + (l.weightLb ?? 0), 0),
      6,
    );

    const events = await db
      .select()
      .from(leadEvents)
      .where(and(eq(leadEvents.leadId, lead.id), eq(leadEvents.kind, "supplier-order")));
    expect(events.map((e) => e.detail).join("\n")).toMatch(/to Millbrook Stone Yard drafted for delivery/);
  });

  test("a second draft for the same job is refused (409) and nothing more is written", async () => {
    const lead = await byName("Mirela Castellanos");
    const before = (await ordersOf(lead.id)).length;
    const result = await draft(lead, nextWeek().monday);
    expect(result.status).toBe(409);
    expect(result.errors?.form).toMatch(/already has SO-\d{4} to/);
    expect((await ordersOf(lead.id)).length).toBe(before);
  });

  test("bad delivery dates name the field and what is allowed; nothing is written", async () => {
    const lead = await byName("Tobias Wren");
    for (const [value, message] of [
      ["", /date like 2026-12-10/],
      ["2026-13-01", /date like/],
      ["2026-02-30", /date like/],
      ["2020-01-01", /today .* or later/],
      ["tomorrow", /date like/],
    ] as const) {
      const result = await draft(lead, value);
      expect(result.status, value).toBe(400);
      expect(result.errors?.requestedOn, value).toMatch(message);
    }
    expect(await ordersOf(lead.id)).toEqual([]);
  });

  test("a job that is not signed gets a 409 that says why; another company's job is a 404", async () => {
    const notSigned = (
      await db
        .select()
        .from(leads)
        .where(and(eq(leads.companyId, companyId), eq(leads.status, "proposal-out")))
    )[0]!;
    const result = await draft(notSigned, nextWeek().monday);
    expect(result).toMatchObject({
      status: 409,
      errors: { form: "Supplier orders are for signed jobs; this job is at “Proposal out”." },
    });
    const mine = await byName("Tobias Wren");
    expect((await draft(mine, nextWeek().monday, otherOwner)).status).toBe(404);
  });
});

describe("states", () => {
  test("drafted → sent (outbox e-mail with PDF and CSV, job becomes stone ordered) → confirmed → delivered; wrong moves are 409 in words", async () => {
    const lead = await byName("Mirela Castellanos");
    const yard = (await ordersOf(lead.id)).find((r) => r.supplier.name === "Millbrook Stone Yard")!;
    const id = yard.order.id;

    expect(await move(id, { intent: "confirm" })).toMatchObject({
      status: 409,
      errors: { form: "This order is a draft; only an order sent can be marked confirmed." },
    });
    expect(await move(id, { intent: "deliver" })).toMatchObject({ status: 409 });
    expect(await move(id, { intent: "ship" })).toMatchObject({
      status: 400,
      errors: { intent: "Choose send, confirm, deliver or discard." },
    });

    expect(await move(id, { intent: "send" })).toMatchObject({
      status: 302,
      location: `/app/supplier-orders/${id}?saved=send`,
    });
    const [mail] = await db
      .select()
      .from(emailOutbox)
      .where(eq(emailOutbox.idempotencyKey, `supplier-order/${id}`));
    expect(mail!.toAddress).toBe("orders@millbrook-stone.test");
    expect(mail!.subject).toBe(`Order SO-${String(id).padStart(4, "0")} from Cinder & Slate Outdoor Works`);
    const attachments = JSON.parse(mail!.attachmentsJson) as {
      filename: string;
      content: string;
      contentType: string;
    }[];
    expect(attachments.map((a) => [a.filename, a.contentType])).toEqual([
      [`so-${String(id).padStart(4, "0")}.pdf`, "application/pdf"],
      [`so-${String(id).padStart(4, "0")}.csv`, "text/csv"],
    ]);
    expect(Buffer.from(attachments[0]!.content, "base64").subarray(0, 5).toString()).toBe("%PDF-");
    const csv = Buffer.from(attachments[1]!.content, "base64").toString();
    expect(csv.split("\r\n")[0]).toBe(
      "order,job,delivery_date,site_address,item,order_quantity,order_unit,planned_quantity,planned_unit,weight_lb",
    );
    expect(csv).toContain(`"305 Kestrel Avenue, Copperfield Mills",Ridgeback Taper,`);
    expect((await db.select().from(leads).where(eq(leads.id, lead.id)))[0]!.status).toBe("stone-ordered");

    expect(await move(id, { intent: "send" })).toMatchObject({
      status: 409,
      errors: { form: "This order is sent; only a draft can be sent." },
    });
    expect(await move(id, { intent: "discard" })).toMatchObject({ status: 409 });
    expect(await move(id, { intent: "deliver" })).toMatchObject({
      status: 409,
      errors: { form: "This order is sent; only an order confirmed by the supplier can be marked delivered." },
    });
    expect(await move(id, { intent: "confirm", note: "x".repeat(121) })).toMatchObject({
      status: 400,
      errors: { note: "Confirmation note must be at most 120 characters." },
    });
    expect(await move(id, { intent: "confirm", note: "Ref 4471, Dana at the desk" })).toMatchObject({ status: 302 });
    expect(await move(id, { intent: "deliver" })).toMatchObject({ status: 302 });
    expect(await move(id, { intent: "deliver" })).toMatchObject({
      status: 409,
      errors: { form: "This order is delivered; only an order confirmed by the supplier can be marked delivered." },
    });

    const [row] = await db.select().from(supplierOrders).where(eq(supplierOrders.id, id));
    expect(row).toMatchObject({ status: "delivered", confirmationNote: "Ref 4471, Dana at the desk" });
    const timeline = (await db.select().from(leadEvents).where(eq(leadEvents.leadId, lead.id)))
      .map((e) => e.detail)
      .join("\n");
    expect(timeline).toMatch(/sent to Millbrook Stone Yard \(orders@millbrook-stone\.test\) with the PDF and CSV/);
    expect(timeline).toMatch(/confirmed by Millbrook Stone Yard: Ref 4471/);
    expect(timeline).toMatch(/SO-\d{4} delivered\./);
    expect(timeline).toMatch(/Signed, deposit in → Stone ordered/);
  });

  test("another company's order is a 404 to read and to move; a malformed id is a 404", async () => {
    const [any] = await db.select().from(supplierOrders).where(eq(supplierOrders.companyId, companyId)).limit(1);
    const id = String(any!.id);
    expect(
      (
        await answer(() =>
          orderLoader(routeArgs(requestWithCookie(`/app/supplier-orders/${id}`, otherOwner), { orderId: id })),
        )
      ).status,
    ).toBe(404);
    expect(
      (
        await answer(() =>
          orderAction(routeArgs(post(`/app/supplier-orders/${id}`, otherOwner, { intent: "send" }), { orderId: id })),
        )
      ).status,
    ).toBe(404);
    expect(
      (
        await answer(() =>
          orderLoader(routeArgs(requestWithCookie("/app/supplier-orders/1e3", owner), { orderId: "1e3" })),
        )
      ).status,
    ).toBe(404);
  });
});

describe("combining", () => {
  test("two jobs' drafts to one supplier in one week become one order with two drops; another supplier's draft is refused", async () => {
    const { friday } = nextWeek();
    const tobias = await byName("Tobias Wren");
    const mirela = await byName("Mirela Castellanos");
    expect((await draft(tobias, friday)).status).toBe(302);
    const orderOf = async (leadId: number, supplier: string) =>
      (await ordersOf(leadId)).find((r) => r.supplier.name === supplier)!.order.id;
    // Mirela's hearth supplies are still a draft for the Monday of the same week (the yard's order went out above).
    const a = await orderOf(mirela.id, "Kestrel Hearth Supply");
    const b = await orderOf(tobias.id, "Kestrel Hearth Supply");

    const tobiasYard = await orderOf(tobias.id, "Millbrook Stone Yard");
    const mixed = await answer(() =>
      ordersAction(routeArgs(post("/app/supplier-orders", owner, { orderId: [String(b), String(tobiasYard)] }))),
    );
    expect(mixed).toMatchObject({ status: 409, errors: { form: "Only orders to the same supplier can be combined." } });
    const bad = await answer(() =>
      ordersAction(routeArgs(post("/app/supplier-orders", owner, { orderId: [String(a), "abc"] }))),
    );
    expect(bad).toMatchObject({ status: 400, errors: { orderIds: "Choose orders from the list." } });
    const sent = await orderOf(mirela.id, "Millbrook Stone Yard");
    const notDraft = await answer(() =>
      ordersAction(routeArgs(post("/app/supplier-orders", owner, { orderId: [String(sent), String(tobiasYard)] }))),
    );
    expect(notDraft).toMatchObject({
      status: 409,
      errors: { form: `SO-${String(sent).padStart(4, "0")} is delivered; only drafts can be combined.` },
    });

    const combined = await answer(() =>
      ordersAction(routeArgs(post("/app/supplier-orders", owner, { orderId: [String(b), String(a)] }))),
    );
    const target = Math.min(a, b);
    expect(combined).toMatchObject({ status: 302, location: `/app/supplier-orders/${target}?saved=combined` });
    const drops = await db.select().from(supplierOrderDrops).where(eq(supplierOrderDrops.orderId, target));
    expect(drops.map((d) => d.leadId).sort()).toEqual([tobias.id, mirela.id].sort());
    const [gone] = await db
      .select()
      .from(supplierOrders)
      .where(eq(supplierOrders.id, Math.max(a, b)));
    expect(gone).toMatchObject({ status: "combined", combinedIntoId: target });
    // The combined order's page leads to the order it went into.
    const other = String(Math.max(a, b));
    expect(
      await answer(() =>
        orderLoader(routeArgs(requestWithCookie(`/app/supplier-orders/${other}`, owner), { orderId: other })),
      ),
    ).toMatchObject({ status: 302, location: `/app/supplier-orders/${target}` });
    const events = await db
      .select()
      .from(leadEvents)
      .where(and(eq(leadEvents.leadId, tobias.id), like(leadEvents.detail, "%combined into%")));
    expect(events).toHaveLength(1);

    // The job page lists the combined order once, with the other job counted.
    const page = (await jobOrdersLoader(
      routeArgs(requestWithCookie(`/app/leads/${tobias.id}/supplier-orders`, owner), { leadId: String(tobias.id) }),
    )) as { orders: { id: number; deliveries: number }[] };
    expect(page.orders.find((o) => o.id === target)?.deliveries).toBe(2);
  });

  test("the seed's stone-ordered job has its orders sent, the build-booked job's are confirmed", async () => {
    for (const [stage, state] of [
      ["stone-ordered", "sent"],
      ["build-booked", "confirmed"],
    ] as const) {
      const job = (
        await db
          .select()
          .from(leads)
          .where(and(eq(leads.companyId, companyId), eq(leads.status, stage)))
      )[0]!;
      const states = (await ordersOf(job.id)).map((r) => r.order.status);
      expect(states.length, stage).toBeGreaterThan(0);
      expect(new Set(states), stage).toEqual(new Set([state]));
    }
  });
});

describe("catalog and supplier forms", () => {
  test("an unknown order unit, a part-pallet and another company's supplier are refused beside their fields", async () => {
    const [item] = await db
      .select()
      .from(catalogItems)
      .where(and(eq(catalogItems.companyId, companyId), eq(catalogItems.name, "Hearthline Taper")));
    const [foreign] = await db.select().from(suppliers).where(eq(suppliers.name, "Cedar Hollow Landscape Depot"));
    const base = {
      kind: "wall-unit",
      name: "Hearthline Taper",
      colourHex: "#8f6b58",
      faceIn: "12",
      backIn: "8",
      depthIn: "8",
      heightIn: "4",
      price: "4.85",
      isActive: "on",
    };
    const save = (fields: Record<string, string>) =>
      answer(() =>
        catalogItemAction(
          routeArgs(post(`/app/catalog/${item!.id}`, owner, { ...base, ...fields }), { itemId: String(item!.id) }),
        ),
      );
    expect(await save({ orderUnit: "crate" })).toMatchObject({
      status: 400,
      errors: { orderUnit: "Choose how the yard sells it from the list." },
    });
    expect(await save({ orderUnit: "pallet", unitsPerOrderUnit: "72.5" })).toMatchObject({
      status: 400,
      errors: { unitsPerOrderUnit: "Pieces on a full pallet must be a whole number." },
    });
    expect(await save({ orderUnit: "pallet", unitsPerOrderUnit: "72", orderUnitWeightLb: "heavy" })).toMatchObject({
      status: 400,
      errors: { orderUnitWeightLb: "Weight of one order unit must be a number." },
    });
    expect(await save({ orderUnit: "pallet", unitsPerOrderUnit: "72", supplierId: String(foreign!.id) })).toMatchObject(
      { status: 400, errors: { supplierId: "Choose a supplier from the list." } },
    );
    const [after] = await db.select().from(catalogItems).where(eq(catalogItems.id, item!.id));
    expect(after).toMatchObject({ orderUnit: "pallet", unitsPerOrderUnit: 72, orderUnitWeightLb: 1935 });
  });

  test("suppliers: a bad e-mail or phone names the field; a duplicate name is refused; another company's supplier is a 404", async () => {
    const add = (fields: Record<string, string>, cookie = owner) =>
      answer(() => suppliersAction(routeArgs(post("/app/suppliers", cookie, { supplierId: "", ...fields }))));
    expect(await add({ name: "Brookside Gravel", email: "not-an-address" })).toMatchObject({
      status: 400,
      errors: { email: expect.stringMatching(/^E-mail must be an address/) },
    });
    expect(await add({ name: "Brookside Gravel", email: "orders@brookside.test", phone: "12" })).toMatchObject({
      status: 400,
      errors: { phone: expect.stringMatching(/^Phone must be a phone number/) },
    });
    expect(await add({ name: "millbrook stone yard", email: "x@y.test" })).toMatchObject({
      status: 400,
      errors: { name: "You already have a supplier named “millbrook stone yard”." },
    });
    expect(
      await add({ name: "Brookside Gravel", email: "orders@brookside.test", phone: "(217) 555-0190" }),
    ).toMatchObject({ status: 302 });
    const [saved] = await db.select().from(suppliers).where(eq(suppliers.name, "Brookside Gravel"));
    expect(saved!.phone).toBe("+12175550190");
    expect((await add({ supplierId: String(saved!.id), name: "Taken", email: "a@b.test" }, otherOwner)).status).toBe(
      404,
    );
  });
});
