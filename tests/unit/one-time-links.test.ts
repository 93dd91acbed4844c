/*
 * One-time links and what they reveal (OWASP ASVS 4.0.3 V2.5 credential recovery, V3.5 tokens;
 * OWASP Forgot Password Cheat Sheet: "return a consistent message for both existent and
 * non-existent accounts", "tokens should be single use", "do not send the token in the URL
 * that is logged"). The attacks: replaying an older link, using one link twice at the same moment,
 * reading tokens out of access logs, telling registered addresses from the confirmation page, and
 * pushing a request into a stranger's account by typing their address into the form.
 */
import { desc, eq, like } from "drizzle-orm";
import { beforeAll, expect, test } from "vitest";
import { emailOutbox, leads, users, type Company } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { hashPassword, verifyPassword } from "~/lib/auth/password.server";
import { startSession } from "~/lib/auth/session.server";
import { loader as myLoader } from "~/routes/my";
import { loader as sentLoader } from "~/routes/request-sent";
import { action as welcomeAction } from "~/routes/welcome";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { createTestLead } from "./support/leads";

let company: Company;
beforeAll(async () => {
  ({ company } = await demoCompany());
});

/** The token in the newest e-mail to an address (links are /welcome#<token>; older builds used /welcome/<token>). */
async function latestLink(email: string): Promise<{ link: string; token: string }> {
  const [mail] = await db
    .select()
    .from(emailOutbox)
    .where(eq(emailOutbox.toAddress, email))
    .orderBy(desc(emailOutbox.id))
    .limit(1);
  const match = /(https?:\/\/[^\s\]]+?\/welcome[#/]([\w-]{43}))/.exec(mail!.text);
  if (!match) throw new Error(`no one-time link in the e-mail to ${email}`);
  return { link: match[1]!, token: match[2]! };
}

/** Posts to the welcome page as its form does: the token in the body (and, for old builds, in the path). */
function postWelcome(token: string, fields: Record<string, string>) {
  const request = new Request("http://localhost/welcome", {
    method: "POST",
    body: new URLSearchParams({ token, ...fields }),
  });
  return welcomeAction(routeArgs(request, { token })) as Promise<
    Response | { init?: { status?: number }; data: unknown }
  >;
}
const statusOf = (r: Response | { init?: { status?: number } }) =>
  r instanceof Response ? r.status : (r.init?.status ?? 200);
const setPassword = (token: string, password: string) =>
  postWelcome(token, { intent: "set", password, confirm: password });

async function accountOf(email: string) {
  return (await db.select().from(users).where(eq(users.email, email)))[0]!;
}

async function myRequests(userId: number) {
  const cookie = (await startSession(userId)).split(";")[0]!;
  const view = (await myLoader(routeArgs(requestWithCookie("/my", cookie)))) as { requests: { id: number }[] };
  return view.requests.map((r) => r.id);
}

test("replaying an older set-password link: a newer link for the same account revokes it, and it sets no password", async () => {
  const email = "replay.older@example.test";
  await createTestLead(company, email);
  const older = await latestLink(email);
  await createTestLead(company, email);
  const newer = await latestLink(email);
  expect(newer.token).not.toBe(older.token);

  expect(statusOf(await setPassword(older.token, "older-link-password"))).toBe(410);
  expect((await accountOf(email)).passwordHash).toBeNull();
  expect(statusOf(await setPassword(newer.token, "newer-link-password"))).toBe(302);
  expect(await verifyPassword((await accountOf(email)).passwordHash!, "newer-link-password")).toBe(true);
});

test("using one set-password link twice at the same moment: one wins, the other changes nothing", async () => {
  const email = "double.use@example.test";
  await createTestLead(company, email);
  const { token } = await latestLink(email);
  const [first, second] = await Promise.all([
    setPassword(token, "first-racer-password"),
    setPassword(token, "second-racer-password"),
  ]);
  const statuses = [statusOf(first), statusOf(second)];
  expect(statuses.sort()).toEqual([302, 410]);
  const winner = statusOf(first) === 302 ? "first-racer-password" : "second-racer-password";
  const loser = winner === "first-racer-password" ? "second-racer-password" : "first-racer-password";
  const { passwordHash } = await accountOf(email);
  expect(await verifyPassword(passwordHash!, winner)).toBe(true);
  expect(await verifyPassword(passwordHash!, loser)).toBe(false);
});

test("reading tokens from access logs: the e-mailed link keeps its token in the fragment, which no request line carries", async () => {
  const email = "access.log@example.test";
  await createTestLead(company, email);
  const { link, token } = await latestLink(email);
  const url = new URL(link);
  // What a browser puts in the request line (and so in any access log or Referer): path and query.
  expect(`${url.pathname}${url.search}`).not.toContain(token);
  expect(url.hash).toBe(`#${token}`);
});

test("telling registered addresses apart: the request-sent page says the same for an address with an account and one without", async () => {
  const registered = "has.account@example.test";
  await db.insert(users).values({
    companyId: company.id,
    email: registered,
    name: "Wren Castellano",
    role: "homeowner",
    passwordHash: await hashPassword("an-existing-password"),
  });
  const withAccount = await createTestLead(company, registered);
  const withoutAccount = await createTestLead(company, "no.account.yet@example.test");
  const view = async (ref: string) => {
    const data = (await sentLoader(
      routeArgs(new Request(`http://localhost/c/${company.slug}/sent/${ref}`), { companySlug: company.slug, ref }),
    )) as Record<string, unknown>;
    return { ...data, ref: "(differs)" };
  };
  expect(await view(withAccount.ref)).toEqual(await view(withoutAccount.ref));
});

test("a request sent with a stranger's address stays out of their /my until they confirm it from that address's e-mail", async () => {
  const victim = "victim.homeowner@example.test";
  const [account] = await db
    .insert(users)
    .values({
      companyId: company.id,
      email: victim,
      name: "Vera Holloway",
      role: "homeowner",
      passwordHash: await hashPassword("vera-own-password"),
    })
    .returning();
  const planted = await createTestLead(company, victim);
  expect(await myRequests(account!.id)).not.toContain(planted.id);
  expect((await db.select().from(leads).where(eq(leads.id, planted.id)))[0]!.homeownerId).toBeNull();

  // The owner of the address confirms from the e-mail: the request joins their list, once.
  const { token } = await latestLink(victim);
  const check = (await postWelcome(token, { intent: "check" })) as { data: { person: { purpose: string } } };
  expect(check.data.person.purpose).toBe("confirm-request");
  expect(statusOf(await postWelcome(token, { intent: "confirm" }))).toBe(200);
  expect(await myRequests(account!.id)).toContain(planted.id);
  expect(statusOf(await postWelcome(token, { intent: "confirm" }))).toBe(410);
  // A confirm link never sets a password.
  expect(statusOf(await setPassword(token, "attacker-chosen-password"))).toBe(410);
  expect(await verifyPassword((await accountOf(victim)).passwordHash!, "vera-own-password")).toBe(true);
});

test("a new homeowner's requests join their account from the e-mail links: the newest sets the password, an older one still confirms its own request", async () => {
  const email = "two.requests@example.test";
  const first = await createTestLead(company, email);
  const olderLink = await latestLink(email);
  const second = await createTestLead(company, email);
  const newerLink = await latestLink(email);
  const account = await accountOf(email);
  expect(await myRequests(account.id)).toEqual([]);

  expect(statusOf(await setPassword(newerLink.token, "a-long-garden-password"))).toBe(302);
  expect(await myRequests(account.id)).toEqual([second.id]);
  // The older e-mail's link lost its power over the password but still vouches for its own request.
  const check = (await postWelcome(olderLink.token, { intent: "check" })) as { data: { person: { purpose: string } } };
  expect(check.data.person.purpose).toBe("confirm-request");
  expect(statusOf(await postWelcome(olderLink.token, { intent: "confirm" }))).toBe(200);
  expect((await myRequests(account.id)).sort()).toEqual([first.id, second.id].sort());
  const leftover = await db.select().from(emailOutbox).where(like(emailOutbox.toAddress, email));
  expect(leftover.length).toBe(2);
});
