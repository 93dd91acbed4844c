import { Link } from "react-router";
import type { Route } from "./+types/app-catalog";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { CATALOG_KINDS, STAFF_ROLES } from "~/db/enums";
import { describeSizes, KIND_INFO, perUnit, sizesText } from "~/lib/catalog/catalog-kinds";
import { listCatalog } from "~/lib/catalog/catalog.server";
import { formatMoney } from "~/lib/format/money";
import { requireUser } from "~/lib/auth/session.server";
import { formatInches } from "~/domain/units";

export const meta: Route.MetaFunction = () => [{ title: "Catalog · Emberwright" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: STAFF_ROLES });
  const items = await listCatalog(user.companyId);
  // Crew build from the catalog's sizes; what the company pays is not theirs to see,
  // so the cost leaves the server only for the office (in the page and in its .data alike).
  const canSeeMoney = user.role !== "crew";
  const shown = items.map(({ priceCents, ...item }) => ({
    ...item,
    sizes: describeSizes(item.kind, item, formatInches),
    price: canSeeMoney ? `${formatMoney(priceCents)} ${perUnit(KIND_INFO[item.kind].priceUnit)}` : null,
  }));
  // After a save the list says what was stored, in the words the list uses (the sizes as read back).
  const url = new URL(request.url);
  const savedItem = shown.find((item) => String(item.id) === url.searchParams.get("saved"));
  const saved = savedItem
    ? `${url.searchParams.get("added") ? "Added" : "Saved"} ${savedItem.name}${savedItem.sizes.length ? `: ${sizesText(savedItem.sizes)}` : ""}${savedItem.price ? `, cost ${savedItem.price}` : ""}.`
    : null;
  return { items: shown, saved, canEdit: user.role === "owner", canSeeMoney };
}

/** Each size with its name; a line may break between words, never inside a measurement ("7 1/2 in"). */
function Sizes({ sizes }: { sizes: { name: string; value: string }[] }) {
  if (!sizes.length) return <>—</>;
  return (
    <>
      {sizes.map((size, i) => (
        <span key={size.name}>
          {size.name} <span className="whitespace-nowrap">{size.value}</span>
          {i < sizes.length - 1 ? " · " : null}
        </span>
      ))}
    </>
  );
}

function StatusBadge({ isActive }: { isActive: boolean }) {
  return isActive ? (
    <span className="rounded-full bg-moss-100 px-2 py-0.5 text-xs font-bold text-moss-700">Offered</span>
  ) : (
    <span className="rounded-full bg-ash-200 px-2 py-0.5 text-xs font-bold text-char-600">Hidden</span>
  );
}

export default function CatalogRoute({ loaderData }: Route.ComponentProps) {
  const { items, canEdit, canSeeMoney, saved } = loaderData;
  const groups = CATALOG_KINDS.map((kind) => ({ kind, items: items.filter((i) => i.kind === kind) })).filter(
    (g) => g.items.length,
  );
  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-2xl font-extrabold">Catalog</h1>
          <p className="text-char-600">
            The units and supplies your configurator offers and your estimates price. Sizes in inches
            {canEdit ? "" : "; only the owner can change them"}. Costs are what you pay your supplier.
          </p>
        </div>
        {canEdit ? (
          <div className="flex flex-wrap gap-3">
            <Link to="/app/suppliers" className="btn-quiet">
              Suppliers
            </Link>
            <Link to="/app/catalog/new" className="btn-primary">
              Add an item
            </Link>
          </div>
        ) : null}
      </div>
      {saved ? (
        <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
          {saved}
        </p>
      ) : null}
      {groups.length === 0 ? <p className="card p-6 text-char-600">No items yet.</p> : null}
      {groups.map((group) => (
        <section key={group.kind} aria-labelledby={`kind-${group.kind}`} className="overflow-hidden card">
          <h2
            id={`kind-${group.kind}`}
            className="border-b border-ash-200 bg-ash-100 px-4 py-2 text-sm font-extrabold tracking-wide text-char-700 uppercase"
          >
            {KIND_INFO[group.kind].plural}
          </h2>
          {/* A wide table scrolls on a phone; the scroller takes focus so keyboards can scroll it too. */}
          <div
            className="overflow-x-auto"
            tabIndex={0}
            role="region"
            aria-label={`${KIND_INFO[group.kind].plural} table`}
          >
            <table className="w-full text-left text-sm sm:min-w-[36rem]">
              <thead className="text-xs text-char-500 uppercase">
                <tr>
                  <th scope="col" className="px-4 py-2 font-bold">
                    Name
                  </th>
                  <th scope="col" className="hidden px-4 py-2 font-bold sm:table-cell">
                    Colour
                  </th>
                  <th scope="col" className="px-4 py-2 font-bold">
                    Size
                  </th>
                  {canSeeMoney ? (
                    <th scope="col" className="px-4 py-2 text-right font-bold">
                      Cost
                    </th>
                  ) : null}
                  <th scope="col" className="hidden px-4 py-2 font-bold sm:table-cell">
                    Status
                  </th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ash-200">
                {group.items.map((item) => (
                  <tr key={item.id} className={item.isActive ? "" : "text-char-500"}>
                    <td className="px-4 py-2.5 font-bold">
                      {canEdit ? (
                        <Link
                          to={`/app/catalog/${item.id}`}
                          className="text-ember-700 underline-offset-2 hover:underline"
                        >
                          {item.name}
                        </Link>
                      ) : (
                        item.name
                      )}
                      {/* On a phone the status rides under the name, so the sizes get the width. */}
                      <span className="mt-1 block sm:hidden">
                        <StatusBadge isActive={item.isActive} />
                      </span>
                    </td>
                    <td className="hidden px-4 py-2.5 sm:table-cell">
                      <span className="inline-flex items-center gap-2">
                        <span
                          className="h-4 w-4 rounded border border-char-800/20"
                          style={{ backgroundColor: item.colourHex }}
                          aria-hidden="true"
                        />
                        {item.colourName || "—"}
                      </span>
                    </td>
                    <td className="px-4 py-2.5 tabular-nums">
                      <Sizes sizes={item.sizes} />
                    </td>
                    {item.price !== null ? <td className="px-4 py-2.5 text-right tabular-nums">{item.price}</td> : null}
                    <td className="hidden px-4 py-2.5 sm:table-cell">
                      <StatusBadge isActive={item.isActive} />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </section>
      ))}
    </div>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
