import { and, eq } from "drizzle-orm";
import { catalogItems, companies, users } from "~/db/schema";
import { db } from "~/lib/db.server";
import { hashPassword } from "~/lib/password.server";
import { DEMO_COMPANIES, DEMO_PASSWORD } from "./seed-data";

/** Fills DATABASE_URL with the demo scenario; running it twice changes nothing. */
export async function seedDemo() {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  for (const { staff, catalog, ...company } of DEMO_COMPANIES) {
    await db.insert(companies).values(company).onConflictDoNothing({ target: companies.slug });
    const [row] = await db.select({ id: companies.id }).from(companies).where(eq(companies.slug, company.slug));
    const companyId = row!.id;
    for (const person of staff) {
      await db
        .insert(users)
        .values({ ...person, companyId, passwordHash })
        .onConflictDoNothing({ target: users.email });
    }
    for (const item of catalog) {
      const [existing] = await db
        .select({ id: catalogItems.id })
        .from(catalogItems)
        .where(and(eq(catalogItems.companyId, companyId), eq(catalogItems.name, item.name)));
      if (!existing) await db.insert(catalogItems).values({ ...item, companyId });
    }
  }
}
