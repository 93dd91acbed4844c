/*
 * Working a request from its page. The pipeline and its rules are the product's own (common
 * practice, no source); input is checked on the server with a message per field and nothing is
 * half-written (OWASP ASVS 4.0.3 V5.1.3 and V11.1.4: validate every input, keep writes atomic).
 */
import { and, count, eq } from "drizzle-orm";
import { beforeAll, expect, test } from "vitest";
import { leadEvents, leadRevisions, leads, users, type Lead } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { designToSearchParams, type Design } from "~/lib/design/design";
import { action as designAction, loader as designLoader } from "~/routes/app-lead-design";
import { action as leadAction, loader as leadLoader } from "~/routes/app-lead";
import { demoCompany, routeArgs } from "./support/demo";
import { createCompanyWithStaff, requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";

let companyId = 0;
let estimator = { id: 0, cookie: "" };
let crewId = 0;
let ownerId = 0;

beforeAll(async () => {
  const { company } = await demoCompany();
  companyId = company.id;
  const staff = await db.select().from(users).where(eq(users.companyId, companyId));
  estimator = { id: staff.find((u) => u.role === "estimator")!.id, cookie: await loginAs(companyId, "estimator") };
  crewId = staff.find((u) => u.role === "crew")!.id;
  ownerId = staff.find((u) => u.role === "owner")!.id;
});

const byRef = async (ref: string) => (await db.select().from(leads).where(eq(leads.ref, ref)))[0]!;
const eventsOf = (leadId: number) =>
  db.select().from(leadEvents).where(eq(leadEvents.leadId, leadId)).orderBy(leadEvents.id);

type ActionAnswer = { status: number; location: string | null; errors: Record<string, string> };

async function post(lead: Lead, fields: Record<string, string>, cookie = estimator.cookie): Promise<ActionAnswer> {
  const request = requestWithCookie(`/app/leads/${lead.id}`, cookie, {
    method: "POST",
    body: new URLSearchParams(fields),
  });
  const result = (await leadAction(routeArgs(request, { leadId: String(lead.id) }))) as
    Response | { data: { errors: Record<string, string> }; init: { status: number } };
  if (result instanceof Response)
    return { status: result.status, location: result.headers.get("Location"), errors: {} };
  return { status: result.init.status, location: null, errors: result.data.errors };
}

test("an estimator marks a new request called back; the move is saved and lands on the timeline with who did it", async () => {
  const lead = await byRef("demo-cinder-slate-01");
  expect(lead.status).toBe("request");
  const before = (await eventsOf(lead.id)).length;
  expect(await post(lead, { intent: "status", status: "called-back" })).toEqual({
    status: 302,
    location: `/app/leads/${lead.id}`,
    errors: {},
  });
  const moved = await byRef("demo-cinder-slate-01");
  expect(moved.status).toBe("called-back");
  expect(moved.calledBackAt).not.toBeNull();
  const steps = (await eventsOf(lead.id)).slice(before);
  expect(steps.map((e) => [e.kind, e.detail, e.actorUserId])).toEqual([
    ["status", "Request in → Called back", estimator.id],
  ]);
});

test("stages that follow an event cannot be set by hand: consult, visit, proposal and signed are refused with the moves on offer", async () => {
  const lead = await byRef("demo-cinder-slate-03");
  for (const status of ["consult-booked", "measured", "proposal-out", "signed", "built"]) {
    const refused = await post(lead, { intent: "status", status });
    expect(refused.status).toBe(400);
    expect(refused.errors.status).toBe(
      "From “Request in” the job can move to “Called back”, “On hold”, “Not going ahead”.",
    );
  }
  expect((await byRef("demo-cinder-slate-03")).status).toBe("request");
});

test("stopping a job needs a reason; without one the answer is 400 naming the field and nothing changes; picked up again, it returns to its step", async () => {
  const lead = await byRef("demo-cinder-slate-04");
  expect(lead.status).toBe("called-back");
  const before = (await eventsOf(lead.id)).length;
  const refused = await post(lead, { intent: "status", status: "not-going-ahead", reason: " " });
  expect(refused.status).toBe(400);
  expect(refused.errors.reason).toMatch(/^Say why/);
  expect((await byRef("demo-cinder-slate-04")).status).toBe("called-back");
  expect(await eventsOf(lead.id)).toHaveLength(before);

  expect(
    await post(lead, { intent: "status", status: "on-hold", reason: "Waiting for the town's burn permit." }),
  ).toMatchObject({ status: 302 });
  const held = await byRef("demo-cinder-slate-04");
  expect([held.status, held.stopReason, held.pausedStage]).toEqual([
    "on-hold",
    "Waiting for the town's burn permit.",
    "called-back",
  ]);
  expect((await eventsOf(lead.id)).at(-1)!.detail).toBe("Called back → On hold: Waiting for the town's burn permit.");

  // Dropped while on hold: it keeps the step it held at.
  expect(await post(lead, { intent: "status", status: "not-going-ahead", reason: "Moved out of town." })).toMatchObject(
    { status: 302 },
  );
  const dropped = await byRef("demo-cinder-slate-04");
  expect([dropped.status, dropped.stopReason, dropped.pausedStage]).toEqual([
    "not-going-ahead",
    "Moved out of town.",
    "called-back",
  ]);

  // Picked up again: back to its step, the reason goes, the move is recorded.
  expect(await post(lead, { intent: "status", status: "called-back" })).toMatchObject({ status: 302 });
  const back = await byRef("demo-cinder-slate-04");
  expect([back.status, back.stopReason, back.pausedStage]).toEqual(["called-back", null, null]);
  expect((await eventsOf(lead.id)).at(-1)!.detail).toBe("Not going ahead → Called back");
});

test("a signed job moves along the build's steps one at a time and can no longer be dropped by hand", async () => {
  const lead = await byRef("demo-cinder-slate-11");
  expect(lead.status).toBe("signed");
  expect((await post(lead, { intent: "status", status: "not-going-ahead", reason: "Changed mind." })).status).toBe(400);
  expect((await post(lead, { intent: "status", status: "built" })).status).toBe(400);
  expect(await post(lead, { intent: "status", status: "stone-ordered" })).toMatchObject({ status: 302 });
  expect((await byRef("demo-cinder-slate-11")).status).toBe("stone-ordered");
});

test("bad stage forms are refused with 400 and a message naming the field", async () => {
  const lead = await byRef("demo-cinder-slate-05");
  expect((await post(lead, { intent: "status", status: "won" })).errors.status).toMatch(
    /^Stage must be one of: request, called-back/,
  );
  expect((await post(lead, { intent: "status", status: lead.status })).errors.status).toMatch(
    /^From “Called back” the job can move to/,
  );
  expect((await post(lead, { intent: "status", status: "on-hold", reason: "x".repeat(201) })).errors.reason).toBe(
    "Reason must be at most 200 characters.",
  );
  const unknown = await post(lead, { intent: "delete" });
  expect(unknown.status).toBe(400);
  expect(unknown.errors.intent).toMatch(/^Unknown action/);
});

test("a note lands on the timeline; an empty or too long one is refused and nothing is written", async () => {
  const lead = await byRef("demo-cinder-slate-05");
  const before = (await eventsOf(lead.id)).length;
  expect((await post(lead, { intent: "note", note: "   " })).errors.note).toBe(
    "Write the note first (up to 2,000 characters).",
  );
  expect((await post(lead, { intent: "note", note: "x".repeat(2001) })).errors.note).toBe(
    "Notes must be at most 2,000 characters.",
  );
  expect(await eventsOf(lead.id)).toHaveLength(before);
  expect(await post(lead, { intent: "note", note: "Gate is 40 in wide: hand-cart the caps." })).toMatchObject({
    status: 302,
  });
  const last = (await eventsOf(lead.id)).at(-1)!;
  expect([last.kind, last.detail, last.actorUserId]).toEqual([
    "note",
    "Gate is 40 in wide: hand-cart the caps.",
    estimator.id,
  ]);
});

test("a request is assigned to an owner or estimator of the company, never to crew, a stranger or a deactivated person", async () => {
  const lead = await byRef("demo-cinder-slate-02");
  expect(lead.assignedUserId).toBeNull();
  expect((await post(lead, { intent: "assign", assigneeId: String(crewId) })).errors.assigneeId).toBe(
    "Choose an active owner or estimator of your company.",
  );
  const stranger = await createCompanyWithStaff("Elsewhere Masonry");
  expect((await post(lead, { intent: "assign", assigneeId: String(stranger.people.estimator.id) })).status).toBe(400);
  expect((await post(lead, { intent: "assign", assigneeId: "abc" })).errors.assigneeId).toBe(
    "Choose an estimator from the list.",
  );
  const [gone] = await db
    .insert(users)
    .values({
      companyId,
      email: "gone.estimator@cinder-slate.test",
      name: "Gone Estimator",
      role: "estimator",
      isActive: false,
    })
    .returning();
  expect((await post(lead, { intent: "assign", assigneeId: String(gone!.id) })).status).toBe(400);
  expect((await byRef("demo-cinder-slate-02")).assignedUserId).toBeNull();

  expect(await post(lead, { intent: "assign", assigneeId: String(estimator.id) })).toMatchObject({ status: 302 });
  expect((await byRef("demo-cinder-slate-02")).assignedUserId).toBe(estimator.id);
  expect((await eventsOf(lead.id)).at(-1)!.detail).toBe("Assigned to Theo Brandvold");
  expect(await post(lead, { intent: "assign", assigneeId: String(ownerId) })).toMatchObject({ status: 302 });
  expect((await eventsOf(lead.id)).at(-1)!.detail).toBe("Assigned to Maren Okafor (was Theo Brandvold)");
  expect(await post(lead, { intent: "assign", assigneeId: "" })).toMatchObject({ status: 302 });
  expect((await byRef("demo-cinder-slate-02")).assignedUserId).toBeNull();
  expect((await eventsOf(lead.id)).at(-1)!.detail).toBe("Unassigned (was Maren Okafor)");
});

test("a job goes to a crew member only once it is signed, and only to crew of the company", async () => {
  const open = await byRef("demo-cinder-slate-09");
  expect((await post(open, { intent: "crew", crewUserId: String(crewId) })).errors.crewUserId).toBe(
    "A job goes to a crew once it is signed and the deposit is paid.",
  );
  const won = await byRef("demo-cinder-slate-11");
  expect(won.crewUserId).toBeNull();
  expect((await post(won, { intent: "crew", crewUserId: String(estimator.id) })).errors.crewUserId).toBe(
    "Choose an active crew member of your company.",
  );
  expect(await post(won, { intent: "crew", crewUserId: String(crewId) })).toMatchObject({ status: 302 });
  expect((await byRef("demo-cinder-slate-11")).crewUserId).toBe(crewId);
  expect((await eventsOf(won.id)).at(-1)!).toMatchObject({
    kind: "crew-assigned",
    detail: "Job given to Dario Quist",
    actorUserId: estimator.id,
  });
});

test("the timeline shows status changes, notes, assignments and the e-mails sent about the request, newest first, with who", async () => {
  const lead = await byRef("demo-cinder-slate-10");
  const view = (await leadLoader(
    routeArgs(requestWithCookie(`/app/leads/${lead.id}`, estimator.cookie), { leadId: String(lead.id) }),
  )) as {
    timeline: { kind: string; detail: string; actorName: string | null; createdAt: string }[];
  };
  const kinds = new Set(view.timeline.map((t) => t.kind));
  for (const kind of ["received", "status", "note", "assigned", "crew-assigned", "email"])
    expect(kinds).toContain(kind);
  const times = view.timeline.map((t) => t.createdAt);
  expect(times).toEqual([...times].sort().reverse());
  expect(view.timeline.find((t) => t.kind === "note")!.actorName).toBe("Maren Okafor");
  expect(view.timeline.some((t) => t.kind === "email" && t.detail.includes("tobias.wren@example.test"))).toBe(true);
});

async function postDesign(lead: Lead, design: string, cookie = estimator.cookie) {
  const request = requestWithCookie(`/app/leads/${lead.id}/design`, cookie, {
    method: "POST",
    body: new URLSearchParams({ design }),
  });
  return designAction(routeArgs(request, { leadId: String(lead.id) })) as Promise<
    Response | { data: { errors: Record<string, string> }; init: { status: number } }
  >;
}

test("a staff revision is saved with a freshly priced plan; the homeowner's original stays as sent and can still be shown", async () => {
  const lead = await byRef("demo-cinder-slate-06");
  const loaded = (await designLoader(
    routeArgs(requestWithCookie(`/app/leads/${lead.id}/design`, estimator.cookie), { leadId: String(lead.id) }),
  )) as { design: Design };
  const revised: Design = { ...loaded.design, fitToRing: false, unitCount: 18, courses: 3 };
  const answer = await postDesign(lead, designToSearchParams(revised).toString());
  expect(answer).toBeInstanceOf(Response);
  expect((answer as Response).headers.get("Location")).toBe(`/app/leads/${lead.id}`);

  const after = await byRef("demo-cinder-slate-06");
  expect(after.designJson).toBe(lead.designJson);
  expect(after.planJson).toBe(lead.planJson);
  expect([after.priceLowCents, after.priceHighCents]).toEqual([lead.priceLowCents, lead.priceHighCents]);
  const revisions = await db.select().from(leadRevisions).where(eq(leadRevisions.leadId, lead.id));
  expect(revisions).toHaveLength(1);
  const plan = JSON.parse(revisions[0]!.planJson);
  expect(plan.ring.unitsPerCourse).toBe(18);
  expect(plan.ring.courses).toBe(3);
  expect(revisions[0]!.priceLowCents).toBe(plan.price.lowCents);
  expect((await eventsOf(lead.id)).at(-1)!).toMatchObject({ kind: "revision", actorUserId: estimator.id });

  const url = `/app/leads/${lead.id}`;
  const latest = (await leadLoader(
    routeArgs(requestWithCookie(url, estimator.cookie), { leadId: String(lead.id) }),
  )) as {
    versions: { key: string; isShown: boolean }[];
    shown: { cutList: { rows: { key: string; value: string }[] }[] };
  };
  expect(latest.versions.map((v) => [v.key, v.isShown])).toEqual([
    ["original", false],
    [String(revisions[0]!.id), true],
  ]);
  expect(latest.shown.cutList[0]!.rows[0]!.value).toBe("18, all whole");
  const original = (await leadLoader(
    routeArgs(requestWithCookie(`${url}?version=original`, estimator.cookie), { leadId: String(lead.id) }),
  )) as typeof latest;
  expect(original.versions[0]!.isShown).toBe(true);
  expect(original.shown.cutList[0]!.rows[0]!.value).not.toBe("18, all whole");
  await expect(
    leadLoader(routeArgs(requestWithCookie(`${url}?version=99999`, estimator.cookie), { leadId: String(lead.id) })),
  ).rejects.toMatchObject({ status: 404 });
});

test("a revision with values the catalog does not offer is refused with 400 naming each field, and nothing is saved", async () => {
  const lead = await byRef("demo-cinder-slate-07");
  const count0 = (await db.select({ n: count() }).from(leadRevisions).where(eq(leadRevisions.leadId, lead.id)))[0]!.n;
  const bad = await postDesign(lead, "stone=999999&units=2&courses=40&cap=none&overhang=9&liner=lava&patio=3");
  expect(bad).not.toBeInstanceOf(Response);
  const { data, init } = bad as { data: { errors: Record<string, string> }; init: { status: number } };
  expect(init.status).toBe(400);
  expect(Object.keys(data.errors).sort()).toEqual(["courses", "liner", "overhang", "patio", "units"]);
  expect(data.errors.courses).toBe("Courses must be from 1 to 12.");
  const unknownStone = (await postDesign(
    lead,
    "stone=999999&units=14&courses=3&cap=none&overhang=0&liner=none&patio=0",
  )) as { data: { errors: Record<string, string> } };
  expect(unknownStone.data.errors).toEqual({ stone: "Choose a wall stone you offer." });
  const empty = (await postDesign(lead, "")) as { data: { errors: Record<string, string> } };
  expect(Object.keys(empty.data.errors)).toContain("stone");
  const after = (
    await db
      .select({ n: count() })
      .from(leadRevisions)
      .where(and(eq(leadRevisions.leadId, lead.id)))
  )[0]!.n;
  expect(after).toBe(count0);
});
