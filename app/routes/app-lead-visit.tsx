import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/app-lead-visit";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { FormAlert, PhotoField, SelectField, TextField } from "~/components/ui/field";
import { SLOPES, SOILS, SPOIL_PLANS, UTILITY_MARKS } from "~/db/enums";
import { fieldErrors } from "~/lib/format/form-fields";
import { requireUser } from "~/lib/auth/session.server";
import { findSiteVisit, saveSiteVisit } from "~/lib/leads/site-visit.server";
import { SLOPE_LABEL, SOIL_LABEL, SPOIL_LABEL, UTILITY_LABEL, siteVisitSchema } from "~/lib/leads/site-visit-schema";
import { OFFICE_ROLES, findLeadFor, parseLeadId } from "~/lib/auth/staff.server";
import {
  checkReceivedPhotos,
  discardReceivedPhotos,
  MAX_PHOTOS,
  readLeadForm,
  storeReceivedPhotos,
} from "~/lib/platform/uploads.server";
import { formatLengthInput, LENGTH_EXAMPLES } from "~/domain/units";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: loaderData ? `Site visit: ${loaderData.customerName} · Emberwright` : "Site visit · Emberwright" },
];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: OFFICE_ROLES });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead) throw new Response("Not found", { status: 404 });
  const visit = await findSiteVisit(lead);
  return {
    leadId: lead.id,
    customerName: lead.customerName,
    site: `${lead.street}, ${lead.town}`,
    homeownerNotes: lead.notes,
    maxPhotos: MAX_PHOTOS,
    visit: visit
      ? {
          structureFt: String(visit.structureFt),
          propertyLineFt: String(visit.propertyLineFt),
          branchesFt: visit.branchesFt === null ? "" : String(visit.branchesFt),
          slope: visit.slope,
          soil: visit.soil,
          accessWidthIn: formatLengthInput(visit.accessWidthIn),
          utilityMarks: visit.utilityMarks,
          spoil: visit.spoil,
          notes: visit.notes,
        }
      : null,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: OFFICE_ROLES });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead) throw new Response("Not found", { status: 404 });
  // The same rules as the homeowner's photos: streamed to disk under the same limits, checked by
  // their bytes, decoded and encoded again.
  const reading = await readLeadForm(request);
  if (!reading.ok)
    return data({ errors: reading.errors, values: {} as Record<string, string> }, { status: reading.status });
  const { fields: values, photos: received } = reading;
  const parsed = siteVisitSchema.safeParse(values);
  if (!parsed.success) {
    const errors: Record<string, string> = fieldErrors(parsed.error);
    const quick = await checkReceivedPhotos(received);
    await discardReceivedPhotos(received);
    if (!quick.ok) errors.photos = quick.message;
    return data({ errors, values }, { status: 400 });
  }
  const stored = await storeReceivedPhotos(received);
  if (!stored.ok) return data({ errors: { photos: stored.message }, values }, { status: 400 });
  await saveSiteVisit(user, lead, parsed.data, stored.photos);
  return redirect(`/app/leads/${lead.id}`);
}

export default function SiteVisitRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { leadId, customerName, site, homeownerNotes, visit, maxPhotos } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  const values: Record<string, string> = { ...(visit ?? {}), ...(actionData?.values ?? {}) };
  const navigation = useNavigation();
  const isSaving = navigation.state === "submitting";
  const count = Object.keys(errors).length;
  return (
    <div className="mx-auto flex max-w-xl flex-col gap-5">
      <div>
        <Link to={`/app/leads/${leadId}`} className="text-sm font-bold text-ember-700 hover:underline">
          ← {customerName}
        </Link>
        <h1 className="mt-1 text-2xl font-extrabold">Site visit</h1>
        <p className="text-sm text-char-600">{site}. Measure from where the centre of the pit will be.</p>
        {homeownerNotes ? (
          <p className="mt-2 border-l-3 border-ash-300 pl-3 text-sm text-char-700">
            The homeowner wrote: {homeownerNotes}
          </p>
        ) : null}
      </div>
      {count ? (
        <FormAlert>
          {count === 1 ? "One field needs a look" : `${count} fields need a look`}: see the messages below.
        </FormAlert>
      ) : null}
      {errors.form ? <FormAlert>{errors.form}</FormAlert> : null}
      <Form method="post" encType="multipart/form-data" className="flex flex-col gap-4 card p-5" noValidate>
        <fieldset className="flex flex-col gap-3">
          <legend className="mb-1 text-lg font-extrabold">Distances from the centre</legend>
          <TextField
            label="Nearest structure (house, shed, fence, deck)"
            name="structureFt"
            suffix="ft"
            hint="Feet, like 12 1/2, or with a unit: 3.8 m."
            defaultValue={values.structureFt ?? ""}
            error={errors.structureFt}
          />
          <TextField
            label="Property line"
            name="propertyLineFt"
            suffix="ft"
            defaultValue={values.propertyLineFt ?? ""}
            error={errors.propertyLineFt}
          />
          <TextField
            label="Overhanging branches"
            name="branchesFt"
            suffix="ft"
            hint="Along the ground to the nearest branch above; leave empty when none hang over."
            defaultValue={values.branchesFt ?? ""}
            error={errors.branchesFt}
          />
        </fieldset>
        <fieldset className="flex flex-col gap-3">
          <legend className="mb-1 text-lg font-extrabold">Ground and access</legend>
          <SelectField label="Slope" name="slope" defaultValue={values.slope ?? ""} error={errors.slope}>
            <option value="" disabled>
              Choose…
            </option>
            {SLOPES.map((s) => (
              <option key={s} value={s}>
                {SLOPE_LABEL[s]}
              </option>
            ))}
          </SelectField>
          <SelectField label="Soil" name="soil" defaultValue={values.soil ?? ""} error={errors.soil}>
            <option value="" disabled>
              Choose…
            </option>
            {SOILS.map((s) => (
              <option key={s} value={s}>
                {SOIL_LABEL[s]}
              </option>
            ))}
          </SelectField>
          <TextField
            label="Access width"
            name="accessWidthIn"
            suffix="in"
            hint={`Narrowest point between the truck and the spot: gate, side yard, steps. Like ${LENGTH_EXAMPLES}.`}
            defaultValue={values.accessWidthIn ?? ""}
            error={errors.accessWidthIn}
          />
          <SelectField
            label="Utility marks"
            name="utilityMarks"
            defaultValue={values.utilityMarks ?? ""}
            error={errors.utilityMarks}
          >
            <option value="" disabled>
              Choose…
            </option>
            {UTILITY_MARKS.map((s) => (
              <option key={s} value={s}>
                {UTILITY_LABEL[s]}
              </option>
            ))}
          </SelectField>
          <SelectField
            label="Where the dug soil goes"
            name="spoil"
            defaultValue={values.spoil ?? ""}
            error={errors.spoil}
          >
            <option value="" disabled>
              Choose…
            </option>
            {SPOIL_PLANS.map((s) => (
              <option key={s} value={s}>
                {SPOIL_LABEL[s]}
              </option>
            ))}
          </SelectField>
        </fieldset>
        <PhotoField label="Photos of the spot and the way in" error={errors.photos} maxPhotos={maxPhotos} />
        <div>
          <label htmlFor="visit-notes" className="field-label">
            Notes
          </label>
          <textarea
            id="visit-notes"
            name="notes"
            rows={4}
            maxLength={2000}
            defaultValue={values.notes ?? ""}
            aria-invalid={errors.notes ? true : undefined}
            aria-describedby={errors.notes ? "visit-notes-error" : undefined}
            className="field-input"
          />
          {errors.notes ? (
            <p id="visit-notes-error" className="field-error">
              {errors.notes}
            </p>
          ) : null}
        </div>
        <button type="submit" className="btn-primary self-start" disabled={isSaving}>
          {isSaving ? "Saving…" : visit ? "Save the changes" : "Save the site visit"}
        </button>
      </Form>
    </div>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
