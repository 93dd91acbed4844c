import type { Route } from "./+types/catalog";
import { KIND_DIMENSIONS, KIND_INFO } from "~/lib/catalog/catalog-kinds";
import { findCompanyBySlug, listCatalog } from "~/lib/catalog/catalog.server";

// Public: what a homeowner may choose from. Dimensions, names and colours only; no prices.
export async function loader({ params }: Route.LoaderArgs) {
  const company = await findCompanyBySlug(params.companySlug);
  if (!company) {
    return Response.json(
      { errors: [{ path: "companySlug", message: "No contractor has that address." }] },
      { status: 404 },
    );
  }
  const items = await listCatalog(company.id, { activeOnly: true });
  return Response.json(
    {
      company: { slug: company.slug, name: company.name, town: company.town },
      items: items.map((item) => ({
        id: item.id,
        kind: item.kind,
        kindLabel: KIND_INFO[item.kind].label,
        name: item.name,
        colourName: item.colourName,
        colourHex: item.colourHex,
        ...Object.fromEntries(KIND_DIMENSIONS[item.kind].map((rule) => [rule.key, item[rule.key]])),
      })),
    },
    { headers: { "Cache-Control": "public, max-age=60" } },
  );
}
