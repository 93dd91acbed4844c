import { and, asc, eq } from "drizzle-orm";
import { catalogItems, companies, type CatalogItem, type Company } from "~/db/schema";
import type { CatalogItemInput } from "~/lib/catalog-schema";
import { db } from "~/lib/db.server";

/** A company by its public slug, or null. */
export async function findCompanyBySlug(slug: string): Promise<Company | null> {
  const [row] = await db.select().from(companies).where(eq(companies.slug, slug)).limit(1);
  return row ?? null;
}

export async function getCompany(companyId: number): Promise<Company> {
  const [row] = await db.select().from(companies).where(eq(companies.id, companyId)).limit(1);
  if (!row) throw new Response("Company not found", { status: 404 });
  return row;
}

/** Every catalog item of one company, grouped order (kind, name). */
export function listCatalog(companyId: number, options: { activeOnly?: boolean } = {}): Promise<CatalogItem[]> {
  const where = options.activeOnly
    ? and(eq(catalogItems.companyId, companyId), eq(catalogItems.isActive, true))
    : eq(catalogItems.companyId, companyId);
  return db.select().from(catalogItems).where(where).orderBy(asc(catalogItems.kind), asc(catalogItems.name));
}

/** One item, only if it belongs to the company; null otherwise (callers answer 404). */
export async function findCatalogItem(companyId: number, itemId: number): Promise<CatalogItem | null> {
  const [row] = await db
    .select()
    .from(catalogItems)
    .where(and(eq(catalogItems.companyId, companyId), eq(catalogItems.id, itemId)))
    .limit(1);
  return row ?? null;
}

// The plan API reads a company and its offered stock on every request; both change rarely. Each
// process keeps them a few seconds, and writes through this module (or settings) drop them at once.
const CATALOG_CACHE_MS = 5_000;
const offeredCache = new Map<string, { at: number; value: Promise<{ company: Company; catalog: CatalogItem[] } | null> }>();

/** A company by slug with its active catalog, cached briefly in this process; null for no such company. */
export function loadOfferedCatalog(slug: string): Promise<{ company: Company; catalog: CatalogItem[] } | null> {
  const hit = offeredCache.get(slug);
  if (hit && Date.now() - hit.at < CATALOG_CACHE_MS) return hit.value;
  const value = (async () => {
    const company = await findCompanyBySlug(slug);
    return company ? { company, catalog: await listCatalog(company.id, { activeOnly: true }) } : null;
  })();
  offeredCache.set(slug, { at: Date.now(), value });
  value.catch(() => offeredCache.delete(slug));
  return value;
}

/** Forgets cached catalogs (after a catalog or company settings change). */
export function forgetOfferedCatalogs(): void {
  offeredCache.clear();
}

export async function createCatalogItem(companyId: number, input: CatalogItemInput): Promise<number> {
  const [row] = await db.insert(catalogItems).values({ ...input, companyId }).returning({ id: catalogItems.id });
  forgetOfferedCatalogs();
  return row!.id;
}

/** Updates an item scoped to the company; false when it is not theirs. */
export async function updateCatalogItem(companyId: number, itemId: number, input: CatalogItemInput): Promise<boolean> {
  const rows = await db
    .update(catalogItems)
    .set({ ...input, updatedAt: new Date().toISOString() })
    .where(and(eq(catalogItems.companyId, companyId), eq(catalogItems.id, itemId)))
    .returning({ id: catalogItems.id });
  forgetOfferedCatalogs();
  return rows.length === 1;
}
