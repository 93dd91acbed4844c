import { RouterContextProvider } from "react-router";
import { findCompanyBySlug, listCatalog } from "~/lib/catalog/catalog.server";
import { socketAddressContext } from "~/lib/platform/rate-limit.server";
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

/**
 * Calls a route's loader or action the way React Router would, with just what our routes read. The
 * context says the request came from a local proxy (127.0.0.1), which the test settings trust
 * (TRUST_PROXY=loopback), so a test's X-Forwarded-For picks its client address.
 */
export function routeArgs(request: Request, params: Record<string, string> = {}, socketAddress = "127.0.0.1") {
  const context = new RouterContextProvider();
  context.set(socketAddressContext, socketAddress);
  return { request, params, context, unstable_pattern: "" } as never;
}
