/*
 * The owner's team page. Sources: OWASP ASVS 4.0.3 V3.3.1/V3.3.4 (ending a session must take effect
 * on the server at once, so deactivation deletes every session row), V2.5 (one-time links stored
 * only as hashes), V4.2.1 (another company's people are out of reach). The rule that an owner
 * cannot demote or deactivate themself is the product's own (common practice, no source).
 */
import { count, eq } from "drizzle-orm";
import { beforeAll, expect, test } from "vitest";
import { emailOutbox, oneTimeTokens, sessions, users } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { hashToken } from "~/lib/auth/tokens.server";
import { action as teamAction, loader as teamLoader } from "~/routes/app-team";
import { loader as inboxLoader } from "~/routes/app-inbox";
import { action as loginAction } from "~/routes/login";
import { action as welcomeAction } from "~/routes/welcome";
import { demoCompany, routeArgs } from "./support/demo";
import { createCompanyWithStaff, requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";

let companyId = 0;
let ownerCookie = "";
let ownerId = 0;

beforeAll(async () => {
  const { company } = await demoCompany();
  companyId = company.id;
  ownerCookie = await loginAs(companyId, "owner");
  ownerId = (await db.select().from(users).where(eq(users.email, "owner@cinder-slate.test")))[0]!.id;
});

type Answer = { status: number; location: string | null; errors: Record<string, string> };

async function post(fields: Record<string, string>, cookie = ownerCookie): Promise<Answer> {
  const request = requestWithCookie("/app/team", cookie, { method: "POST", body: new URLSearchParams(fields) });
  const result = (await teamAction(routeArgs(request))) as
    Response | { data: { errors: Record<string, string> }; init: { status: number } };
  if (result instanceof Response)
    return { status: result.status, location: result.headers.get("Location"), errors: {} };
  return { status: result.init.status, location: null, errors: result.data.errors };
}

const userByEmail = async (email: string) => (await db.select().from(users).where(eq(users.email, email)))[0];
const tableSize = async (table: typeof users | typeof oneTimeTokens | typeof emailOutbox) =>
  (await db.select({ n: count() }).from(table))[0]!.n;

test("an invitation creates the account without a password, a one-time invite link and the e-mail carrying it; the link sets a password and opens the workspace", async () => {
  const answer = await post({
    intent: "invite",
    name: "Noor Aldana",
    email: "Noor.Aldana@cinder-slate.test",
    role: "estimator",
  });
  expect(answer).toEqual({ status: 302, location: "/app/team?saved=invite", errors: {} });
  const noor = (await userByEmail("noor.aldana@cinder-slate.test"))!;
  expect(noor).toMatchObject({ companyId, role: "estimator", passwordHash: null, isActive: true, name: "Noor Aldana" });
  const [token] = await db.select().from(oneTimeTokens).where(eq(oneTimeTokens.userId, noor.id));
  expect(token!.purpose).toBe("invite");
  const [mail] = await db.select().from(emailOutbox).where(eq(emailOutbox.toAddress, "noor.aldana@cinder-slate.test"));
  expect(mail!.subject).toBe("Maren Okafor invited you to Cinder & Slate Outdoor Works on Emberwright");
  const link = /http:\/\/localhost\/welcome#([\w-]{43})/.exec(mail!.text)!;
  expect(link).not.toBeNull();
  // Only the token's SHA-256 is kept.
  expect(hashToken(link[1]!)).toBe(token!.tokenHash);

  const welcome = (await welcomeAction(
    routeArgs(
      new Request("http://localhost/welcome", {
        method: "POST",
        body: new URLSearchParams({
          intent: "set",
          token: link[1]!,
          password: "a-long-new-password",
          confirm: "a-long-new-password",
        }),
      }),
    ),
  )) as Response;
  expect(welcome.status).toBe(302);
  expect(welcome.headers.get("Location")).toBe("/app");
  expect((await userByEmail("noor.aldana@cinder-slate.test"))!.passwordHash).not.toBeNull();
});

test("a bad invitation is refused with 400 naming each field, and nothing is created", async () => {
  const before = await Promise.all([tableSize(users), tableSize(oneTimeTokens), tableSize(emailOutbox)]);
  const bad = await post({ intent: "invite", name: "N", email: "not-an-address", role: "homeowner" });
  expect(bad.status).toBe(400);
  expect(bad.errors).toEqual({
    name: "Name must be 2 to 80 characters.",
    email: "Enter an e-mail address like someone@example.com.",
    role: "Role must be owner, estimator or crew.",
  });
  const taken = await post({ intent: "invite", name: "Someone Else", email: "crew@cinder-slate.test", role: "crew" });
  expect(taken).toMatchObject({ status: 400, errors: { email: "That person is already on your team." } });
  expect(await Promise.all([tableSize(users), tableSize(oneTimeTokens), tableSize(emailOutbox)])).toEqual(before);
});

test("account probing through invitations: an address with an account at another company or as a homeowner gets the same answer as a new one, and only its owner hears why", async () => {
  const fresh = await post({
    intent: "invite",
    name: "Fresh Person",
    email: "fresh.person@example.test",
    role: "crew",
  });
  const otherCompany = await post({
    intent: "invite",
    name: "Probe One",
    email: "owner@north-ridge.test",
    role: "crew",
  });
  const homeowner = await createStaff("probe.homeowner@example.test", "estimator");
  await db.update(users).set({ role: "homeowner" }).where(eq(users.id, homeowner.id));
  const asHomeowner = await post({
    intent: "invite",
    name: "Probe Two",
    email: "probe.homeowner@example.test",
    role: "crew",
  });
  expect(otherCompany).toEqual(fresh);
  expect(asHomeowner).toEqual(fresh);
  // Nothing changed on the existing accounts: no second account, no link for them.
  const northOwner = await userByEmail("owner@north-ridge.test");
  expect(northOwner!.role).toBe("owner");
  expect(await db.select().from(oneTimeTokens).where(eq(oneTimeTokens.userId, northOwner!.id))).toEqual([]);
  const [notice] = await db.select().from(emailOutbox).where(eq(emailOutbox.toAddress, "owner@north-ridge.test"));
  expect(notice!.subject).toBe("Maren Okafor tried to add you to Cinder & Slate Outdoor Works on Emberwright");
  expect(notice!.text).toContain("already belongs to another Emberwright account");
  expect(notice!.text).not.toContain("/welcome");
});

test("the owner changes a role, and it applies to that person's next request", async () => {
  const person = await createStaff("role.change@cinder-slate.test", "estimator");
  const cookie = await loginAs(companyId, "estimator");
  expect(await post({ intent: "role", userId: String(person.id), role: "crew" })).toMatchObject({
    status: 302,
    location: "/app/team?saved=role",
  });
  expect((await userByEmail("role.change@cinder-slate.test"))!.role).toBe("crew");
  expect((await post({ intent: "role", userId: String(person.id), role: "crew" })).errors.role).toBe(
    "Role Change is already crew.",
  );
  expect((await post({ intent: "role", userId: String(person.id), role: "boss" })).errors.role).toBe(
    "Role must be owner, estimator or crew.",
  );
  // The demo estimator still works the inbox; the changed person's own session now meets 403 there.
  expect(await inboxLoader(routeArgs(requestWithCookie("/app/inbox", cookie)))).toBeTruthy();
  await expect(inboxLoader(routeArgs(requestWithCookie("/app/inbox", person.cookie)))).rejects.toMatchObject({
    status: 403,
  });
});

test("owners cannot demote or deactivate themselves", async () => {
  expect((await post({ intent: "role", userId: String(ownerId), role: "estimator" })).errors.role).toBe(
    "You cannot change your own role. Ask another owner.",
  );
  expect((await post({ intent: "deactivate", userId: String(ownerId) })).errors.userId).toBe(
    "You cannot deactivate yourself.",
  );
  expect((await userByEmail("owner@cinder-slate.test"))!).toMatchObject({ role: "owner", isActive: true });
});

test("a deactivated person is signed out everywhere at once and cannot sign in; reactivated, they can again", async () => {
  const estimator = (await userByEmail("estimator@cinder-slate.test"))!;
  const cookie = await loginAs(companyId, "estimator");
  expect(await post({ intent: "deactivate", userId: String(estimator.id) })).toMatchObject({
    status: 302,
    location: "/app/team?saved=deactivate",
  });
  expect(await db.select().from(sessions).where(eq(sessions.userId, estimator.id))).toEqual([]);
  await expect(inboxLoader(routeArgs(requestWithCookie("/app/inbox", cookie)))).rejects.toMatchObject({ status: 302 });

  const signIn = () =>
    loginAction(
      routeArgs(
        new Request("http://localhost/login", {
          method: "POST",
          headers: { "X-Forwarded-For": "10.77.0.1" },
          body: new URLSearchParams({ email: "estimator@cinder-slate.test", password: "ember-demo-2026" }),
        }),
      ),
    ) as Promise<Response | { init: { status: number } }>;
  const refused = await signIn();
  expect(refused instanceof Response ? refused.status : refused.init.status).toBe(401);
  expect((await post({ intent: "deactivate", userId: String(estimator.id) })).errors.userId).toBe(
    "Theo Brandvold is already deactivated.",
  );

  expect(await post({ intent: "reactivate", userId: String(estimator.id) })).toMatchObject({
    status: 302,
    location: "/app/team?saved=reactivate",
  });
  const allowed = await signIn();
  expect(allowed).toBeInstanceOf(Response);
  expect((allowed as Response).status).toBe(302);
});

test("the owner cannot touch another company's staff: 404, and nothing changes", async () => {
  const other = await createCompanyWithStaff("Far Away Stoneworks");
  const answer = await post({ intent: "deactivate", userId: String(other.people.estimator.id) });
  expect(answer.status).toBe(404);
  const [row] = await db.select().from(users).where(eq(users.id, other.people.estimator.id));
  expect(row!.isActive).toBe(true);
  expect((await post({ intent: "role", userId: String(other.people.crew.id), role: "owner" })).status).toBe(404);
});

test("the team list shows the company's staff only, never its customers", async () => {
  const { team } = (await teamLoader(routeArgs(requestWithCookie("/app/team", ownerCookie)))) as {
    team: { email: string; role: string }[];
  };
  expect(team.map((m) => m.email)).toEqual(
    expect.arrayContaining(["owner@cinder-slate.test", "estimator@cinder-slate.test", "crew@cinder-slate.test"]),
  );
  expect(team.every((m) => m.role !== "homeowner")).toBe(true);
  expect(team.some((m) => m.email.endsWith("@north-ridge.test"))).toBe(false);
});

async function createStaff(email: string, role: "estimator" | "crew") {
  const [row] = await db.insert(users).values({ companyId, email, name: "Role Change", role }).returning();
  const { startSession } = await import("~/lib/auth/session.server");
  return { id: row!.id, cookie: (await startSession(row!.id)).split(";")[0]! };
}
