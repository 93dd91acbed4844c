import { randomUUID } from "node:crypto";
import { catalogItems, companies, users, type Role } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { startSession } from "~/lib/auth/session.server";

/** A company with one user per role, each with a live session cookie. */
export async function createCompanyWithStaff(name = "Test Masonry") {
  const slug = `t-${randomUUID().slice(0, 8)}`;
  const [company] = await db
    .insert(companies)
    .values({ slug, name, email: `office@${slug}.test` })
    .returning();
  const people = {} as Record<Role, { id: number; cookie: string }>;
  for (const role of ["owner", "estimator", "crew", "homeowner"] as const) {
    const [user] = await db
      .insert(users)
      .values({ companyId: company!.id, email: `${role}@${slug}.test`, name: `${role} of ${name}`, role })
      .returning();
    const setCookie = await startSession(user!.id);
    people[role] = { id: user!.id, cookie: setCookie.split(";")[0]! };
  }
  const [item] = await db
    .insert(catalogItems)
    .values({
      companyId: company!.id,
      kind: "wall-unit",
      name: "Test Taper",
      faceIn: 12,
      backIn: 8,
      depthIn: 8,
      heightIn: 4,
      priceCents: 500,
    })
    .returning();
  return { company: company!, people, item: item! };
}

export function requestWithCookie(url: string, cookie?: string, init: RequestInit = {}): Request {
  const headers = new Headers(init.headers);
  if (cookie) headers.set("Cookie", cookie);
  return new Request(new URL(url, "http://localhost"), { ...init, headers });
}
