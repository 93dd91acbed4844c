import { data, Form, Link, redirect, useLocation, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/app-suppliers";
import { FormAlert, TextField } from "~/components/ui/field";
import { formId } from "~/lib/format/form-fields";
import { formatPhone } from "~/lib/format/phone";
import { requireUser } from "~/lib/auth/session.server";
import { parseSupplierForm } from "~/lib/suppliers/supplier-schema";
import { listSuppliers, saveSupplier } from "~/lib/suppliers/suppliers.server";
import { readTextFields } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = () => [{ title: "Suppliers · Emberwright" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const suppliers = await listSuppliers(user.companyId);
  return {
    suppliers: suppliers.map((s) => ({
      id: s.id,
      name: s.name,
      email: s.email,
      phone: s.phone ? formatPhone(s.phone) : "",
    })),
  };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const fields = await readTextFields(request);
  // "" adds a supplier; an id changes that one (another company's id is a 404).
  const target = fields.supplierId ? formId("No such supplier.").safeParse(fields.supplierId) : null;
  if (target && !target.success) throw new Response("Not found", { status: 404 });
  const supplierId = target?.success ? target.data : null;
  const parsed = parseSupplierForm(fields);
  if (!parsed.ok)
    return data({ supplierId: fields.supplierId ?? "", errors: parsed.errors, values: fields }, { status: 400 });
  const saved = await saveSupplier(user.companyId, supplierId, parsed.value);
  if (!saved.ok) {
    if (saved.status === 404) throw new Response("Not found", { status: 404 });
    return data(
      { supplierId: fields.supplierId ?? "", errors: saved.errors, values: fields },
      { status: saved.status },
    );
  }
  return redirect(`/app/suppliers?saved=${supplierId === null ? "added" : "changed"}`);
}

function SupplierFields({
  values,
  errors,
}: {
  values: { name: string; email: string; phone: string };
  errors: Record<string, string>;
}) {
  return (
    <>
      <TextField
        label="Name"
        name="name"
        defaultValue={values.name}
        error={errors.name}
        maxLength={80}
        autoComplete="off"
      />
      <TextField
        label="E-mail for orders"
        name="email"
        type="email"
        defaultValue={values.email}
        error={errors.email}
        autoComplete="off"
      />
      <TextField
        label="Phone"
        name="phone"
        type="tel"
        defaultValue={values.phone}
        error={errors.phone}
        hint="Optional."
        autoComplete="off"
      />
    </>
  );
}

export default function SuppliersRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { suppliers } = loaderData;
  const [params] = useSearchParams();
  const location = useLocation();
  const isBusy = useNavigation().state === "submitting";
  const saved = !actionData
    ? ({ added: "Supplier added.", changed: "Supplier saved." } as Record<string, string>)[params.get("saved") ?? ""]
    : undefined;
  const errorsFor = (id: string): Record<string, string> =>
    actionData && actionData.supplierId === id ? actionData.errors : {};
  const valuesFor = (id: string, fallback: { name: string; email: string; phone: string }) =>
    actionData && actionData.supplierId === id
      ? {
          name: actionData.values.name ?? "",
          email: actionData.values.email ?? "",
          phone: actionData.values.phone ?? "",
        }
      : fallback;
  const newErrors = errorsFor("");
  return (
    <div className="mx-auto flex max-w-4xl flex-col gap-6">
      <div>
        <Link to="/app/catalog" className="text-sm font-bold text-ember-700 hover:underline">
          ← Catalog
        </Link>
        <h1 className="mt-2 text-2xl font-extrabold">Suppliers</h1>
        <p className="text-char-600">
          The yards and dealers you buy from. Name one on each catalog item, with how it is sold, and supplier orders go
          to them.
        </p>
      </div>
      {saved ? (
        <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
          {saved}
        </p>
      ) : null}
      {actionData && Object.keys(actionData.errors).length ? (
        <FormAlert>Nothing was saved. Fix the fields marked below.</FormAlert>
      ) : null}

      <section aria-labelledby="suppliers-title" className="overflow-hidden card">
        <h2
          id="suppliers-title"
          className="border-b border-ash-200 bg-ash-100 px-4 py-2 text-sm font-extrabold tracking-wide text-char-700 uppercase"
        >
          Your suppliers
        </h2>
        {suppliers.length === 0 ? <p className="px-4 py-3 text-char-600">None yet.</p> : null}
        <ul className="divide-y divide-ash-200">
          {suppliers.map((s) => {
            const errors = errorsFor(String(s.id));
            return (
              <li key={s.id} className="px-4 py-3">
                <details open={Object.keys(errors).length > 0}>
                  <summary className="cursor-pointer">
                    <span className="font-bold text-char-900">{s.name}</span>{" "}
                    <span className="text-sm break-all text-char-600">{s.email}</span>
                    {s.phone ? <span className="text-sm text-char-600"> · {s.phone}</span> : null}
                  </summary>
                  <Form
                    method="post"
                    className="mt-3 grid gap-4 sm:grid-cols-[1fr_1fr_12rem_auto] sm:items-start"
                    noValidate
                  >
                    <input type="hidden" name="supplierId" value={s.id} />
                    <SupplierFields values={valuesFor(String(s.id), s)} errors={errors} />
                    <button type="submit" className="btn-quiet sm:mt-6" disabled={isBusy} aria-label={`Save ${s.name}`}>
                      Save
                    </button>
                  </Form>
                </details>
              </li>
            );
          })}
        </ul>
      </section>

      <section aria-labelledby="add-title" className="card p-5">
        <h2 id="add-title" className="text-lg font-extrabold">
          Add a supplier
        </h2>
        <Form
          key={location.key}
          method="post"
          className="mt-4 grid gap-4 sm:grid-cols-[1fr_1fr_12rem_auto] sm:items-start"
          noValidate
        >
          <input type="hidden" name="supplierId" value="" />
          <SupplierFields values={valuesFor("", { name: "", email: "", phone: "" })} errors={newErrors} />
          <button type="submit" className="btn-primary sm:mt-6" disabled={isBusy}>
            Add supplier
          </button>
        </Form>
      </section>
    </div>
  );
}
