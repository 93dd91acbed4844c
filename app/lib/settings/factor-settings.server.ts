import { eq } from "drizzle-orm";
import { companies, type Company } from "~/db/schema";
import { DEFAULT_FACTORS, type CompanyFactors } from "~/domain/factors";
import { forgetOfferedCatalogs } from "~/lib/catalog/catalog.server";
import { db } from "~/lib/platform/db.server";
import { COLUMN_FACTORS, FACTOR_ROWS } from "~/lib/settings/factor-settings";

/**
 * Saves a company's factors in one update: the older settings to their columns, every other factor
 * to factorsJson only where it differs from the default, so a later change of a default reaches
 * every company that never changed that factor. Cached catalogs (which carry the company) are dropped.
 */
export async function saveCompanyFactors(companyId: number, values: CompanyFactors): Promise<void> {
  const columns: Partial<Pick<Company, (typeof COLUMN_FACTORS)[keyof typeof COLUMN_FACTORS]>> = {};
  const overrides: Record<string, number | string> = {};
  for (const row of FACTOR_ROWS) {
    const value = values[row.key];
    const column = (COLUMN_FACTORS as Record<string, keyof typeof columns>)[row.key];
    if (column) columns[column] = value as number;
    else if (value !== DEFAULT_FACTORS[row.key]) overrides[row.key] = value;
  }
  await db
    .update(companies)
    .set({ ...columns, factorsJson: JSON.stringify(overrides) })
    .where(eq(companies.id, companyId));
  forgetOfferedCatalogs();
}
