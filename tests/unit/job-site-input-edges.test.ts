/*
 * What the crew's job page and its checklist sync do with input no honest phone sends: times with
 * and without fractions of a second (RFC 3339 §5.6 allows both, so they are compared as instants,
 * not as text), a phone clock set far ahead or far back, one change id used for two changes, a body
 * that is not an object, numbers written as hex or exponents, quantities that round to nothing and
 * control characters in a description (Unicode C0/C1 controls and the bidi overrides of UAX #9).
 * Each refusal names its field (OWASP ASVS 4.0.3 V5.1.3: input validated against what is allowed).
 */
import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { jobExtras, jobStepTicks, leads } from "~/db/schema";
import { extraSchema, hoursSchema } from "~/lib/builds/job-site-schema";
import { db } from "~/lib/platform/db.server";
import { action as jobAction } from "~/routes/app-job";
import { action as ticksAction } from "~/routes/app-job-ticks";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";

let crew = "";
let leadId = 0;

beforeAll(async () => {
  const { company } = await demoCompany();
  crew = await loginAs(company.id, "crew");
  // The seed books Sunniva Okoro's build with the demo crew member on it.
  const [lead] = await db
    .select()
    .from(leads)
    .where(and(eq(leads.companyId, company.id), eq(leads.customerName, "Sunniva Okoro")));
  leadId = lead!.id;
});

async function sync(body: unknown) {
  const response = (await ticksAction(
    routeArgs(
      requestWithCookie(`/app/jobs/${leadId}/ticks`, crew, {
        method: "POST",
        body: JSON.stringify(body),
        headers: { "Content-Type": "application/json" },
      }),
      { leadId: String(leadId) },
    ),
  )) as Response;
  return {
    status: response.status,
    body: (await response.json()) as {
      applied?: string[];
      superseded?: string[];
      refused?: { clientId: string; message: string }[];
      ticks?: Record<string, { done: boolean; changedAt: string }>;
      errors?: { path: string; message: string }[];
    },
  };
}

const tickOf = async (stepKey: string) =>
  (
    await db
      .select()
      .from(jobStepTicks)
      .where(and(eq(jobStepTicks.leadId, leadId), eq(jobStepTicks.stepKey, stepKey)))
  )[0];

/** A whole second some minutes ago, written without a fraction ("…:07Z"). */
function wholeSecondAgo(minutes: number): Date {
  const at = new Date(Date.now() - minutes * 60_000);
  at.setUTCMilliseconds(0);
  return at;
}

describe("the checklist's sync: times", () => {
  test("a change at …:00.500Z is later than one at …:00Z whatever the order; the stored time is one form", async () => {
    const base = wholeSecondAgo(10);
    const later = {
      clientId: randomUUID(),
      stepKey: "course-2",
      done: true,
      changedAt: new Date(base.getTime() + 500).toISOString(),
    };
    const earlier = {
      clientId: randomUUID(),
      stepKey: "course-2",
      done: false,
      changedAt: base.toISOString().replace(".000Z", "Z"),
    };
    expect((await sync({ changes: [later] })).body.applied).toEqual([later.clientId]);
    const second = await sync({ changes: [earlier] });
    expect(second.body.superseded).toEqual([earlier.clientId]);
    expect(await tickOf("course-2")).toMatchObject({ done: true, clientId: later.clientId });

    // The same pair in one batch, and a time sent without its fraction is stored as toISOString.
    const step = "course-3";
    const plain = { ...earlier, clientId: randomUUID(), stepKey: step };
    expect((await sync({ changes: [plain] })).status).toBe(200);
    expect((await tickOf(step))!.changedAt).toBe(base.toISOString());
  });

  test("a phone clock far ahead is refused naming changedAt, and does not hold the step against later changes", async () => {
    const ahead = {
      clientId: randomUUID(),
      stepKey: "course-1",
      done: true,
      changedAt: "9999-12-31T23:59:59Z",
    };
    const answer = await sync({ changes: [ahead] });
    expect(answer.status).toBe(200);
    expect(answer.body.applied).toEqual([]);
    expect(answer.body.refused).toHaveLength(1);
    expect(answer.body.refused![0]!.message).toMatch(/^changedAt 9999-12-31T23:59:59Z is ahead of the server's clock/);
    expect(await tickOf("course-1")).toBeUndefined();
    const honest = { clientId: randomUUID(), stepKey: "course-1", done: true, changedAt: new Date().toISOString() };
    expect((await sync({ changes: [honest] })).body.applied).toEqual([honest.clientId]);
    // A minute ahead is ordinary clock drift and is kept.
    const drift = {
      clientId: randomUUID(),
      stepKey: "course-1",
      done: false,
      changedAt: new Date(Date.now() + 60_000).toISOString(),
    };
    expect((await sync({ changes: [drift] })).body.applied).toEqual([drift.clientId]);
  });

  test("a changedAt over a year back (a phone reset to 1970, or year 0) is refused naming changedAt", async () => {
    for (const changedAt of ["1970-01-01T00:00:00Z", "0000-01-01T00:00:00Z"]) {
      const old = { clientId: randomUUID(), stepKey: "dig-base", done: true, changedAt };
      const answer = await sync({ changes: [old] });
      expect(answer.body.refused).toEqual([
        {
          clientId: old.clientId,
          message: `changedAt ${changedAt} is more than a year ago: check the phone's date and time.`,
        },
      ]);
    }
    expect(await tickOf("dig-base")).toBeUndefined();
  });
});

describe("the checklist's sync: ids and shape", () => {
  test("one clientId for two different changes: the second is refused, not reported as recorded", async () => {
    const id = randomUUID();
    const at = new Date(Date.now() - 60_000).toISOString();
    const on = { clientId: id, stepKey: "caps", done: true, changedAt: at };
    const off = { clientId: id, stepKey: "caps", done: false, changedAt: new Date(Date.now() - 30_000).toISOString() };
    const answer = await sync({ changes: [on, off] });
    expect(answer.body.applied).toEqual([id]);
    expect(answer.body.refused).toEqual([
      { clientId: id, message: `clientId ${id} names two different changes: give each change its own id.` },
    ]);
    expect(await tickOf("caps")).toMatchObject({ done: true, clientId: id });
    // The very same change twice in one batch counts once.
    const same = { clientId: randomUUID(), stepKey: "cure", done: true, changedAt: at };
    const twice = await sync({ changes: [same, same] });
    expect(twice.body).toMatchObject({ applied: [same.clientId], refused: [] });
  });

  test.each([
    [null, "", 'Send the changes as JSON: {"changes": [...]}.'],
    [[], "", 'Send the changes as JSON: {"changes": [...]}.'],
    [{}, "changes", '"changes" must be a list of tick changes.'],
    [{ changes: ["x"] }, "changes.0", "Each change is an object with clientId, stepKey, done and changedAt."],
  ])("a body of %j is a 400 naming %j", async (body, path, message) => {
    const answer = await sync(body);
    expect(answer.status).toBe(400);
    expect(answer.body.errors).toEqual([{ path, message }]);
  });
});

describe("hours and extra material: numbers and text", () => {
  test.each(["0x8", "8e0", "Infinity", "8 h", "1_0"])("“%s” hours are refused naming hours", (typed) => {
    const parsed = hoursSchema.safeParse({ workerUserId: "3", day: "2026-12-01", hours: typed });
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues[0]!.path).toEqual(["hours"]);
  });

  test.each(["0.001", "0.004", "1e3", "0x10", "-0"])("a quantity of “%s” is refused naming quantity", (typed) => {
    const parsed = extraSchema.safeParse({ quantity: typed, description: "Base stone", cost: "10" });
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues.map((i) => i.path)).toEqual([["quantity"]]);
    expect(parsed.error!.issues[0]!.message).toBe("Quantity must be a number from 0.01 to 10,000.");
  });

  test.each([
    ["38.50", 3850],
    ["$1,250.75", 125_075],
    ["0", 0],
    ["12,5", 1250],
  ])("a cost of “%s” is %i cents", (typed, cents) => {
    const parsed = extraSchema.safeParse({ quantity: "1", description: "Base stone", cost: typed });
    expect(parsed.success && parsed.data.costCents).toBe(cents);
  });

  test.each(["0x20", "1e3", "Infinity"])("a cost of “%s” is refused naming cost", (typed) => {
    const parsed = extraSchema.safeParse({ quantity: "1", description: "Base stone", cost: typed });
    expect(parsed.error!.issues.map((i) => i.path)).toEqual([["cost"]]);
  });

  test("an item id of 0 is refused with the field's own message", () => {
    const parsed = extraSchema.safeParse({ catalogItemId: "0", quantity: "1" });
    expect(parsed.error!.issues.map((i) => [i.path, i.message])).toEqual([
      [["catalogItemId"], "Choose an item from the list, or “Something else”."],
    ]);
  });

  test("control, bidi and zero-width characters never reach the stored description; a blank one is refused", async () => {
    const clientId = randomUUID();
    const post = (fields: Record<string, string>) =>
      jobAction(
        routeArgs(
          requestWithCookie(`/app/jobs/${leadId}`, crew, {
            method: "POST",
            body: new URLSearchParams({ intent: "extra", quantity: "1", cost: "4", ...fields }),
            headers: { "Content-Type": "application/x-www-form-urlencoded" },
          }),
          { leadId: String(leadId) },
        ),
      );
    const saved = (await post({ clientId, description: "Spare\u0000 cap\u001b[31m\u202e\u200b\r\nbag" })) as Response;
    expect(saved.status).toBe(302);
    const [row] = await db.select().from(jobExtras).where(eq(jobExtras.clientId, clientId));
    // Controls, overrides and zero-width spaces are dropped as the form is read; the line break becomes a space.
    expect(row!.description).toBe("Spare cap[31m bag");
    const blank = (await post({ clientId: randomUUID(), description: "\u0007\u0007\u200b" })) as {
      data: { errors: Record<string, string> };
      init: { status: number };
    };
    expect(blank.init.status).toBe(400);
    expect(blank.data.errors.description).toMatch(/^Say what was used/);
  });
});
