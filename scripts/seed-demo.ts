import { and, eq, inArray } from "drizzle-orm";
import {
  bookings,
  buildCrew,
  jobBalances,
  jobExtras,
  jobHours,
  builds,
  catalogItems,
  companies,
  suppliers,
  supplierOrderDrops,
  supplierOrders,
  emailOutbox,
  jobStepTicks,
  leadEvents,
  leads,
  proposals,
  proposalTerms,
  siteVisits,
  users,
  type CatalogItem,
  type LeadStatus,
} from "~/db/schema";
import { sendChangeOrder } from "~/lib/proposals/change-orders.server";
import type { CatalogChoice } from "~/lib/design/design";
import { saveRevision } from "~/lib/leads/lead-workspace.server";
import { formatMoney } from "~/lib/format/money";
import { parseProposalDocument } from "~/lib/proposals/proposal-document";
import { acceptProposal } from "~/lib/proposals/proposal-signing.server";
import { DEFAULT_EXCLUDED, DEFAULT_INCLUDED } from "~/lib/proposals/proposal-terms.server";
import { recordOpened, sendProposal } from "~/lib/proposals/proposals.server";
import { findLiveBooking, listCompanySlots } from "~/lib/consults/booking.server";
import { db } from "~/lib/platform/db.server";
import { planForDesign, recordPlan, toCatalogChoice } from "~/lib/design/configurator.server";
import { parseDesign } from "~/lib/design/design";
import { summarizeDesign, type PublicPlan } from "~/lib/design/design-plan";
import { readStoredDesign, writeStoredPlan } from "~/lib/design/stored-plan";
import { STATUS_LABEL } from "~/lib/leads/lead-status";
import { hashPassword } from "~/lib/auth/password.server";
import { publicPlan } from "~/lib/design/plan.server";
import { draftSupplierOrders, orderNumber } from "~/lib/suppliers/supplier-orders.server";
import { nextDay, zonedDay } from "~/lib/format/zoned-time";
import {
  DEMO_COMPANIES,
  DEMO_LEADS,
  DEMO_LETTERHEADS,
  DEMO_PASSWORD,
  type SeedDesign,
  type SeedLead,
  type SeedPapers,
} from "./seed-data";
import { addCalendarDays, buildDates, buildDaysNeeded } from "~/domain/build-schedule";
import { jobLabourHours, parseBuildDates, workCalendarFor } from "~/lib/builds/builds.server";
import { balanceFromPapers } from "~/lib/builds/job-balance.server";
import { jobBuildSteps } from "~/lib/builds/job-site.server";

/** Fills DATABASE_URL with the demo scenario; running it twice changes nothing. */
export async function seedDemo() {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  for (const { staff, catalog, suppliers: supplierSeeds, ...company } of DEMO_COMPANIES) {
    await db.insert(companies).values(company).onConflictDoNothing({ target: companies.slug });
    const [row] = await db.select({ id: companies.id }).from(companies).where(eq(companies.slug, company.slug));
    const companyId = row!.id;
    for (const person of staff) {
      await db
        .insert(users)
        .values({ ...person, companyId, passwordHash })
        .onConflictDoNothing({ target: users.email });
    }
    for (const supplier of supplierSeeds) {
      await db
        .insert(suppliers)
        .values({ ...supplier, companyId })
        .onConflictDoNothing();
    }
    const supplierRows = await db.select().from(suppliers).where(eq(suppliers.companyId, companyId));
    for (const { supplier, ...item } of catalog) {
      const supplierId = supplierRows.find((s) => s.name === supplier)?.id ?? null;
      const [existing] = await db
        .select({ id: catalogItems.id, supplierId: catalogItems.supplierId })
        .from(catalogItems)
        .where(and(eq(catalogItems.companyId, companyId), eq(catalogItems.name, item.name)));
      if (!existing) await db.insert(catalogItems).values({ ...item, supplierId, companyId });
      // A database seeded before items had ordering terms gets them once (an owner's own choice stays).
      else if (existing.supplierId === null && supplierId !== null) {
        await db
          .update(catalogItems)
          .set({
            supplierId,
            orderUnit: item.orderUnit ?? "each",
            unitsPerOrderUnit: item.unitsPerOrderUnit ?? 1,
            orderUnitWeightLb: item.orderUnitWeightLb ?? null,
          })
          .where(eq(catalogItems.id, existing.id));
      }
    }
    // Letterhead and allowances (invented address and licence numbers).
    const letterhead = DEMO_LETTERHEADS[company.slug];
    if (letterhead) {
      await db
        .insert(proposalTerms)
        .values({
          companyId,
          includedText: DEFAULT_INCLUDED,
          excludedText: DEFAULT_EXCLUDED,
          ...letterhead,
          narrowAccessAllowanceCents: 35_000,
          steepSlopeAllowanceCents: 60_000,
        })
        .onConflictDoNothing();
    }
    await seedLeads(companyId, company.slug, company.email, DEMO_LEADS[company.slug] ?? []);
    await seedSupplierOrders(companyId);
    await seedBuilds(companyId);
    await seedCrewRecords(companyId);
    await seedJobMoney(companyId);
    await seedConsults(companyId);
  }
}

/**
 * Books the next free consult slots for the demo requests that are at "consult booked", as paid.
 * Demo bookings carry no payment of the payment service, so nothing is ever refunded for them.
 */
/**
 * Supplier orders for the demo jobs past "signed": the stone-ordered job's orders are sent, the
 * build-booked job's confirmed, for delivery ten days out. Written without e-mails (the demo
 * suppliers are invented). A job that has orders already is left alone.
 */
async function seedSupplierOrders(companyId: number) {
  const [company] = await db.select().from(companies).where(eq(companies.id, companyId));
  const [owner] = await db
    .select()
    .from(users)
    .where(and(eq(users.companyId, companyId), eq(users.role, "owner")))
    .limit(1);
  if (!company || !owner) return;
  let day = zonedDay(new Date(), company.timeZone);
  for (let i = 0; i < 10; i += 1) day = nextDay(day);
  const states = { "stone-ordered": "sent", "build-booked": "confirmed" } as const;
  const jobs = await db
    .select()
    .from(leads)
    .where(and(eq(leads.companyId, companyId), inArray(leads.status, ["stone-ordered", "build-booked"])));
  for (const job of jobs) {
    if (
      (
        await db
          .select({ id: supplierOrderDrops.id })
          .from(supplierOrderDrops)
          .where(eq(supplierOrderDrops.leadId, job.id))
          .limit(1)
      ).length
    )
      continue;
    const drafted = await draftSupplierOrders({ ...owner, sessionId: "seed" }, job, day);
    if (!drafted.ok) continue;
    const at = new Date().toISOString();
    const state = states[job.status as keyof typeof states];
    await db
      .update(supplierOrders)
      .set({
        status: state,
        sentAt: at,
        ...(state === "confirmed" ? { confirmedAt: at, confirmationNote: "Confirmed by phone" } : {}),
      })
      .where(inArray(supplierOrders.id, drafted.orderIds));
    await db.insert(leadEvents).values(
      drafted.orderIds.map((id) => ({
        companyId,
        leadId: job.id,
        actorUserId: owner.id,
        kind: "supplier-order",
        detail: `${orderNumber(id)} ${state === "sent" ? "sent" : "sent and confirmed"} (demo data, no e-mail).`,
        createdAt: at,
      })),
    );
  }
}

/**
 * Build dates for the demo jobs from "build booked" on: the booked job starts two weeks out, the
 * built and paid ones were built a few weeks ago. Written without e-mails; a job with a build is left alone.
 */
async function seedBuilds(companyId: number) {
  const [company] = await db.select().from(companies).where(eq(companies.id, companyId));
  const [crew] = await db
    .select()
    .from(users)
    .where(and(eq(users.companyId, companyId), eq(users.role, "crew"), eq(users.isActive, true)))
    .limit(1);
  if (!company || !crew) return;
  const calendar = await workCalendarFor(company);
  const today = zonedDay(new Date(), company.timeZone);
  const jobs = await db
    .select()
    .from(leads)
    .where(and(eq(leads.companyId, companyId), inArray(leads.status, ["build-booked", "built", "paid-in-full"])));
  // Booked builds two weeks out, then a week apart, so the demo crew is never on two at once.
  let booked = 0;
  for (const [i, job] of jobs.entries()) {
    const waiting = job.status === "build-booked" ? booked++ : 0;
    if ((await db.select({ id: builds.id }).from(builds).where(eq(builds.leadId, job.id)).limit(1)).length) continue;
    const labourHours = await jobLabourHours(job);
    const days = buildDaysNeeded({ labourHours, crewSize: company.crewSize, dayHours: company.crewDayHours });
    // A finished job was built some while after its deposit (paid at 62 % of its age): older jobs longer
    // ago, so the monthly report has more than one month to show.
    const ageDays = Math.round((Date.now() - new Date(job.createdAt).getTime()) / 86_400_000);
    const start =
      job.status === "build-booked"
        ? addCalendarDays(today, 14 + 7 * waiting)
        : addCalendarDays(today, -Math.max(21 + 7 * i, Math.round(ageDays * 0.3)));
    const dates = buildDates(start, days, calendar);
    const [row] = await db
      .insert(builds)
      .values({
        companyId,
        leadId: job.id,
        datesJson: JSON.stringify(dates),
        firstDay: dates[0]!,
        lastDay: dates.at(-1)!,
        labourHours,
        stageBefore: "stone-ordered",
        bookedByUserId: null,
      })
      .returning();
    await db.insert(buildCrew).values({ buildId: row!.id, userId: job.crewUserId ?? crew.id, companyId });
  }
}

// How the hours worked compared with the plan's, job by job (invented), and an extra bought on site.
const WORKED_FACTORS = [1.15, 0.95, 1.05, 1.25];
const DEMO_EXTRAS = [
  { description: "Spare cap: one cracked on the saw", quantity: 1, costCents: 2_850 },
  { description: "Another bag of base stone", quantity: 1, costCents: 1_200 },
];

/**
 * The crew's records of the demo jobs already built: every checklist step ticked on the build's
 * last day, and each crew member's hours for each build day: the plan's hours times the job's
 * worked factor, shared over the days and the crew, in quarter hours. A job with records is left alone.
 */
async function seedCrewRecords(companyId: number) {
  const done = await db
    .select({ lead: leads, build: builds })
    .from(leads)
    .innerJoin(builds, and(eq(builds.leadId, leads.id), eq(builds.status, "booked")))
    .where(and(eq(leads.companyId, companyId), inArray(leads.status, ["built", "paid-in-full"])));
  for (const [index, { lead, build }] of done.entries()) {
    if ((await db.select({ id: jobStepTicks.id }).from(jobStepTicks).where(eq(jobStepTicks.leadId, lead.id))).length)
      continue;
    const days = parseBuildDates(build);
    const crew = await db.select({ userId: buildCrew.userId }).from(buildCrew).where(eq(buildCrew.buildId, build.id));
    const { steps } = await jobBuildSteps(lead);
    const lastDay = days.at(-1) ?? build.lastDay;
    const byUserId = crew[0]?.userId ?? null;
    await db
      .insert(jobStepTicks)
      .values(
        steps.map((step, i) => ({
          companyId,
          leadId: lead.id,
          stepKey: step.key,
          done: true,
          // Through the last day, an hour apart from 08:00 local (about 14:00 UTC in Chicago).
          changedAt: `${lastDay}T${String(14 + (i % 8)).padStart(2, "0")}:00:00.000Z`,
          clientId: `seed-${lead.id}-${step.key}`,
          byUserId,
        })),
      )
      .onConflictDoNothing();
    const worked = build.labourHours * WORKED_FACTORS[index % WORKED_FACTORS.length]!;
    const perPersonDay = Math.min(
      12,
      Math.max(0.25, Math.round((worked / days.length / Math.max(1, crew.length)) * 4) / 4),
    );
    for (const { userId } of crew) {
      await db
        .insert(jobHours)
        .values(
          days.map((day) => ({
            companyId,
            leadId: lead.id,
            workerUserId: userId,
            day,
            hours: perPersonDay,
            clientId: `seed-${lead.id}-${userId}-${day}`,
            recordedByUserId: userId,
          })),
        )
        .onConflictDoNothing();
    }
    await db.insert(leadEvents).values({
      companyId,
      leadId: lead.id,
      actorUserId: byUserId,
      kind: "build-step",
      detail: `Checklist done: all ${steps.length} steps, and the crew's hours for ${days.length} build day${days.length === 1 ? "" : "s"} (demo data).`,
      createdAt: `${lastDay}T22:00:00.000Z`,
    });
  }
}

/**
 * The money of the demo jobs past "built": an extra bought on site, and
 * the balance (worked out from the signed papers as marking a job built does), opened the evening
 * of the last build day and, for jobs paid in full, paid three days later. A job with a balance is
 * left alone.
 */
async function seedJobMoney(companyId: number) {
  const jobs = await db
    .select({ lead: leads, build: builds })
    .from(leads)
    .innerJoin(builds, and(eq(builds.leadId, leads.id), eq(builds.status, "booked")))
    .where(and(eq(leads.companyId, companyId), inArray(leads.status, ["built", "paid-in-full"])));
  const [crew] = await db
    .select()
    .from(users)
    .where(and(eq(users.companyId, companyId), eq(users.role, "crew")))
    .limit(1);
  for (const [i, { lead, build }] of jobs.entries()) {
    if ((await db.select({ id: jobBalances.id }).from(jobBalances).where(eq(jobBalances.leadId, lead.id))).length)
      continue;
    const figures = await balanceFromPapers(db, lead);
    if (!figures || !crew) continue;
    const worker = lead.crewUserId ?? crew.id;
    const extra = DEMO_EXTRAS[i % DEMO_EXTRAS.length]!;
    await db
      .insert(jobExtras)
      .values({ companyId, leadId: lead.id, ...extra, clientId: `seed-extra-${lead.id}`, recordedByUserId: worker })
      .onConflictDoNothing();
    const openedAt = `${build.lastDay}T23:00:00.000Z`;
    const paidAt =
      lead.status === "paid-in-full" ? new Date(new Date(openedAt).getTime() + 3 * 86_400_000).toISOString() : null;
    const { balance } = figures;
    await db.insert(jobBalances).values({
      companyId,
      leadId: lead.id,
      proposalId: figures.proposalId,
      proposalPriceCents: balance.proposalPriceCents,
      addOnsCents: balance.addOnsCents,
      changeOrdersCents: balance.changeOrdersCents,
      depositCents: balance.depositCents,
      amountCents: balance.amountCents,
      openedAt,
      paidAt,
      createdAt: openedAt,
      updatedAt: paidAt ?? openedAt,
    });
    await db.insert(leadEvents).values([
      {
        companyId,
        leadId: lead.id,
        kind: "balance",
        detail: `Balance of ${formatMoney(balance.amountCents)} due.`,
        createdAt: openedAt,
      },
      ...(paidAt
        ? [
            {
              companyId,
              leadId: lead.id,
              kind: "balance-paid",
              detail: `Balance of ${formatMoney(balance.amountCents)} recorded as paid: cheque.`,
              createdAt: paidAt,
            },
          ]
        : []),
    ]);
  }
}

async function seedConsults(companyId: number) {
  const [company] = await db.select().from(companies).where(eq(companies.id, companyId));
  const waiting = await db
    .select()
    .from(leads)
    .where(and(eq(leads.companyId, companyId), eq(leads.status, "consult-booked")));
  let slots = await listCompanySlots(company!);
  for (const lead of waiting) {
    if (await findLiveBooking(lead.id)) continue;
    // Every third slot, so the schedule shows spread-out days rather than one packed morning.
    const slot = slots[2];
    if (!slot) break;
    slots = slots.slice(3);
    await db.insert(bookings).values({
      companyId,
      leadId: lead.id,
      homeownerId: lead.homeownerId,
      startsAt: slot.startsAt,
      endsAt: slot.endsAt,
      status: "confirmed",
      holdExpiresAt: slot.startsAt,
      amountCents: company!.consultFeeCents,
      isPaid: true,
    });
  }
}

function designParams(design: SeedDesign, catalog: CatalogItem[]): URLSearchParams {
  const idOf = (name: string) => {
    const item = catalog.find((i) => i.name === name);
    if (!item) throw new Error(`The demo catalog has no item named "${name}".`);
    return String(item.id);
  };
  const params = new URLSearchParams({
    stone: idOf(design.stone),
    courses: String(design.courses),
    liner: design.liner,
  });
  if (design.units !== undefined) params.set("units", String(design.units));
  params.set("fit", design.fit ? "ring" : "");
  params.set("cap", design.cap ? idOf(design.cap) : "none");
  if (design.overhang !== undefined) params.set("overhang", String(design.overhang));
  if (design.ring) params.set("ring", idOf(design.ring));
  if (design.patioFt) {
    params.set("patio", String(design.patioFt));
    params.set("paver", idOf(design.paver!));
    params.set("border", idOf(design.border!));
  }
  if (design.setbackFt !== undefined) params.set("setback", String(design.setbackFt));
  return params;
}

// The steps a demo job walked to reach its stage (a stopped job stopped after the last one listed).
const PIPELINE: LeadStatus[] = [
  "request",
  "called-back",
  "consult-booked",
  "measured",
  "proposal-out",
  "signed",
  "stone-ordered",
  "build-booked",
  "built",
  "paid-in-full",
];
const HOUR_MS = 3_600_000;

/*
 * Each request, once (keyed by a fixed ref), with its design run through the engine and a timeline
 * that walks the pipeline to its status: received, assigned, each status change, staff notes, and
 * the two e-mails a real request sends (marked as sent, so nothing goes out again).
 */
async function seedLeads(companyId: number, slug: string, companyEmail: string, list: SeedLead[]) {
  if (list.length === 0) return;
  const catalog = await db.select().from(catalogItems).where(eq(catalogItems.companyId, companyId));
  const choices = catalog.filter((i) => i.isActive).map(toCatalogChoice);
  const staff = await db
    .select({ id: users.id, email: users.email, name: users.name })
    .from(users)
    .where(eq(users.companyId, companyId));
  const staffId = (email: string | null | undefined) =>
    email ? (staff.find((s) => s.email === email)?.id ?? null) : null;
  const now = Date.now();

  for (const [index, seed] of list.entries()) {
    const ref = `demo-${slug}-${String(index + 1).padStart(2, "0")}`;
    const [existing] = await db.select({ id: leads.id }).from(leads).where(eq(leads.ref, ref)).limit(1);
    if (existing) continue;
    const design = parseDesign(designParams(seed.design, catalog), choices);
    if (!design) throw new Error(`The demo design of ${seed.customerName} has no wall stone.`);
    const { plan, resolved, errors } = await planForDesign(slug, design, choices);
    if (!plan || !resolved)
      throw new Error(
        `The demo design of ${seed.customerName} cannot be built: ${errors.map((e) => e.message).join(" ")}`,
      );
    const summary = summarizeDesign(publicPlan(plan) as PublicPlan, design, choices, "in");
    const createdMs = now - seed.ageHours * HOUR_MS;
    const at = (hoursAfter: number) => new Date(Math.min(now - 60_000, createdMs + hoursAfter * HOUR_MS)).toISOString();
    const assigneeId = staffId(seed.assignee);
    const crewId = staffId(seed.crew);
    const [lead] = await db
      .insert(leads)
      .values({
        companyId,
        ref,
        status: seed.status,
        stopReason: seed.stopReason ?? null,
        pausedStage: seed.pausedStage ?? null,
        calledBackAt: seed.status === "request" ? null : at(1),
        assignedUserId: assigneeId,
        crewUserId: crewId,
        customerName: seed.customerName,
        email: seed.email,
        phone: seed.phone,
        street: seed.street,
        town: seed.town,
        buildWindow: seed.buildWindow,
        notes: seed.notes,
        ...writeStoredPlan(recordPlan({ design, summary, resolved, plan })),
        stoneName: catalog.find((i) => i.id === design.stoneId)?.name ?? "",
        bowlDiameterIn: plan.ring.bowlDiameterIn,
        priceLowCents: plan.price?.lowCents ?? null,
        priceHighCents: plan.price?.highCents ?? null,
        createdAt: at(0),
        updatedAt: at(0),
      })
      .returning({ id: leads.id });
    const leadId = lead!.id;
    if (seed.homeownerAccount) {
      await db
        .insert(users)
        .values({
          companyId,
          email: seed.email,
          name: seed.customerName,
          role: "homeowner",
          passwordHash: await hashPassword(DEMO_PASSWORD),
        })
        .onConflictDoNothing({ target: users.email });
      const [account] = await db.select({ id: users.id }).from(users).where(eq(users.email, seed.email));
      await db.update(leads).set({ homeownerId: account!.id }).where(eq(leads.id, leadId));
    }

    const events: (typeof leadEvents.$inferInsert)[] = [
      {
        companyId,
        leadId,
        kind: "received",
        detail: "Request sent from the configurator with 0 photos.",
        createdAt: at(0),
      },
    ];
    // Steps spread over the lead's age so the newest step is still in the past.
    const stoppedAt =
      seed.status === "on-hold" || seed.status === "not-going-ahead" ? (seed.pausedStage ?? "called-back") : null;
    const steps = stoppedAt
      ? [...PIPELINE.slice(1, PIPELINE.indexOf(stoppedAt) + 1), seed.status]
      : PIPELINE.slice(1, PIPELINE.indexOf(seed.status) + 1);
    const span = Math.max(1, seed.ageHours - 1);
    const actorId = assigneeId ?? staffId(staff[0]?.email);
    if (assigneeId !== null) {
      events.push({
        companyId,
        leadId,
        actorUserId: staffId(DEMO_COMPANIES.find((c) => c.slug === slug)?.staff[0]?.email),
        kind: "assigned",
        detail: `Assigned to ${staff.find((s) => s.id === assigneeId)?.name}`,
        createdAt: at(Math.min(2, span * 0.1)),
      });
    }
    let previous: LeadStatus = "request";
    steps.forEach((status, i) => {
      const hours = span * ((i + 1) / (steps.length + 1)) + 2;
      events.push({
        companyId,
        leadId,
        actorUserId: actorId,
        kind: "status",
        detail: `${STATUS_LABEL[previous]} → ${STATUS_LABEL[status]}${status === seed.status && seed.stopReason ? `: ${seed.stopReason}` : ""}`,
        createdAt: at(hours),
      });
      previous = status;
    });
    (seed.staffNotes ?? []).forEach((note, i) => {
      events.push({
        companyId,
        leadId,
        actorUserId: staffId(note.by),
        kind: "note",
        detail: note.text,
        createdAt: at(span * 0.9 - i),
      });
    });
    if (crewId !== null) {
      events.push({
        companyId,
        leadId,
        actorUserId: actorId,
        kind: "crew-assigned",
        detail: `Job given to ${staff.find((s) => s.id === crewId)?.name}`,
        createdAt: at(span * 0.95),
      });
    }
    await db.insert(leadEvents).values(events);
    const mail = (key: string, to: string, subject: string) => ({
      companyId,
      idempotencyKey: `${key}/${leadId}`,
      toAddress: to,
      subject,
      html: `<p>${subject}</p>`,
      text: subject,
      status: "sent" as const,
      attempts: 1,
      sentAt: at(0.01),
      createdAt: at(0),
    });
    await db
      .insert(emailOutbox)
      .values([
        mail("lead-received", seed.email, "We received your fire-pit request"),
        mail("lead-new", companyEmail, `New fire-pit request: ${seed.customerName}, ${seed.town}`),
      ])
      .onConflictDoNothing();
    if (seed.papers)
      await seedPapers({ leadId, seed, papers: seed.papers, companyId, staffId: actorId!, createdMs, choices, slug });
  }
}

/*
 * A demo job's papers, made by the same code the office and the homeowner use: the site visit, the
 * proposal sent (and opened), accepted, paid (a demo deposit carries no payment of the payment
 * service, so it is never refunded through it), and a signed change order after a staff revision.
 * E-mails these write are marked sent, and the job is put back at its seeded stage afterwards.
 */
async function seedPapers(args: {
  leadId: number;
  seed: SeedLead;
  papers: SeedPapers;
  companyId: number;
  staffId: number;
  createdMs: number;
  choices: CatalogChoice[];
  slug: string;
}) {
  const { leadId, seed, papers, companyId } = args;
  const company = (await db.select().from(companies).where(eq(companies.id, companyId)))[0]!;
  const [staffRow] = await db.select().from(users).where(eq(users.id, args.staffId));
  const user = {
    id: staffRow!.id,
    companyId,
    email: staffRow!.email,
    name: staffRow!.name,
    role: staffRow!.role,
    sessionId: "seed",
  };
  const when = (fraction: number) =>
    new Date(Math.min(Date.now() - 60_000, args.createdMs + (Date.now() - args.createdMs) * fraction));
  const lead = async () => (await db.select().from(leads).where(eq(leads.id, leadId)))[0]!;

  await db.insert(siteVisits).values({
    ...papers.visit,
    companyId,
    leadId,
    visitedByUserId: user.id,
    createdAt: when(0.4).toISOString(),
    updatedAt: when(0.4).toISOString(),
  });
  // The papers are made along the way the job went; the seeded stage is put back at the end.
  await db.update(leads).set({ status: "measured" }).where(eq(leads.id, leadId));
  await db.insert(leadEvents).values({
    companyId,
    leadId,
    actorUserId: user.id,
    kind: "site-visit",
    detail: `Site visit recorded: ${papers.visit.structureFt} ft to the nearest structure, ${papers.visit.accessWidthIn} in access.`,
    createdAt: when(0.4).toISOString(),
  });
  const p = papers.proposal;
  if (p) {
    // An "expired" demo proposal ran out yesterday; the background sweep marks it when the server runs.
    const validUntil = new Intl.DateTimeFormat("en-CA", { timeZone: company.timeZone }).format(
      new Date(Date.now() + (p.state === "expired" ? -2 : 21) * 86_400_000),
    );
    const proposal = await sendProposal({
      user,
      lead: await lead(),
      company,
      input: {
        fixedPriceCents: p.fixedPrice * 100,
        addOns: p.addOns.map((a, i) => ({ key: `a${i + 1}`, label: a.label, cents: a.price * 100 })),
        validUntil,
        included: DEFAULT_INCLUDED,
        excluded: DEFAULT_EXCLUDED,
      },
      origin: "http://localhost:3000",
      now: when(0.5),
    });
    if (p.state !== "sent" && p.state !== "expired") await recordOpened(proposal.id, when(0.55));
    if (p.state === "accepted" || p.state === "signed") {
      const document = parseProposalDocument(proposal.documentJson);
      const accepted = await acceptProposal({
        proposal,
        lead: await lead(),
        document,
        input: {
          name: seed.customerName,
          chosenKeys: (p.chosen ?? []).map((i) => `a${i + 1}`),
          ip: "192.0.2.10",
          userAgent: "Demo seed",
          now: when(0.6),
        },
      });
      if (!accepted.ok)
        throw new Error(`The demo proposal of ${seed.customerName} could not be signed: ${accepted.message}`);
      if (p.state === "signed") {
        await db
          .update(proposals)
          .set({ status: "signed", depositPaidAt: when(0.62).toISOString() })
          .where(eq(proposals.id, proposal.id));
        await db.insert(leadEvents).values({
          companyId,
          leadId,
          kind: "deposit-paid",
          detail: `Deposit of ${formatMoney(accepted.proposal.depositCents ?? 0)} paid on ${document.number}.`,
          createdAt: when(0.62).toISOString(),
        });
        await db.update(leads).set({ status: "signed" }).where(eq(leads.id, leadId));
      }
      if (p.changeOrder) {
        // A staff revision (one more course), then the change order for it, signed.
        const current = await lead();
        const design = { ...readStoredDesign(current.designJson).choices, courses: p.changeOrder.courses };
        const { plan, resolved } = await planForDesign(args.slug, design, args.choices);
        if (!plan || !resolved) throw new Error(`The demo revision of ${seed.customerName} cannot be built.`);
        const summary = summarizeDesign(publicPlan(plan) as PublicPlan, design, args.choices, "in");
        await saveRevision(user, current, recordPlan({ design, summary, resolved, plan }));
        const change = await sendChangeOrder({
          user,
          lead: await lead(),
          company,
          deltaCents: p.changeOrder.delta * 100,
          validUntil,
          origin: "http://localhost:3000",
          now: when(0.8),
        });
        if (typeof change === "string") throw new Error(change);
        const signed = await acceptProposal({
          proposal: change,
          lead: await lead(),
          document: parseProposalDocument(change.documentJson),
          input: { name: seed.customerName, chosenKeys: [], ip: "192.0.2.10", userAgent: "Demo seed", now: when(0.85) },
        });
        if (!signed.ok) throw new Error(signed.message);
      }
    }
  }
  // Back to the seeded stage; nothing these papers queued goes out again.
  await db
    .update(leads)
    .set({ status: seed.status, stopReason: seed.stopReason ?? null, pausedStage: seed.pausedStage ?? null })
    .where(eq(leads.id, leadId));
  await db
    .update(emailOutbox)
    .set({ status: "sent", sentAt: when(0.9).toISOString(), attempts: 1 })
    .where(
      and(
        eq(emailOutbox.companyId, companyId),
        eq(emailOutbox.status, "pending"),
        inArray(emailOutbox.toAddress, [seed.email, company.email]),
      ),
    );
}
