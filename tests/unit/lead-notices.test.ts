import { and, eq, like } from "drizzle-orm";
import { Resend } from "resend";
import { afterAll, beforeAll, expect, test } from "vitest";
import { startEmailFake, type EmailFake } from "../../fakes/email/server";
import { deliverDueEmails } from "~/lib/jobs/outbox-worker.server";
import { emailOutbox, leadEvents, leads, users, type Lead } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import {
  assignCrew,
  assignEstimator,
  listRevisions,
  listTimeline,
  saveRevision,
  sendRevision,
} from "~/lib/leads/lead-workspace.server";
import type { SessionUser } from "~/lib/auth/session.server";
import { createCompanyWithStaff } from "./support/fixtures";
import { createTestLead, createTestPlanRecord } from "./support/leads";

const ORIGIN = "https://pits.example.test";

let mailFake: EmailFake;
beforeAll(async () => {
  mailFake = await startEmailFake({ port: 0 });
});
afterAll(() => mailFake.close());

async function setUp() {
  const { company, people } = await createCompanyWithStaff("Quarry Lane Masonry");
  await db.update(users).set({ isActive: true }).where(eq(users.companyId, company.id));
  const asUser = async (id: number): Promise<SessionUser> => {
    const [u] = await db.select().from(users).where(eq(users.id, id));
    return { id: u!.id, companyId: u!.companyId, email: u!.email, name: u!.name, role: u!.role, sessionId: "test" };
  };
  const { id } = await createTestLead(company);
  const lead = async (): Promise<Lead> => (await db.select().from(leads).where(eq(leads.id, id)))[0]!;
  return {
    company,
    owner: await asUser(people.owner.id),
    estimator: await asUser(people.estimator.id),
    crew: await asUser(people.crew.id),
    lead,
  };
}

const mailTo = (address: string) => db.select().from(emailOutbox).where(eq(emailOutbox.toAddress, address));

test("assigning an estimator e-mails them the request with a link to it; assigning yourself sends nothing", async () => {
  const { owner, estimator, lead } = await setUp();
  expect(await assignEstimator(owner, await lead(), estimator.id, ORIGIN)).toEqual({ ok: true });
  const [mail] = await mailTo(estimator.email);
  expect(mail!.subject).toBe("Request assigned to you: Wren Castellano, Millbrook Falls");
  expect(mail!.text).toContain(
    `${owner.name} assigned you the fire-pit request from Wren Castellano in Millbrook Falls`,
  );
  expect(mail!.text).toContain(`${ORIGIN}/app/leads/${(await lead()).id}`);
  // It shows on the lead's timeline with the lead's other e-mails.
  expect(
    (await listTimeline(await lead())).some((t) => t.kind === "email" && t.detail.includes("Request assigned to you")),
  ).toBe(true);

  expect(await assignEstimator(owner, await lead(), owner.id, ORIGIN)).toEqual({ ok: true });
  expect(await mailTo(owner.email)).toHaveLength(0);
});

test("giving a signed job to a crew member e-mails them; a refused assignment e-mails no one", async () => {
  const { owner, crew, lead } = await setUp();
  expect((await assignCrew(owner, await lead(), crew.id, ORIGIN)).ok).toBe(false);
  expect(await mailTo(crew.email)).toHaveLength(0);
  await db
    .update(leads)
    .set({ status: "signed" })
    .where(eq(leads.id, (await lead()).id));
  expect(await assignCrew(owner, await lead(), crew.id, ORIGIN)).toEqual({ ok: true });
  const [mail] = await mailTo(crew.email);
  expect(mail!.subject).toBe("Job to build: Wren Castellano, Millbrook Falls");
  expect(mail!.text).toContain("gave you the fire-pit job for Wren Castellano in Millbrook Falls to build");
});

test("a revision sent to the homeowner is marked sent once, noted on the timeline and e-mailed with its price and a link to their page", async () => {
  const { estimator, lead } = await setUp();
  const revisionId = await saveRevision(estimator, await lead(), createTestPlanRecord());
  expect((await listRevisions(await lead()))[0]!.sentAt).toBeNull();
  const [first, second] = await Promise.all([
    sendRevision(estimator, await lead(), revisionId, ORIGIN),
    sendRevision(estimator, await lead(), revisionId, ORIGIN),
  ]);
  // Of two sends at once, one marks it and the other is told it went already.
  expect([first, second].filter((r) => r.ok)).toHaveLength(1);
  expect([first, second].find((r) => !r.ok)).toMatchObject({ status: 409 });
  expect((await listRevisions(await lead()))[0]!.sentAt).not.toBeNull();
  const mails = await mailTo((await lead()).email);
  const sent = mails.filter((m) => m.subject.startsWith("Your revised fire-pit design"));
  expect(sent).toHaveLength(1);
  expect(sent[0]!.subject).toBe("Your revised fire-pit design from Quarry Lane Masonry");
  expect(sent[0]!.text).toContain(`${ORIGIN}/my#revision-${revisionId}`);
  const events = await db
    .select()
    .from(leadEvents)
    .where(and(eq(leadEvents.leadId, (await lead()).id), eq(leadEvents.kind, "revision-sent")));
  expect(events).toHaveLength(1);
});

test("a revision of another request cannot be sent from this one (404)", async () => {
  const { estimator, lead, company } = await setUp();
  const { id: otherId } = await createTestLead(company);
  const [other] = await db.select().from(leads).where(eq(leads.id, otherId));
  const revisionId = await saveRevision(estimator, other!, createTestPlanRecord());
  expect(await sendRevision(estimator, await lead(), revisionId, ORIGIN)).toMatchObject({ ok: false, status: 404 });
  expect(
    await db
      .select()
      .from(emailOutbox)
      .where(like(emailOutbox.idempotencyKey, `lead-revision-${revisionId}/%`)),
  ).toHaveLength(0);
});

test("the homeowner's revision e-mail goes out under the company's name with Reply-To the company's address", async () => {
  const { estimator, lead, company } = await setUp();
  const revisionId = await saveRevision(estimator, await lead(), createTestPlanRecord());
  await sendRevision(estimator, await lead(), revisionId, ORIGIN);
  const client = new Resend("re_test_key", { baseUrl: mailFake.url });
  // Other files' rows may be due too; the worker sends them all.
  while ((await deliverDueEmails(new Date(), client)) > 0);
  const messages = (await (
    await fetch(`${mailFake.url}/_fake/messages?to=${encodeURIComponent((await lead()).email)}`)
  ).json()) as { from: string; reply_to: string[]; subject: string; text: string }[];
  const revision = messages.find((m) => m.subject.startsWith("Your revised fire-pit design"))!;
  expect(revision.from).toBe("Quarry Lane Masonry <requests@emberwright.test>");
  expect(revision.reply_to).toEqual([company.email]);
});
