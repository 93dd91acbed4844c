import { eq } from "drizzle-orm";
import { expect, test } from "vitest";
import { catalogItems } from "~/db/schema";
import { findCatalogItem, listCatalog, updateCatalogItem } from "~/lib/catalog/catalog.server";
import { db } from "~/lib/platform/db.server";
import { endAllSessions, requireUser } from "~/lib/auth/session.server";
import { createCompanyWithStaff, requestWithCookie } from "./support/fixtures";

const STAFF = ["owner", "estimator", "crew"] as const;

async function outcome(promise: Promise<unknown>): Promise<string> {
  try {
    await promise;
    return "allowed";
  } catch (thrown) {
    if (thrown instanceof Response) {
      return thrown.status === 302 ? `redirect ${thrown.headers.get("Location")}` : `status ${thrown.status}`;
    }
    throw thrown;
  }
}

test("an anonymous request for a staff page is sent to sign-in, with the way back", async () => {
  const result = await outcome(requireUser(requestWithCookie("/app/catalog?x=1"), { roles: STAFF }));
  expect(result).toBe("redirect /login?redirectTo=%2Fapp%2Fcatalog%3Fx%3D1");
});

test("a homeowner asking for a staff page is sent to sign-in, not shown a 403", async () => {
  const { people } = await createCompanyWithStaff();
  const result = await outcome(
    requireUser(requestWithCookie("/app/settings", people.homeowner.cookie), { roles: STAFF }),
  );
  expect(result).toMatch(/^redirect \/login/);
});

test("staff without the role get 403; the owner is allowed", async () => {
  const { people } = await createCompanyWithStaff();
  for (const role of ["estimator", "crew"] as const) {
    expect(
      await outcome(requireUser(requestWithCookie("/app/settings", people[role].cookie), { roles: ["owner"] })),
    ).toBe("status 403");
  }
  expect(
    await outcome(requireUser(requestWithCookie("/app/settings", people.owner.cookie), { roles: ["owner"] })),
  ).toBe("allowed");
});

test("a tampered cookie signature counts as signed out", async () => {
  const { people } = await createCompanyWithStaff();
  const tampered = people.owner.cookie.slice(0, -3) + "xyz";
  expect(await outcome(requireUser(requestWithCookie("/app", tampered), { roles: STAFF }))).toMatch(/^redirect/);
});

test("ending a user's sessions on the server locks out a cookie that is still in the browser", async () => {
  const { people } = await createCompanyWithStaff();
  await endAllSessions(people.estimator.id);
  expect(await outcome(requireUser(requestWithCookie("/app", people.estimator.cookie), { roles: STAFF }))).toMatch(
    /^redirect/,
  );
});

test("a query for another company's catalog item finds nothing, and an update changes nothing", async () => {
  const mine = await createCompanyWithStaff("Mine");
  const theirs = await createCompanyWithStaff("Theirs");
  expect(await findCatalogItem(mine.company.id, theirs.item.id)).toBeNull();
  expect((await listCatalog(mine.company.id)).map((i) => i.id)).not.toContain(theirs.item.id);
  const updated = await updateCatalogItem(mine.company.id, theirs.item.id, {
    kind: "wall-unit",
    name: "Hijacked",
    colourName: "",
    colourHex: "#000000",
    priceCents: 1,
    isActive: true,
    faceIn: 12,
    backIn: 8,
    depthIn: 8,
    heightIn: 4,
  });
  expect(updated).toBe(false);
  const [row] = await db.select().from(catalogItems).where(eq(catalogItems.id, theirs.item.id));
  expect(row?.name).toBe("Test Taper");
});
