import { findCompanyBySlug, listCatalog } from "~/lib/catalog.server";
import { seedDemo } from "../../../scripts/seed-demo";

let seeded: Promise<void> | null = null;

/** Seeds the demo scenario once per test file and returns the demo company and its catalog. */
export async function demoCompany(slug = "cinder-slate") {
  seeded ??= seedDemo();
  await seeded;
  const company = (await findCompanyBySlug(slug))!;
  const catalog = await listCatalog(company.id, { activeOnly: true });
  const byName = (name: string) => catalog.find((i) => i.name === name)!;
  return { company, catalog, byName };
}

/** Calls a route's loader or action the way React Router would, with just what our routes read. */
export function routeArgs(request: Request, params: Record<string, string> = {}) {
  return { request, params, context: {} as never, unstable_pattern: "" } as never;
}
