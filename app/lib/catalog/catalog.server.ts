import { and, asc, eq, sql } from "drizzle-orm";
import { catalogItems, companies, type CatalogItem, type Company } from "~/db/schema";
import type { CatalogItemInput } from "~/lib/catalog/catalog-schema";
import { db } from "~/lib/platform/db.server";

/** A company by its public slug, or null. */
export async function findCompanyBySlug(slug: string): Promise<Company | null> {
  const [row] = await db.select().from(companies).where(eq(companies.slug, slug)).limit(1);
  return row ?? null;
}

/** A company id that names no company: only a broken reference (a session, a lead) can carry one. */
export class CompanyMissingError extends Error {
  constructor(readonly companyId: number) {
    super(`Company ${companyId} does not exist.`);
  }
}

/**
 * The company behind an id the server already trusts (the signed-in user's, a lead's). Its absence is
 * a broken reference, not a visitor's mistake, so it throws CompanyMissingError (a 500) rather than
 * answering 404; look a company up by what a visitor typed with findCompanyBySlug.
 */
export async function getCompany(companyId: number): Promise<Company> {
  const [row] = await db.select().from(companies).where(eq(companies.id, companyId)).limit(1);
  if (!row) throw new CompanyMissingError(companyId);
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

// The plan API needs a company (settings, factors) and its offered stock on every request. Each
// process keeps both in memory and, per request, reads only the company's cache_version (one
// indexed column: a tenth of the cost of the whole row). Triggers raise that version on every
// change to the company row or its catalog items, whoever makes it, so an edit made through any
// process (or a script) is used by every process's next plan: no time window.
const MAX_CACHED_COMPANIES = 1_000;
type Offered = { company: Company; catalog: CatalogItem[] };
const offeredCache = new Map<number, { version: number; value: Promise<Offered> }>();
const versionBySlug = db
  .select({ id: companies.id, version: companies.cacheVersion })
  .from(companies)
  .where(eq(companies.slug, sql.placeholder("slug")))
  .limit(1)
  .prepare();

/**
 * A company by slug with its active catalog, as stored now (kept in memory while unchanged); null for no such company.
 */
export async function loadOfferedCatalog(slug: string): Promise<Offered | null> {
  const head = await versionBySlug.get({ slug });
  if (!head) return null;
  const hit = offeredCache.get(head.id);
  if (hit && hit.version === head.version) return hit.value;
  // Read after the version, so what is kept under it is never older than it.
  const value = (async () => ({
    company: await getCompany(head.id),
    catalog: await listCatalog(head.id, { activeOnly: true }),
  }))();
  if (offeredCache.size >= MAX_CACHED_COMPANIES) offeredCache.clear();
  offeredCache.set(head.id, { version: head.version, value });
  value.catch(() => {
    if (offeredCache.get(head.id)?.value === value) offeredCache.delete(head.id);
  });
  return value;
}

/**
 * Forgets cached companies and catalogs. Not needed for correctness (the version check sees every change); frees
 * memory.
 */
export function forgetOfferedCatalogs(): void {
  offeredCache.clear();
}

export async function createCatalogItem(companyId: number, input: CatalogItemInput): Promise<number> {
  const [row] = await db
    .insert(catalogItems)
    .values({ ...input, companyId })
    .returning({ id: catalogItems.id });
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
