import { useState } from "react";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/app-catalog-item";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { TextField, SelectField, FormAlert } from "~/components/ui/field";
import { CATALOG_KINDS, isOneOf, ORDER_UNITS, type CatalogKind, type OrderUnit } from "~/db/enums";
import { KIND_DIMENSIONS, KIND_INFO, perUnit } from "~/lib/catalog/catalog-kinds";
import { parseCatalogForm } from "~/lib/catalog/catalog-schema";
import { createCatalogItem, findCatalogItem, updateCatalogItem } from "~/lib/catalog/catalog.server";
import { ORDER_UNIT_LABEL } from "~/lib/suppliers/order-units";
import { requireUser } from "~/lib/auth/session.server";
import { findSupplier, listSuppliers } from "~/lib/suppliers/suppliers.server";
import { formatLengthInput, LENGTH_EXAMPLES } from "~/domain/units";
import { readForm } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: `${loaderData?.item ? loaderData.item.name : "New item"} · Catalog · Emberwright` },
];

/** Parses the :itemId param; anything but a positive integer is a 404. */
function parseItemId(raw: string | undefined): number | null {
  if (raw === undefined) return null;
  const id = Number(raw);
  if (!Number.isSafeInteger(id) || id <= 0) throw new Response("Not found", { status: 404 });
  return id;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const itemId = parseItemId(params.itemId);
  const suppliers = (await listSuppliers(user.companyId)).map((s) => ({ id: s.id, name: s.name }));
  if (itemId === null) return { item: null, suppliers };
  const item = await findCatalogItem(user.companyId, itemId);
  if (!item) throw new Response("Not found", { status: 404 });
  return { item, suppliers };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const itemId = parseItemId(params.itemId);
  const form = await readForm(request);
  const parsed = parseCatalogForm(form);
  if (!parsed.ok) {
    return data({ errors: parsed.errors }, { status: 400 });
  }
  // Another company's supplier is as good as none: named beside its field, nothing saved.
  if (parsed.value.supplierId != null && !(await findSupplier(user.companyId, parsed.value.supplierId))) {
    return data(
      { errors: { supplierId: "Choose a supplier from the list." } as Record<string, string> },
      { status: 400 },
    );
  }
  if (itemId === null) {
    const newId = await createCatalogItem(user.companyId, parsed.value);
    return redirect(`/app/catalog?saved=${newId}&added=1`);
  }
  if (!(await updateCatalogItem(user.companyId, itemId, parsed.value))) {
    throw new Response("Not found", { status: 404 });
  }
  return redirect(`/app/catalog?saved=${itemId}`);
}

export default function CatalogItemRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { item, suppliers } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  const [kind, setKind] = useState<CatalogKind>(item?.kind ?? "wall-unit");
  const navigation = useNavigation();
  const [orderUnit, setOrderUnit] = useState<OrderUnit>(item?.orderUnit ?? "each");
  const dims = KIND_DIMENSIONS[kind];
  const per = ORDER_UNIT_LABEL[orderUnit].per;
  return (
    <div className="mx-auto flex max-w-2xl flex-col gap-6">
      <div>
        <Link to="/app/catalog" className="text-sm font-bold text-ember-700 hover:underline">
          ← Catalog
        </Link>
        <h1 className="mt-2 text-2xl font-extrabold">{item ? `Edit ${item.name}` : "Add a catalog item"}</h1>
      </div>
      <Form method="post" className="flex flex-col gap-5 card p-6" noValidate>
        {Object.keys(errors).length ? <FormAlert>Nothing was saved. Fix the fields marked below.</FormAlert> : null}
        <SelectField
          label="Kind"
          name="kind"
          value={kind}
          onChange={(e) => {
            const chosen = e.target.value;
            if (isOneOf(CATALOG_KINDS, chosen)) setKind(chosen);
          }}
          error={errors.kind}
        >
          {CATALOG_KINDS.map((k) => (
            <option key={k} value={k}>
              {KIND_INFO[k].label}
            </option>
          ))}
        </SelectField>
        <TextField
          label="Name"
          name="name"
          defaultValue={item?.name ?? ""}
          error={errors.name}
          maxLength={80}
          required
        />
        <div className="grid gap-4 sm:grid-cols-[1fr_10rem]">
          <TextField
            label="Colour name"
            name="colourName"
            defaultValue={item?.colourName ?? ""}
            error={errors.colourName}
          />
          <TextField
            label="Colour"
            name="colourHex"
            type="color"
            defaultValue={item?.colourHex ?? "#8a8178"}
            error={errors.colourHex}
            className="[&_input]:h-10 [&_input]:p-1"
          />
        </div>
        {dims.length ? (
          <fieldset className="grid gap-4 sm:grid-cols-2">
            <legend className="mb-2 text-sm font-extrabold text-char-700">
              Size in inches: type it as you read it, like {LENGTH_EXAMPLES}
            </legend>
            {dims.map((rule) => (
              <TextField
                key={`${kind}-${rule.key}`}
                label={rule.label}
                name={rule.key}
                suffix="in"
                hint={`${rule.hint ? `${rule.hint}. ` : ""}${formatLengthInput(rule.min)} to ${formatLengthInput(rule.max)} in.`}
                defaultValue={typeof item?.[rule.key] === "number" ? formatLengthInput(item[rule.key] as number) : ""}
                error={errors[rule.key]}
              />
            ))}
          </fieldset>
        ) : null}
        <TextField
          label={`Cost ${perUnit(KIND_INFO[kind].priceUnit)}`}
          name="price"
          inputMode="decimal"
          suffix="USD"
          hint="What you pay your supplier. Estimates add overhead and your markup or margin (estimating factors) to make the homeowner's price."
          defaultValue={item ? (item.priceCents / 100).toFixed(2) : ""}
          error={errors.price}
        />
        <fieldset className="grid gap-4 sm:grid-cols-2">
          <legend className="mb-2 text-sm font-extrabold text-char-700">Ordering</legend>
          <SelectField
            label="Supplier"
            name="supplierId"
            defaultValue={item?.supplierId ?? ""}
            error={errors.supplierId}
            hint={suppliers.length ? undefined : "Add your yards and dealers on the Suppliers page first."}
          >
            <option value="">No supplier yet</option>
            {suppliers.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </SelectField>
          <SelectField
            label="Sold by the"
            name="orderUnit"
            value={orderUnit}
            onChange={(e) => {
              const chosen = e.target.value;
              if (isOneOf(ORDER_UNITS, chosen)) setOrderUnit(chosen);
            }}
            error={errors.orderUnit}
          >
            {ORDER_UNITS.map((u) => (
              <option key={u} value={u}>
                {ORDER_UNIT_LABEL[u].label}
              </option>
            ))}
          </SelectField>
          {per ? (
            <TextField
              key={`per-${orderUnit}`}
              label={per}
              name="unitsPerOrderUnit"
              inputMode="decimal"
              hint="Orders round up to whole steps of this."
              defaultValue={item && item.orderUnit === orderUnit ? String(item.unitsPerOrderUnit) : ""}
              error={errors.unitsPerOrderUnit}
            />
          ) : null}
          <TextField
            label={`Weight of one ${ORDER_UNIT_LABEL[orderUnit].label}`}
            name="orderUnitWeightLb"
            inputMode="decimal"
            suffix="lb"
            hint={
              orderUnit === "ton" || orderUnit === "cubic-yard"
                ? "Not needed: bulk is weighed by the ton."
                : "As delivered (a full pallet with its pallet). Optional; gives the delivered weight."
            }
            defaultValue={item?.orderUnitWeightLb ?? ""}
            error={errors.orderUnitWeightLb}
          />
        </fieldset>
        <label className="flex items-center gap-3 text-sm font-bold text-char-700">
          <input
            type="checkbox"
            name="isActive"
            defaultChecked={item?.isActive ?? true}
            className="h-5 w-5 accent-ember-500"
          />
          Offered in the configurator
        </label>
        <div className="flex gap-3">
          <button type="submit" className="btn-primary" disabled={navigation.state === "submitting"}>
            {item ? "Save changes" : "Add item"}
          </button>
          <Link to="/app/catalog" className="btn-quiet">
            Cancel
          </Link>
        </div>
      </Form>
    </div>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
