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

// The plan API reads a company and its offered stock on every request. The company row (settings,
// factors, catalog_version) is read fresh each time: one row by its unique slug. The catalog is kept
// in memory per company and used while the stored catalog_version still matches it; triggers raise
// that version on every change to catalog_items, so an edit made through any process (or a script)
// shows in every process's next plan, with no time window.
const MAX_CACHED_COMPANIES = 1_000;
const catalogCache = new Map<number, { version: number; catalog: Promise<CatalogItem[]> }>();

/** A company by slug (always fresh) with its active catalog (kept while unchanged); null for no such company. */
export async function loadOfferedCatalog(slug: string): Promise<{ company: Company; catalog: CatalogItem[] } | null> {
  const company = await findCompanyBySlug(slug);
  if (!company) return null;
  const hit = catalogCache.get(company.id);
  if (hit && hit.version === company.catalogVersion) return { company, catalog: await hit.catalog };
  // Read after the version, so what is cached under it is never older than it. (A query builder runs
  // again on every `then`: wrap it in a real promise so the cache holds one result.)
  const catalog = (async () => listCatalog(company.id, { activeOnly: true }))();
  if (catalogCache.size >= MAX_CACHED_COMPANIES) catalogCache.clear();
  catalogCache.set(company.id, { version: company.catalogVersion, catalog });
  catalog.catch(() => {
    if (catalogCache.get(company.id)?.catalog === catalog) catalogCache.delete(company.id);
  });
  return { company, catalog: await catalog };
}

/** Forgets cached catalogs. Not needed for correctness (the version check sees every change); frees memory. */
export function forgetOfferedCatalogs(): void {
  catalogCache.clear();
}

export async function createCatalogItem(companyId: number, input: CatalogItemInput): Promise<number> {
  const [row] = await db.insert(catalogItems).values({ ...input, companyId }).returning({ id: catalogItems.id });
  return row!.id;
}

/** Updates an item scoped to the company; false when it is not theirs. */
export async function updateCatalogItem(companyId: number, itemId: number, input: CatalogItemInput): Promise<boolean> {
  const rows = await db
    .update(catalogItems)
    .set({ ...input, updatedAt: new Date().toISOString() })
    .where(and(eq(catalogItems.companyId, companyId), eq(catalogItems.id, itemId)))
    .returning({ id: catalogItems.id });
  return rows.length === 1;
}
