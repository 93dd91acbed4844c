import { and, asc, eq, sql } from "drizzle-orm";
import { suppliers, type Supplier } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import type { SupplierInput } from "~/lib/suppliers/supplier-schema";

/** The company's suppliers by name. */
export function listSuppliers(companyId: number): Promise<Supplier[]> {
  return db.select().from(suppliers).where(eq(suppliers.companyId, companyId)).orderBy(asc(suppliers.name));
}

/** One supplier, only if it is the company's; null otherwise (callers answer 404 or name the field). */
export async function findSupplier(companyId: number, supplierId: number): Promise<Supplier | null> {
  const [row] = await db
    .select()
    .from(suppliers)
    .where(and(eq(suppliers.companyId, companyId), eq(suppliers.id, supplierId)))
    .limit(1);
  return row ?? null;
}

export type SaveSupplierResult =
  { ok: true; id: number } | { ok: false; status: 400 | 404; errors: Record<string, string> };

/**
 * Adds a supplier (id null) or changes one of the company's. Two suppliers of one company may not
 * share a name (the unique index decides under any race).
 */
export async function saveSupplier(
  companyId: number,
  supplierId: number | null,
  input: SupplierInput,
): Promise<SaveSupplierResult> {
  const [clash] = await db
    .select({ id: suppliers.id })
    .from(suppliers)
    .where(and(eq(suppliers.companyId, companyId), sql`lower(${suppliers.name}) = lower(${input.name})`))
    .limit(1);
  if (clash && clash.id !== supplierId)
    return { ok: false, status: 400, errors: { name: `You already have a supplier named “${input.name}”.` } };
  try {
    if (supplierId === null) {
      const [row] = await db
        .insert(suppliers)
        .values({ ...input, companyId })
        .returning({ id: suppliers.id });
      return { ok: true, id: row!.id };
    }
    const rows = await db
      .update(suppliers)
      .set({ ...input, updatedAt: new Date().toISOString() })
      .where(and(eq(suppliers.companyId, companyId), eq(suppliers.id, supplierId)))
      .returning({ id: suppliers.id });
    return rows.length === 1
      ? { ok: true, id: supplierId }
      : { ok: false, status: 404, errors: { form: "No such supplier." } };
  } catch (error) {
    if (String(error).includes("UNIQUE"))
      return { ok: false, status: 400, errors: { name: `You already have a supplier named “${input.name}”.` } };
    throw error;
  }
}
