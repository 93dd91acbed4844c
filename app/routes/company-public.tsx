import type { Route } from "./+types/company-public";
import { PublicShell } from "~/components/public-shell";
import { KIND_DIMENSIONS, KIND_INFO } from "~/lib/catalog-schema";
import { findCompanyBySlug, listCatalog } from "~/lib/catalog.server";
import { formatInches } from "~/domain/units";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.company.name ?? "Contractor"} · Fire pits` }];

export async function loader({ params }: Route.LoaderArgs) {
  const company = await findCompanyBySlug(params.companySlug);
  if (!company) throw new Response("Not found", { status: 404 });
  const items = await listCatalog(company.id, { activeOnly: true });
  return {
    company: { name: company.name, town: company.town, phone: company.phone },
    items: items
      .filter((i) => i.kind === "wall-unit" || i.kind === "cap")
      .map((i) => ({
        id: i.id,
        kind: i.kind,
        name: i.name,
        colourName: i.colourName,
        colourHex: i.colourHex,
        size: KIND_DIMENSIONS[i.kind].map((rule) => formatInches(i[rule.key] ?? 0).replace(/ in$/, "")).join(" × ") + " in",
      })),
  };
}

export default function CompanyPublicRoute({ loaderData }: Route.ComponentProps) {
  const { company, items } = loaderData;
  return (
    <PublicShell>
      <main className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
        <p className="text-sm font-extrabold tracking-widest text-ember-600 uppercase">{company.town}</p>
        <h1 className="mt-1 text-3xl font-extrabold">{company.name}</h1>
        <p className="mt-2 text-char-600">The stone we build round fire pits with.</p>
        <ul className="mt-8 grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
          {items.map((item) => (
            <li key={item.id} className="card flex items-center gap-4 p-4">
              <span className="h-12 w-12 shrink-0 rounded-lg border border-char-800/20" style={{ backgroundColor: item.colourHex }} aria-hidden="true" />
              <span>
                <span className="block font-extrabold">{item.name}</span>
                <span className="block text-sm text-char-600">
                  {KIND_INFO[item.kind].label} · {item.colourName} · {item.size}
                </span>
              </span>
            </li>
          ))}
        </ul>
      </main>
    </PublicShell>
  );
}
