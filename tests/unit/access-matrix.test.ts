/*
 * Who gets what, role by role and route by route (OWASP ASVS 4.0.3 V4.1.1 and V4.2.1: every
 * handler checks access itself and scopes records to the caller's company, so no id of another
 * company's record opens anything). Each loader and action is called directly, as React Router
 * would call it, with a real session cookie.
 */
import { eq } from "drizzle-orm";
import { PDFParse } from "pdf-parse";
import { beforeAll, describe, expect, test } from "vitest";
import { bookings, builds, leadPhotos, leads, users, type Role } from "~/db/schema";
import { addCalendarDays, weekdayOf } from "~/domain/build-schedule";
import { db } from "~/lib/platform/db.server";
import { startSession } from "~/lib/auth/session.server";
import { storePhotoBytes } from "~/lib/platform/uploads.server";
import { loader as photoLoader } from "~/routes/photo";
import { loader as indexLoader } from "~/routes/app-index";
import { loader as catalogLoader } from "~/routes/app-catalog";
import { loader as catalogItemLoader } from "~/routes/app-catalog-item";
import { loader as settingsLoader } from "~/routes/app-settings";
import { action as factorsAction, loader as factorsLoader } from "~/routes/app-factors";
import { loader as inboxLoader } from "~/routes/app-inbox";
import { loader as inboxCsvLoader } from "~/routes/app-inbox-csv";
import { loader as apiLeadsLoader } from "~/routes/api/leads";
import { action as inboxSeenAction } from "~/routes/app-inbox-seen";
import { action as leadAction, loader as leadLoader } from "~/routes/app-lead";
import { action as designAction, loader as designLoader } from "~/routes/app-lead-design";
import { loader as cutSheetLoader } from "~/routes/app-lead-cut-sheet";
import { loader as cutSheetPdfLoader } from "~/routes/app-lead-cut-sheet-pdf";
import { loader as jobsLoader } from "~/routes/app-jobs";
import { action as jobAction, loader as jobLoader } from "~/routes/app-job";
import { action as jobTicksAction } from "~/routes/app-job-ticks";
import { action as jobPhotosAction } from "~/routes/app-job-photos";
import { loader as layoutLoader } from "~/routes/app-layout";
import { action as scheduleAction, loader as scheduleLoader } from "~/routes/app-schedule";
import { loader as consultHoursLoader } from "~/routes/app-consult-hours";
import { action as visitAction, loader as visitLoader } from "~/routes/app-lead-visit";
import { action as composeAction, loader as composeLoader } from "~/routes/app-lead-proposal";
import { action as changeOrderAction, loader as changeOrderLoader } from "~/routes/app-lead-change-order";
import { loader as termsLoader } from "~/routes/app-settings-proposals";
import { loader as proposalPageLoader } from "~/routes/proposal";
import { loader as proposalPdfLoader } from "~/routes/proposal-pdf";
import { action as myAction, loader as myLoader } from "~/routes/my";
import { loader as reportsLoader } from "~/routes/app-reports";
import { action as moveConsultAction, loader as moveConsultLoader } from "~/routes/my-consult";
import { getCompany } from "~/lib/catalog/catalog.server";
import { sendProposal } from "~/lib/proposals/proposals.server";
import { action as teamAction, loader as teamLoader } from "~/routes/app-team";
import { action as attentionAction, loader as attentionLoader } from "~/routes/app-attention";
import { action as suppliersAction, loader as suppliersLoader } from "~/routes/app-suppliers";
import { action as supplierOrdersAction, loader as supplierOrdersLoader } from "~/routes/app-supplier-orders";
import { action as supplierOrderAction, loader as supplierOrderLoader } from "~/routes/app-supplier-order";
import { loader as supplierOrderFileLoader } from "~/routes/app-supplier-order-file";
import { action as jobOrdersAction, loader as jobOrdersLoader } from "~/routes/app-lead-supplier-orders";
import { draftSupplierOrders } from "~/lib/suppliers/supplier-orders.server";
import { action as buildAction, loader as buildLoader } from "~/routes/app-lead-build";
import { action as calendarAction, loader as calendarLoader } from "~/routes/app-calendar";
import { loader as calendarFeedLoader } from "~/routes/calendar-feed";
import { nextDay, zonedDay } from "~/lib/format/zoned-time";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";
import { TINY_PNG } from "./support/images";

type Who = "owner" | "estimator" | "crew" | "homeowner" | "anonymous" | "other company's owner";
const WHO: Who[] = ["owner", "estimator", "crew", "homeowner", "anonymous", "other company's owner"];

const cookies = {} as Record<Who, string | undefined>;
const ids = {
  wonLead: 0,
  otherLead: 0,
  item: 0,
  wonPhoto: 0,
  otherPhoto: 0,
  estimator: 0,
  token: "",
  order: 0,
  booking: 0,
  build: 0,
  buildMoveTo: "",
};

async function addPhoto(companyId: number, leadId: number): Promise<number> {
  const { storedName } = await storePhotoBytes(TINY_PNG, "yard.png");
  const [row] = await db
    .insert(leadPhotos)
    .values({
      companyId,
      leadId,
      storedName,
      originalName: "yard.png",
      mimeType: "image/png",
      sizeBytes: TINY_PNG.byteLength,
    })
    .returning({ id: leadPhotos.id });
  return row!.id;
}

beforeAll(async () => {
  const { company, catalog } = await demoCompany();
  const other = await demoCompany("north-ridge");
  for (const role of ["owner", "estimator", "crew"] as const satisfies Role[])
    cookies[role] = await loginAs(company.id, role);
  cookies["other company's owner"] = await loginAs(other.company.id, "owner");
  const [homeowner] = await db
    .insert(users)
    .values({
      companyId: company.id,
      email: "matrix.homeowner@example.test",
      name: "Matrix Homeowner",
      role: "homeowner",
    })
    .returning();
  cookies.homeowner = (await startSession(homeowner!.id)).split(";")[0];
  cookies.anonymous = undefined;
  const byRef = async (ref: string) => (await db.select().from(leads).where(eq(leads.ref, ref)))[0]!;
  // The seed gives the demo crew member one signed job (Tobias Wren); Wendell Ashgrove's request is new.
  const won = await byRef("demo-cinder-slate-10");
  const fresh = await byRef("demo-cinder-slate-02");
  const [crewUser] = await db.select().from(users).where(eq(users.email, "crew@cinder-slate.test"));
  expect(won.crewUserId).toBe(crewUser!.id);
  ids.wonLead = won.id;
  ids.otherLead = fresh.id;
  ids.item = catalog[0]!.id;
  ids.wonPhoto = await addPhoto(company.id, won.id);
  ids.otherPhoto = await addPhoto(company.id, fresh.id);
  ids.estimator = (await db.select().from(users).where(eq(users.email, "estimator@cinder-slate.test")))[0]!.id;
  // A proposal sent on the new request: its link is the homeowner's credential.
  const [estimator] = await db.select().from(users).where(eq(users.id, ids.estimator));
  const proposal = await sendProposal({
    user: { ...estimator!, sessionId: "matrix" },
    lead: fresh,
    company: await getCompany(company.id),
    input: { fixedPriceCents: 480_000, addOns: [], validUntil: "2099-12-31", included: "Base", excluded: "Permits" },
    origin: "http://localhost",
  });
  ids.token = proposal.token;
  // A drafted supplier order for the signed job (the owner drafts; the routes below read and move it).
  const [owner] = await db.select().from(users).where(eq(users.email, "owner@cinder-slate.test"));
  const drafted = await draftSupplierOrders(
    { ...owner!, sessionId: "matrix" },
    won,
    nextDay(nextDay(zonedDay(new Date(), company.timeZone))),
  );
  if (!drafted.ok) throw new Error(JSON.stringify(drafted.errors));
  ids.order = drafted.orderIds[0]!;
  // The seeded booked build (Sunniva Okoro's), and a Monday a month or more ahead to drop it on.
  ids.build = (await db.select().from(builds).where(eq(builds.status, "booked")).orderBy(builds.firstDay)).find(
    (b) => b.lastDay >= zonedDay(new Date(), company.timeZone),
  )!.id;
  let monday = addCalendarDays(zonedDay(new Date(), company.timeZone), 35);
  while (weekdayOf(monday) !== 1) monday = addCalendarDays(monday, 1);
  ids.buildMoveTo = monday;
  // A seeded consult, on a request that is not the matrix homeowner's.
  ids.booking = (await db.select({ id: bookings.id }).from(bookings).limit(1))[0]!.id;
});

/** What a person would see: "200", "403", "404", "sign-in", or "redirect <path>". */
function describeAnswer(value: unknown): string {
  if (value instanceof Response) {
    if (value.status >= 300 && value.status < 400) {
      const location = value.headers.get("Location") ?? "";
      return location.startsWith("/login") ? "sign-in" : `redirect ${location.split("?")[0]}`;
    }
    return String(value.status);
  }
  if (value && typeof value === "object" && "init" in value && "data" in value) {
    return String((value as { init?: { status?: number } }).init?.status ?? 200);
  }
  return "200";
}

async function answer(run: () => Promise<unknown>): Promise<string> {
  try {
    return describeAnswer(await run());
  } catch (thrown) {
    if (thrown instanceof Response || (thrown && typeof thrown === "object" && "init" in thrown))
      return describeAnswer(thrown);
    throw thrown;
  }
}

type Case = {
  name: string;
  call: (cookie: string | undefined) => Promise<unknown>;
  expected: Record<Who, string>;
  /** A homeowner's document opened by its link: it shows the homeowner's price to whoever holds the link. */
  isHomeownersLink?: boolean;
};

const get = (url: string, cookie: string | undefined) => requestWithCookie(url, cookie);
const post = (url: string, cookie: string | undefined, fields: Record<string, string>) => {
  const body = new URLSearchParams(fields);
  return requestWithCookie(url, cookie, {
    method: "POST",
    body,
    headers: { "Content-Type": "application/x-www-form-urlencoded", "Content-Length": String(body.toString().length) },
  });
};
const lead = () => String(ids.wonLead);

const SIGN_IN = "sign-in";
// A successful post redirects back to the lead; its id is known only once the seed has run.
const BACK_TO_LEAD = "back to the lead";
const CASES: Case[] = [
  {
    name: "GET /app",
    call: (c) => indexLoader(routeArgs(get("/app", c))),
    expected: {
      owner: "redirect /app/inbox",
      estimator: "redirect /app/inbox",
      crew: "redirect /app/jobs",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "redirect /app/inbox",
    },
  },
  {
    name: "GET /app (the workspace shell)",
    call: (c) => layoutLoader(routeArgs(get("/app", c))),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "200",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    name: "GET /app/schedule",
    call: (c) => scheduleLoader(routeArgs(get("/app/schedule", c))),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    // A build dropped on another day of the grid, with its sequence as the page drew it: owners only,
    // and another company's owner is told the build does not exist.
    name: "POST /app/schedule (move a build to a new first day)",
    call: async (c) => {
      const [build] = await db.select().from(builds).where(eq(builds.id, ids.build));
      return scheduleAction(
        routeArgs(
          post("/app/schedule", c, {
            intent: "move-build",
            buildId: String(ids.build),
            sequence: String(build!.sequence),
            start: ids.buildMoveTo,
          }),
        ),
      );
    },
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/consult-hours",
    call: (c) => consultHoursLoader(routeArgs(get("/app/consult-hours", c))),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    name: "GET /app/catalog",
    call: (c) => catalogLoader(routeArgs(get("/app/catalog", c))),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "200",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    name: "GET /app/catalog/:id",
    call: (c) => catalogItemLoader(routeArgs(get(`/app/catalog/${ids.item}`, c), { itemId: String(ids.item) })),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/settings",
    call: (c) => settingsLoader(routeArgs(get("/app/settings", c))),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    name: "GET /app/settings/factors",
    call: (c) => factorsLoader(routeArgs(get("/app/settings/factors", c))),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    // A reset of every factor: an owner's own company only (the other owner's reset touches their own).
    name: "POST /app/settings/factors (reset every factor)",
    call: (c) => factorsAction(routeArgs(post("/app/settings/factors", c, { intent: "reset-all" }))),
    expected: {
      owner: "redirect /app/settings/factors",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "redirect /app/settings/factors",
    },
  },
  {
    name: "GET /app/inbox",
    call: (c) => inboxLoader(routeArgs(get("/app/inbox", c))),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    name: "GET /app/inbox.csv",
    call: (c) => inboxCsvLoader(routeArgs(get("/app/inbox.csv", c))),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    name: "GET /api/leads",
    call: (c) => apiLeadsLoader(routeArgs(get("/api/leads", c))),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "403",
      homeowner: "403",
      anonymous: "401",
      "other company's owner": "200",
    },
  },
  {
    // Marks only the caller's own inbox as seen; nobody else's data is touched or shown.
    name: "POST /app/inbox/seen",
    call: (c) => inboxSeenAction(routeArgs(post("/app/inbox/seen", c, { at: "2026-01-01T00:00:00.000Z" }))),
    expected: {
      owner: "204",
      estimator: "204",
      crew: "403",
      homeowner: "403",
      anonymous: "401",
      "other company's owner": "204",
    },
  },
  {
    name: "GET /app/leads/:id (the crew's signed job)",
    call: (c) => leadLoader(routeArgs(get(`/app/leads/${lead()}`, c), { leadId: lead() })),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "200",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/leads/:id (a new request, not the crew's)",
    call: (c) => leadLoader(routeArgs(get(`/app/leads/${ids.otherLead}`, c), { leadId: String(ids.otherLead) })),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "404",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/leads/:id/cut-sheet",
    call: (c) => cutSheetLoader(routeArgs(get(`/app/leads/${lead()}/cut-sheet`, c), { leadId: lead() })),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "200",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/leads/:id/cut-sheet (not the crew's)",
    call: (c) =>
      cutSheetLoader(routeArgs(get(`/app/leads/${ids.otherLead}/cut-sheet`, c), { leadId: String(ids.otherLead) })),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "404",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/leads/:id/cut-sheet.pdf",
    call: (c) => cutSheetPdfLoader(routeArgs(get(`/app/leads/${lead()}/cut-sheet.pdf`, c), { leadId: lead() })),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "200",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/leads/:id/cut-sheet.pdf (not the crew's)",
    call: (c) =>
      cutSheetPdfLoader(
        routeArgs(get(`/app/leads/${ids.otherLead}/cut-sheet.pdf`, c), { leadId: String(ids.otherLead) }),
      ),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "404",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/leads/:id/design",
    call: (c) => designLoader(routeArgs(get(`/app/leads/${lead()}/design`, c), { leadId: lead() })),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/leads/:id/visit",
    call: (c) => visitLoader(routeArgs(get(`/app/leads/${lead()}/visit`, c), { leadId: lead() })),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "POST /app/leads/:id/visit (an empty form)",
    call: (c) => visitAction(routeArgs(post(`/app/leads/${lead()}/visit`, c, {}), { leadId: lead() })),
    expected: {
      owner: "400",
      estimator: "400",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/leads/:id/proposal",
    call: (c) =>
      composeLoader(routeArgs(get(`/app/leads/${ids.otherLead}/proposal`, c), { leadId: String(ids.otherLead) })),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "POST /app/leads/:id/proposal (an empty form)",
    call: (c) =>
      composeAction(routeArgs(post(`/app/leads/${ids.otherLead}/proposal`, c, {}), { leadId: String(ids.otherLead) })),
    expected: {
      owner: "400",
      estimator: "400",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/leads/:id/change-order",
    call: (c) => changeOrderLoader(routeArgs(get(`/app/leads/${lead()}/change-order`, c), { leadId: lead() })),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "POST /app/leads/:id/change-order (an empty form)",
    call: (c) => changeOrderAction(routeArgs(post(`/app/leads/${lead()}/change-order`, c, {}), { leadId: lead() })),
    expected: {
      owner: "400",
      estimator: "400",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/settings/proposals",
    call: (c) => termsLoader(routeArgs(get("/app/settings/proposals", c))),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    // The unguessable link is the credential, as with a shared document: whoever holds it may read it.
    name: "GET /p/:token",
    isHomeownersLink: true,
    call: (c) => proposalPageLoader(routeArgs(get(`/p/${ids.token}`, c), { token: ids.token })),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "200",
      homeowner: "200",
      anonymous: "200",
      "other company's owner": "200",
    },
  },
  {
    name: "GET /p/:token.pdf",
    isHomeownersLink: true,
    call: (c) => proposalPdfLoader(routeArgs(get(`/p/${ids.token}.pdf`, c), { token: ids.token })),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "200",
      homeowner: "200",
      anonymous: "200",
      "other company's owner": "200",
    },
  },
  {
    name: "GET /p/:token (a guessed token)",
    call: (c) =>
      proposalPageLoader(
        routeArgs(get("/p/AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA", c), {
          token: "AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA",
        }),
      ),
    expected: {
      owner: "404",
      estimator: "404",
      crew: "404",
      homeowner: "404",
      anonymous: "404",
      "other company's owner": "404",
    },
  },
  {
    name: "GET /p/:token.pdf (a guessed token)",
    call: (c) =>
      proposalPdfLoader(
        routeArgs(get("/p/AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA.pdf", c), {
          token: "AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA",
        }),
      ),
    expected: {
      owner: "404",
      estimator: "404",
      crew: "404",
      homeowner: "404",
      anonymous: "404",
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/jobs",
    call: (c) => jobsLoader(routeArgs(get("/app/jobs", c))),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "200",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    name: "GET /app/reports",
    call: (c) => reportsLoader(routeArgs(get("/app/reports", c))),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    // A homeowner may pay only the balance of their own job: another's is "not found".
    name: "POST /my (pay the balance of someone else's job)",
    call: (c) => myAction(routeArgs(post("/my", c, { intent: "pay-balance", leadId: String(ids.wonLead) }))),
    expected: {
      owner: "403",
      estimator: "403",
      crew: "403",
      homeowner: "404",
      anonymous: SIGN_IN,
      "other company's owner": "403",
    },
  },
  {
    name: "GET /app/jobs/:id",
    call: (c) => jobLoader(routeArgs(get(`/app/jobs/${lead()}`, c), { leadId: lead() })),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "200",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    // A request not signed yet has no site page, for anyone.
    name: "GET /app/jobs/:id (not the crew's, not signed)",
    call: (c) => jobLoader(routeArgs(get(`/app/jobs/${ids.otherLead}`, c), { leadId: String(ids.otherLead) })),
    expected: {
      owner: "404",
      estimator: "404",
      crew: "404",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    // Hours out of range: refused with nothing saved, so every role can be asked.
    name: "POST /app/jobs/:id (hours)",
    call: (c) =>
      jobAction(
        routeArgs(
          post(`/app/jobs/${lead()}`, c, { intent: "hours", workerUserId: "1", day: "2026-01-05", hours: "99" }),
          {
            leadId: lead(),
          },
        ),
      ),
    expected: {
      owner: "400",
      estimator: "403",
      crew: "400",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "POST /app/jobs/:id/ticks (no changes)",
    call: (c) =>
      jobTicksAction(
        routeArgs(
          requestWithCookie(`/app/jobs/${lead()}/ticks`, c, {
            method: "POST",
            body: JSON.stringify({ changes: [] }),
            headers: { "Content-Type": "application/json" },
          }),
          { leadId: lead() },
        ),
      ),
    expected: {
      owner: "400",
      estimator: "403",
      crew: "400",
      homeowner: "403",
      anonymous: "401",
      "other company's owner": "404",
    },
  },
  {
    name: "POST /app/jobs/:id/photos (no photos)",
    call: (c) =>
      jobPhotosAction(routeArgs(post(`/app/jobs/${lead()}/photos`, c, { intent: "progress" }), { leadId: lead() })),
    expected: {
      owner: "400",
      estimator: "403",
      crew: "400",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/attention",
    call: (c) => attentionLoader(routeArgs(get("/app/attention", c))),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    name: "POST /app/attention (an e-mail that has not failed)",
    call: (c) => attentionAction(routeArgs(post("/app/attention", c, { intent: "retry-email", id: "1" }))),
    expected: {
      owner: "404",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/suppliers",
    call: (c) => suppliersLoader(routeArgs(get("/app/suppliers", c))),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    name: "POST /app/suppliers (a form without a name)",
    call: (c) => suppliersAction(routeArgs(post("/app/suppliers", c, { supplierId: "", name: "", email: "x" }))),
    expected: {
      owner: "400",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "400",
    },
  },
  {
    name: "GET /app/supplier-orders",
    call: (c) => supplierOrdersLoader(routeArgs(get("/app/supplier-orders", c))),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    // Combining one order alone is refused before anything is looked up; the other company's owner gets the same words.
    name: "POST /app/supplier-orders (combine one order)",
    call: (c) => supplierOrdersAction(routeArgs(post("/app/supplier-orders", c, { orderId: String(ids.order) }))),
    expected: {
      owner: "400",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "400",
    },
  },
  {
    name: "GET /app/supplier-orders/:id",
    call: (c) =>
      supplierOrderLoader(routeArgs(get(`/app/supplier-orders/${ids.order}`, c), { orderId: String(ids.order) })),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "POST /app/supplier-orders/:id (mark a draft delivered)",
    call: (c) =>
      supplierOrderAction(
        routeArgs(post(`/app/supplier-orders/${ids.order}`, c, { intent: "deliver" }), { orderId: String(ids.order) }),
      ),
    expected: {
      owner: "409",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/supplier-orders/:id/order.pdf",
    call: (c) =>
      supplierOrderFileLoader(
        routeArgs(get(`/app/supplier-orders/${ids.order}/order.pdf`, c), {
          orderId: String(ids.order),
          file: "order.pdf",
        }),
      ),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/supplier-orders/:id/order.csv",
    call: (c) =>
      supplierOrderFileLoader(
        routeArgs(get(`/app/supplier-orders/${ids.order}/order.csv`, c), {
          orderId: String(ids.order),
          file: "order.csv",
        }),
      ),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/leads/:id/supplier-orders",
    call: (c) => jobOrdersLoader(routeArgs(get(`/app/leads/${lead()}/supplier-orders`, c), { leadId: lead() })),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    // Drafted already (above): the owner is told so.
    name: "POST /app/leads/:id/supplier-orders (draft again)",
    call: (c) =>
      jobOrdersAction(
        routeArgs(
          post(`/app/leads/${lead()}/supplier-orders`, c, {
            requestedOn: nextDay(nextDay(zonedDay(new Date(), "America/Chicago"))),
          }),
          { leadId: lead() },
        ),
      ),
    expected: {
      owner: "409",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/leads/:id/build",
    call: (c) => buildLoader(routeArgs(get(`/app/leads/${lead()}/build`, c), { leadId: lead() })),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    // A day that is not a date is refused by field before anything is booked.
    name: "POST /app/leads/:id/build (a day that is not a date)",
    call: (c) =>
      buildAction(
        routeArgs(
          post(`/app/leads/${lead()}/build`, c, {
            intent: "book",
            start: "someday",
            days: "",
            crewUserIds: "1",
            notes: "",
          }),
          { leadId: lead() },
        ),
      ),
    expected: {
      owner: "400",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/calendar",
    call: (c) => calendarLoader(routeArgs(get("/app/calendar", c))),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "200",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    name: "POST /app/calendar (an unknown choice)",
    call: (c) => calendarAction(routeArgs(post("/app/calendar", c, { intent: "share-with-everyone" }))),
    expected: {
      owner: "400",
      estimator: "400",
      crew: "400",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "400",
    },
  },
  {
    // The link's secret is the credential; a made-up one is the same 404 for everybody.
    name: "GET /calendar/:token.ics (a made-up link)",
    call: (c) =>
      calendarFeedLoader(
        routeArgs(get("/calendar/AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA.ics", c), {
          token: "AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA",
        }),
      ),
    expected: {
      owner: "404",
      estimator: "404",
      crew: "404",
      homeowner: "404",
      anonymous: "404",
      "other company's owner": "404",
    },
  },
  {
    name: "GET /app/team",
    call: (c) => teamLoader(routeArgs(get("/app/team", c))),
    expected: {
      owner: "200",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "200",
    },
  },
  {
    name: "GET /photos/:id (the crew's job)",
    call: (c) => photoLoader(routeArgs(get(`/photos/${ids.wonPhoto}`, c), { photoId: String(ids.wonPhoto) })),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "200",
      homeowner: "404",
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /photos/:id (not the crew's)",
    call: (c) => photoLoader(routeArgs(get(`/photos/${ids.otherPhoto}`, c), { photoId: String(ids.otherPhoto) })),
    expected: {
      owner: "200",
      estimator: "200",
      crew: "404",
      homeowner: "404",
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "POST /app/leads/:id (a note)",
    call: (c) =>
      leadAction(
        routeArgs(post(`/app/leads/${lead()}`, c, { intent: "note", note: "Checked the gate width." }), {
          leadId: lead(),
        }),
      ),
    expected: {
      owner: BACK_TO_LEAD,
      estimator: BACK_TO_LEAD,
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "POST /app/leads/:id/design",
    call: (c) =>
      designAction(routeArgs(post(`/app/leads/${lead()}/design`, c, { design: "stone=x" }), { leadId: lead() })),
    expected: {
      owner: "400",
      estimator: "400",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "POST /app/team (deactivate the estimator)",
    call: (c) => teamAction(routeArgs(post("/app/team", c, { intent: "deactivate", userId: String(ids.estimator) }))),
    // The owner's own deactivation of the estimator is tested with the team; here only who may ask.
    expected: {
      owner: "skip",
      estimator: "403",
      crew: "403",
      homeowner: SIGN_IN,
      anonymous: SIGN_IN,
      "other company's owner": "404",
    },
  },
  {
    name: "GET /my/consult/:id (someone else's consult)",
    call: (c) => moveConsultLoader(routeArgs(get(`/my/consult/${ids.booking}`, c), { bookingId: String(ids.booking) })),
    expected: {
      owner: "403",
      estimator: "403",
      crew: "403",
      homeowner: "404",
      anonymous: SIGN_IN,
      "other company's owner": "403",
    },
  },
  {
    name: "POST /my/consult/:id (move someone else's consult)",
    call: (c) =>
      moveConsultAction(
        routeArgs(post(`/my/consult/${ids.booking}`, c, { startsAt: "2099-01-05T15:00:00.000Z" }), {
          bookingId: String(ids.booking),
        }),
      ),
    expected: {
      owner: "403",
      estimator: "403",
      crew: "403",
      homeowner: "404",
      anonymous: SIGN_IN,
      "other company's owner": "403",
    },
  },
];

describe.each(CASES)("$name", (route) => {
  for (const who of WHO) {
    test(`${who}`, async () => {
      const wanted = route.expected[who];
      if (wanted === "skip") return;
      const expected = wanted === BACK_TO_LEAD ? `redirect /app/leads/${ids.wonLead}` : wanted;
      expect(await answer(() => route.call(cookies[who]))).toBe(expected);
    });
  }
  // A loader's return value is exactly what its `.data` request serialises, so checking it covers
  // the page's HTML and its data request alike; PDF and CSV answers are read back as text.
  if (route.name.startsWith("GET") && !route.isHomeownersLink) {
    test("no money for crew: no price, cost or rate in what crew receive", async () => {
      let value: unknown;
      try {
        value = await route.call(cookies.crew);
      } catch (thrown) {
        value = thrown;
      }
      expect(await moneyIn(value)).toEqual([]);
    });
  }
});

// Keys that carry money, and amounts as the product prints them ($1,234 or $12.50).
const MONEY_KEY = /price|cost|cents|fee|margin|markup|overhead|labou?r ?rate|amount|total/i;
const MONEY_TEXT = /\$\s?\d/;

/** Every place a crew member's answer shows money: "key: value" or a printed amount. */
async function moneyIn(value: unknown): Promise<string[]> {
  if (value instanceof Response) {
    if (value.status !== 200) return [];
    const type = value.headers.get("Content-Type") ?? "";
    const bytes = new Uint8Array(await value.arrayBuffer());
    let text = new TextDecoder().decode(bytes);
    if (type.includes("pdf")) {
      const parser = new PDFParse({ data: bytes });
      text = (await parser.getText()).text;
      await parser.destroy();
    }
    return MONEY_TEXT.test(text) ? [`body: ${text.match(/.{0,40}\$\s?\d.{0,20}/)?.[0]}`] : [];
  }
  const found: string[] = [];
  const walk = (node: unknown, path: string) => {
    if (node === null || node === undefined) return;
    if (typeof node === "string") {
      if (MONEY_TEXT.test(node)) found.push(`${path}: ${node}`);
      return;
    }
    if (typeof node !== "object") return;
    for (const [key, child] of Object.entries(node)) {
      const where = path ? `${path}.${key}` : key;
      if (MONEY_KEY.test(key) && child !== null && child !== undefined && child !== false)
        found.push(`${where}: ${JSON.stringify(child)}`);
      walk(child, where);
    }
  };
  const isDataWrapper = value !== null && typeof value === "object" && "init" in value && "data" in value;
  walk(isDataWrapper ? (value as { data: unknown }).data : value, "");
  return found;
}

test("another company's owner reading the inbox, the API and the CSV sees only their own requests", async () => {
  const cookie = cookies["other company's owner"];
  const inbox = (await inboxLoader(routeArgs(get("/app/inbox", cookie)))) as { inbox: { rows: { id: number }[] } };
  const api = (await (await apiLeadsLoader(routeArgs(get("/api/leads", cookie)))).json()) as { rows: { id: number }[] };
  const csv = await ((await inboxCsvLoader(routeArgs(get("/app/inbox.csv", cookie)))) as Response).text();
  const theirs = await db.select({ id: leads.id, companyId: leads.companyId }).from(leads);
  const cinder = new Set(
    theirs
      .filter((l) => l.companyId !== theirs.find((x) => x.id === inbox.inbox.rows[0]!.id)!.companyId)
      .map((l) => l.id),
  );
  expect(inbox.inbox.rows.length).toBeGreaterThan(0);
  for (const row of [...inbox.inbox.rows, ...api.rows]) expect(cinder.has(row.id)).toBe(false);
  expect(csv).not.toContain("Tobias Wren");
  expect(csv).toContain("Amara Winterbourne");
});

test("the crew's view of their job carries no price, e-mail or phone", async () => {
  const view = (await leadLoader(
    routeArgs(get(`/app/leads/${ids.wonLead}`, cookies.crew), { leadId: String(ids.wonLead) }),
  )) as {
    lead: { email: string | null; phone: string | null; street: string };
    shown: { price: unknown; labour: unknown };
    timeline: unknown[];
  };
  expect(view.lead.email).toBeNull();
  expect(view.lead.phone).toBeNull();
  expect(view.lead.street).toBe("11 Cinderbrook Lane");
  expect(view.shown.price).toBeNull();
  expect(view.shown.labour).toBeNull();
  expect(view.timeline).toEqual([]);
  const serialised = JSON.stringify(view);
  expect(serialised).not.toContain("tobias.wren@example.test");
  expect(serialised).not.toContain("018-3307");
  expect(serialised).not.toMatch(/Cents/);
});

test("the API answers an anonymous caller and a homeowner with JSON, not a page", async () => {
  const anonymous = await answerResponse(() => apiLeadsLoader(routeArgs(get("/api/leads", undefined))));
  expect(anonymous.status).toBe(401);
  expect(anonymous.headers.get("Content-Type")).toContain("application/json");
  expect(await anonymous.json()).toEqual({ errors: [{ path: "", message: expect.stringContaining("Sign in") }] });
  const homeowner = await answerResponse(() => apiLeadsLoader(routeArgs(get("/api/leads", cookies.homeowner))));
  expect(homeowner.status).toBe(403);
  expect(homeowner.headers.get("Content-Type")).toContain("application/json");
});

async function answerResponse(run: () => Promise<unknown>): Promise<Response> {
  try {
    return (await run()) as Response;
  } catch (thrown) {
    return thrown as Response;
  }
}

test("a homeowner's “My requests” lists only proposals on their own requests", async () => {
  const { company } = await demoCompany();
  const [owner] = await db
    .insert(users)
    .values({ companyId: company.id, email: "proposal.owner@example.test", name: "Proposal Owner", role: "homeowner" })
    .returning();
  await db.update(leads).set({ homeownerId: owner!.id }).where(eq(leads.id, ids.otherLead));
  const theirs = (await myLoader(routeArgs(get("/my", (await startSession(owner!.id)).split(";")[0])))) as {
    requests: { proposals: { href: string }[] }[];
  };
  expect(theirs.requests.flatMap((r) => r.proposals.map((p) => p.href))).toEqual([`/p/${ids.token}`]);
  const someoneElse = (await myLoader(routeArgs(get("/my", cookies.homeowner)))) as {
    requests: { proposals: unknown[] }[];
  };
  expect(JSON.stringify(someoneElse)).not.toContain(ids.token);
});

test("the crew's view of their job lists no proposals and no totals", async () => {
  const view = (await leadLoader(
    routeArgs(get(`/app/leads/${ids.wonLead}`, cookies.crew), { leadId: String(ids.wonLead) }),
  )) as { proposals: unknown[]; totals: unknown };
  expect(view.proposals).toEqual([]);
  expect(view.totals).toBeNull();
});
