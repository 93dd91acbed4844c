import { data, Form, Link, redirect, useFetcher, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/app-job";
import { JobChecklist } from "~/components/job-checklist";
import { CrewCautions } from "~/components/job-sheets";
import { FormAlert, PhotoField, SelectField, TextField } from "~/components/ui/field";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { STAFF_ROLES } from "~/db/enums";
import { requireUser } from "~/lib/auth/session.server";
import { findLeadFor, parseLeadId } from "~/lib/auth/staff.server";
import { extraSchema, hoursSchema } from "~/lib/builds/job-site-schema";
import { MAX_HOURS, MIN_HOURS } from "~/lib/builds/job-site-limits";
import { canRecordOnJob, isBuildable, loadJobSite, recordExtra, recordHours } from "~/lib/builds/job-site.server";
import { fieldErrors } from "~/lib/format/form-fields";
import { isSignedStage, STATUS_LABEL } from "~/lib/leads/lead-status";
import { MAX_PHOTOS } from "~/lib/platform/uploads.server";
import { LabelledLines } from "~/components/labelled-lines";
import { readTextFields } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: loaderData ? `On site: ${loaderData.job.customerName} · Emberwright` : "On site · Emberwright" },
];

const RECORD_ROLES = ["owner", "crew"] as const;
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: STAFF_ROLES });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  // The site page is for signed jobs; an earlier request has nothing to build yet.
  if (!lead || !isSignedStage(lead.status)) throw new Response("Not found", { status: 404 });
  const site = await loadJobSite(user, lead);
  const address = `${lead.street}, ${lead.town}`;
  return {
    job: {
      id: lead.id,
      customerName: lead.customerName,
      address,
      stage: STATUS_LABEL[lead.status],
      isBuilt: !isBuildable(lead.status),
      homeownerNotes: lead.notes,
      // A geo: link opens the phone's own map app; the search page is for a computer.
      geoHref: `geo:0,0?q=${encodeURIComponent(address)}`,
      mapHref: `https://www.openstreetmap.org/search?query=${encodeURIComponent(address)}`,
    },
    canRecord: canRecordOnJob(user),
    maxPhotos: MAX_PHOTOS,
    ...site,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: RECORD_ROLES });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead || !isSignedStage(lead.status)) throw new Response("Not found", { status: 404 });
  const form = await readTextFields(request);
  const intent = form.intent;
  const clientId = UUID.test(form.clientId ?? "") ? form.clientId! : crypto.randomUUID();
  if (intent === "hours") {
    const parsed = hoursSchema.safeParse(form);
    if (!parsed.success) return data({ intent, errors: fieldErrors(parsed.error), values: form }, { status: 400 });
    const result = await recordHours(user, lead, parsed.data, clientId);
    if (!result.ok) return data({ intent, errors: result.errors, values: form }, { status: result.status });
    return redirect(`/app/jobs/${lead.id}?saved=hours#hours`);
  }
  if (intent === "extra") {
    const parsed = extraSchema.safeParse(form);
    if (!parsed.success) return data({ intent, errors: fieldErrors(parsed.error), values: form }, { status: 400 });
    const result = await recordExtra(user, lead, parsed.data, clientId);
    if (!result.ok) return data({ intent, errors: result.errors, values: form }, { status: result.status });
    return redirect(`/app/jobs/${lead.id}?saved=extra#extras`);
  }
  return data(
    { intent: "unknown", errors: { form: "Choose what to record: hours or extra material." }, values: form },
    { status: 400 },
  );
}

const PHOTO_CAPTION: Record<"homeowner" | "site-visit" | "progress" | "final", string> = {
  homeowner: "From the homeowner",
  "site-visit": "At the site visit",
  progress: "During the build",
  final: "The finished job",
};

const SAVED_NOTE: Record<string, string> = {
  hours: "Hours saved.",
  extra: "Extra material saved.",
  photos: "Photos saved.",
  built: "Marked built. The office has been told.",
};

export default function JobRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { job, canRecord, steps, ticks, figures, cautions, build, visit, photos, workers, hours, extras } = loaderData;
  const navigation = useNavigation();
  const busy = navigation.state === "submitting";
  const [searchParams] = useSearchParams();
  const saved = searchParams.get("saved");
  const hoursErrors: Record<string, string> = actionData?.intent === "hours" ? actionData.errors : {};
  const extraErrors: Record<string, string> = actionData?.intent === "extra" ? actionData.errors : {};
  const values: Record<string, string> = actionData?.values ?? {};
  const sitePhotos = photos.filter((p) => p.source === "homeowner" || p.source === "site-visit");
  const buildPhotos = photos.filter((p) => p.source === "progress" || p.source === "final");
  return (
    <div className="mx-auto flex max-w-2xl flex-col gap-5 text-char-900">
      <div>
        <Link to="/app/jobs" className="inline-flex min-h-12 items-center text-base font-bold text-ember-700 underline">
          ← My jobs
        </Link>
        <h1 className="text-3xl font-extrabold">{job.customerName}</h1>
        <p className="text-lg font-bold">{job.address}</p>
        <p className="text-base text-char-700">{job.stage}</p>
        {saved && SAVED_NOTE[saved] ? (
          <p role="status" className="mt-2 rounded-lg border-2 border-moss-600 bg-moss-100 p-3 text-base font-bold">
            {SAVED_NOTE[saved]}
          </p>
        ) : null}
        <div className="mt-3 grid grid-cols-2 gap-2">
          <a href={job.geoHref} className="btn-primary min-h-12 text-base">
            Directions
          </a>
          <a href={job.mapHref} className="btn-quiet min-h-12 border-2 border-char-800 text-base" rel="noreferrer">
            Map on the web
          </a>
          <Link to={`/app/leads/${job.id}/cut-sheet`} className="btn-quiet min-h-12 border-2 border-char-800 text-base">
            Cut sheet
          </Link>
          <a
            href={`/app/leads/${job.id}/cut-sheet.pdf`}
            className="btn-quiet min-h-12 border-2 border-char-800 text-base"
            download
          >
            Cut sheet PDF
          </a>
        </div>
      </div>

      <Section id="days" title="Build days">
        {build ? (
          <>
            <p className="text-lg font-bold">{build.days}</p>
            <p className="mt-1 text-base">Crew: {build.crew.map((c) => c.name).join(", ")}</p>
            {build.notes ? <p className="mt-1 text-base">{build.notes}</p> : null}
          </>
        ) : (
          <p className="text-base">Not on the calendar yet.</p>
        )}
      </Section>

      <Section id="figures" title="Key figures">
        <LabelledLines
          lines={figures}
          className="grid grid-cols-1 gap-x-4 gap-y-1 text-base sm:grid-cols-2"
          labelClassName="font-extrabold"
          wrap
        />
      </Section>

      <Section id="checklist" title="Checklist">
        <JobChecklist leadId={job.id} steps={steps} ticks={ticks} canRecord={canRecord} />
      </Section>

      <Section id="site" title="Site notes">
        {visit ? (
          <LabelledLines
            lines={visit.lines}
            className="flex flex-col gap-1 text-base"
            labelClassName="font-extrabold"
            wrap
          />
        ) : (
          <p className="text-base">No site visit was recorded.</p>
        )}
        {visit?.notes ? <p className="mt-2 border-l-4 border-char-800 pl-3 text-base">{visit.notes}</p> : null}
        {job.homeownerNotes ? (
          <p className="mt-2 border-l-4 border-ash-400 pl-3 text-base">The homeowner wrote: {job.homeownerNotes}</p>
        ) : null}
        <PhotoGrid photos={sitePhotos} empty="No photos of the site yet." />
      </Section>

      <Section id="safety" title="Safety on site">
        <CrewCautions cautions={cautions} />
      </Section>

      <Section id="hours" title="Hours">
        {hours.length ? (
          <ul className="mb-3 flex flex-col gap-1 text-base">
            {hours.map((h) => (
              <li key={h.id}>
                <span className="font-bold">{h.day}</span> · {h.workerName}: {h.hours} h
              </li>
            ))}
          </ul>
        ) : (
          <p className="mb-3 text-base">No hours recorded yet.</p>
        )}
        {canRecord ? (
          workers.length ? (
            <Form method="post" className="flex flex-col gap-3" noValidate>
              {Object.keys(hoursErrors).length ? <FormAlert>Check the hours: see the messages below.</FormAlert> : null}
              <input type="hidden" name="intent" value="hours" />
              <input type="hidden" name="clientId" value={loaderData.formClientId} />
              <SelectField
                label="Who worked"
                name="workerUserId"
                defaultValue={values.workerUserId ?? (workers.length === 1 ? String(workers[0]!.id) : "")}
                error={hoursErrors.workerUserId}
              >
                <option value="" disabled>
                  Choose…
                </option>
                {workers.map((w) => (
                  <option key={w.id} value={w.id}>
                    {w.name}
                  </option>
                ))}
              </SelectField>
              <div className="grid grid-cols-2 gap-3">
                <TextField
                  label="Day"
                  name="day"
                  type="date"
                  max={loaderData.today}
                  defaultValue={values.day ?? loaderData.today}
                  error={hoursErrors.day}
                />
                <TextField
                  label="Hours"
                  name="hours"
                  inputMode="decimal"
                  suffix="h"
                  hint={`${MIN_HOURS} to ${MAX_HOURS}, in quarter hours`}
                  defaultValue={values.hours ?? ""}
                  error={hoursErrors.hours}
                />
              </div>
              {hoursErrors.form ? <p className="field-error">{hoursErrors.form}</p> : null}
              <button type="submit" className="btn-primary min-h-12 text-base" disabled={busy}>
                Save the hours
              </button>
            </Form>
          ) : (
            <p className="text-base">Hours can be recorded once the job has a crew.</p>
          )
        ) : null}
      </Section>

      <Section id="extras" title="Extra material">
        {extras.length ? (
          <ul className="mb-3 flex flex-col gap-1 text-base">
            {extras.map((e) => (
              <li key={e.id}>
                {e.quantity} × {e.description}
                {"cost" in e ? ` · ${e.cost}` : ""}
              </li>
            ))}
          </ul>
        ) : (
          <p className="mb-3 text-base">Nothing used beyond the order.</p>
        )}
        {canRecord ? (
          <Form method="post" className="flex flex-col gap-3" noValidate>
            {Object.keys(extraErrors).length ? (
              <FormAlert>Check the extra material: see the messages below.</FormAlert>
            ) : null}
            <input type="hidden" name="intent" value="extra" />
            <input type="hidden" name="clientId" value={loaderData.formClientId} />
            <SelectField
              label="Item"
              name="catalogItemId"
              defaultValue={values.catalogItemId ?? ""}
              error={extraErrors.catalogItemId}
              hint="A catalog item is costed at its price; for anything else, say what it was and what it cost."
            >
              <option value="">Something else</option>
              {loaderData.catalog.map((item) => (
                <option key={item.id} value={item.id}>
                  {item.name}
                </option>
              ))}
            </SelectField>
            <TextField
              label="What was used"
              name="description"
              maxLength={200}
              defaultValue={values.description ?? ""}
              error={extraErrors.description}
            />
            <div className="grid grid-cols-2 gap-3">
              <TextField
                label="Quantity"
                name="quantity"
                inputMode="decimal"
                defaultValue={values.quantity ?? ""}
                error={extraErrors.quantity}
              />
              <TextField
                label="Cost paid"
                name="cost"
                inputMode="decimal"
                hint="Dollars, for something else"
                defaultValue={values.cost ?? ""}
                error={extraErrors.cost}
              />
            </div>
            {extraErrors.form ? <p className="field-error">{extraErrors.form}</p> : null}
            <button type="submit" className="btn-primary min-h-12 text-base" disabled={busy}>
              Save the extra material
            </button>
          </Form>
        ) : null}
      </Section>

      <Section id="build-photos" title="Build photos">
        <PhotoGrid photos={buildPhotos} empty="No build photos yet." />
        {canRecord ? (
          <PhotoForm
            // A new photo list starts an empty form (the saved files are not offered again).
            key={buildPhotos.length}
            leadId={job.id}
            intent="progress"
            label="Add progress photos"
            button="Save the photos"
            maxPhotos={loaderData.maxPhotos}
          />
        ) : null}
      </Section>

      <Section id="built" title="Built">
        {job.isBuilt ? (
          <p className="text-lg font-bold">This job is marked built.</p>
        ) : canRecord ? (
          <>
            <p className="mb-2 text-base">
              When the last cap is set and the site is clean: take the finished photos (at least one) and mark the job
              built. The office and the homeowner hear from us.
            </p>
            <PhotoForm
              leadId={job.id}
              intent="built"
              label="Photos of the finished pit"
              button="Mark the job built"
              maxPhotos={loaderData.maxPhotos}
            />
          </>
        ) : (
          <p className="text-base">Not built yet.</p>
        )}
      </Section>
    </div>
  );
}

function Section({ id, title, children }: { id: string; title: string; children: React.ReactNode }) {
  return (
    <section id={id} aria-labelledby={`${id}-title`} className="rounded-xl border-2 border-char-800 bg-white p-4">
      <h2 id={`${id}-title`} className="mb-2 text-xl font-extrabold">
        {title}
      </h2>
      {children}
    </section>
  );
}

function PhotoGrid({
  photos,
  empty,
}: {
  photos: { id: number; originalName: string; source: keyof typeof PHOTO_CAPTION }[];
  empty: string;
}) {
  if (photos.length === 0) return <p className="mt-2 text-base">{empty}</p>;
  return (
    <ul className="mt-3 grid grid-cols-2 gap-2">
      {photos.map((p) => (
        <li key={p.id}>
          <a href={`/photos/${p.id}`} target="_blank" rel="noreferrer" className="block overflow-hidden rounded-lg">
            <img
              src={`/photos/${p.id}`}
              alt={`${PHOTO_CAPTION[p.source]}: ${p.originalName}`}
              loading="lazy"
              className="aspect-square w-full border-2 border-char-800 object-cover"
            />
          </a>
          <p className="mt-0.5 text-sm font-bold">{PHOTO_CAPTION[p.source]}</p>
        </li>
      ))}
    </ul>
  );
}

function PhotoForm({
  leadId,
  intent,
  label,
  button,
  maxPhotos,
}: {
  leadId: number;
  intent: "progress" | "built";
  label: string;
  button: string;
  maxPhotos: number;
}) {
  const fetcher = useFetcher<{ errors: Record<string, string> }>();
  const errors = fetcher.data?.errors ?? {};
  return (
    <fetcher.Form
      method="post"
      action={`/app/jobs/${leadId}/photos`}
      encType="multipart/form-data"
      className="mt-3 flex flex-col gap-3"
      noValidate
    >
      {errors.form ? <FormAlert>{errors.form}</FormAlert> : null}
      <input type="hidden" name="intent" value={intent} />
      <PhotoField label={label} error={errors.photos} maxPhotos={maxPhotos} large />
      <button type="submit" className="btn-primary min-h-12 text-base" disabled={fetcher.state !== "idle"}>
        {fetcher.state !== "idle" ? "Sending…" : button}
      </button>
    </fetcher.Form>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
