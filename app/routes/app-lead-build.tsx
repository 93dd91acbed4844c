import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import { isFinishedJob } from "~/lib/leads/lead-status";
import type { Route } from "./+types/app-lead-build";
import { FormAlert, TextField } from "~/components/ui/field";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { addCalendarDays, buildDates, buildDaysNeeded, isCalendarDate } from "~/domain/build-schedule";
import { requireUser } from "~/lib/auth/session.server";
import { findLeadFor, parseLeadId } from "~/lib/auth/staff.server";
import { listTeam } from "~/lib/auth/team.server";
import {
  bookBuild,
  BOOKING_DAYS_AHEAD,
  cancelBuild,
  describeBuildDays,
  findBookedBuild,
  jobLabourHours,
  moveBuild,
  workCalendarFor,
} from "~/lib/builds/builds.server";
import { getCompany } from "~/lib/catalog/catalog.server";
import { toCleanLines, toSingleLine } from "~/lib/format/clean-text";
import { fieldErrors, formId } from "~/lib/format/form-fields";
import { zonedDay } from "~/lib/format/zoned-time";
import { appOrigin } from "~/lib/platform/email.server";
import { readForm } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: loaderData ? `Build dates: ${loaderData.customerName} · Emberwright` : "Build dates · Emberwright" },
];

const BUILD_ROLES = ["owner"] as const;

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: BUILD_ROLES });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead) throw new Response("Not found", { status: 404 });
  const company = await getCompany(user.companyId);
  const [build, team, labourHours, calendar] = await Promise.all([
    findBookedBuild(lead),
    listTeam(user.companyId),
    jobLabourHours(lead),
    workCalendarFor(company),
  ]);
  const crewSize = company.crewSize;
  const suggestedDays = buildDaysNeeded({ labourHours, crewSize, dayHours: company.crewDayHours });
  const today = zonedDay(new Date(), company.timeZone);
  let suggestedStart = addCalendarDays(today, 1);
  try {
    suggestedStart = buildDates(suggestedStart, 1, calendar)[0]!;
  } catch {
    // No working weekday set: the owner picks a day and sees why it cannot hold a build.
  }
  return {
    leadId: lead.id,
    customerName: lead.customerName,
    site: `${lead.street}, ${lead.town}`,
    stage: lead.status,
    canBook: ["signed", "stone-ordered", "build-booked"].includes(lead.status),
    labourHours,
    crewSize,
    dayHours: company.crewDayHours,
    suggestedDays,
    suggestedStart,
    today,
    lastBookable: addCalendarDays(today, BOOKING_DAYS_AHEAD),
    crew: team
      .filter((m) => m.isActive && (m.role === "crew" || m.role === "owner"))
      .map((m) => ({ id: m.id, name: m.name, role: m.role })),
    jobCrewId: lead.crewUserId,
    build: build
      ? {
          id: build.id,
          sequence: build.sequence,
          dates: build.dates,
          daysText: describeBuildDays(build.dates),
          crew: build.crew,
          // Once the job is built its days are a record, not a plan.
          canChange: !isFinishedJob(lead),
        }
      : null,
  };
}

const dayField = z
  .string({ error: "Enter the first build day." })
  .trim()
  .refine(isCalendarDate, { error: "Enter the first build day as a date." });
const daysField = z
  .string()
  .trim()
  .transform((v, ctx) => {
    if (v === "") return null;
    const n = Number(v);
    if (!Number.isInteger(n) || n < 1 || n > 30) {
      ctx.addIssue({ code: "custom", message: "Days on site must be a whole number from 1 to 30." });
      return z.NEVER;
    }
    return n;
  });
const crewField = z
  .array(formId("Choose crew members from the list."))
  .min(1, { error: "Choose at least one crew member." })
  .max(12, { error: "Choose at most 12 crew members." });

const actionSchema = z.discriminatedUnion("intent", [
  z.object({
    intent: z.literal("book"),
    start: dayField,
    days: daysField,
    crewUserIds: crewField,
    notes: z.string().max(2000, { error: "Notes must be at most 2,000 characters." }).transform(toCleanLines),
    allowClash: z.literal("on").optional(),
  }),
  z.object({
    intent: z.literal("move"),
    buildId: formId("Choose a build."),
    sequence: z.coerce.number().int().min(0),
    start: dayField,
    days: daysField,
    allowClash: z.literal("on").optional(),
  }),
  z.object({
    intent: z.literal("cancel"),
    buildId: formId("Choose a build."),
    sequence: z.coerce.number().int().min(0),
    reason: z
      .string()
      .trim()
      .min(3, { error: "Say why the build is cancelled (at least 3 characters)." })
      .max(500, { error: "The reason must be at most 500 characters." })
      .transform(toSingleLine),
  }),
]);

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: BUILD_ROLES });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead) throw new Response("Not found", { status: 404 });
  const company = await getCompany(user.companyId);
  const form = await readForm(request);
  const values = { ...Object.fromEntries(form), crewUserIds: form.getAll("crewUserIds") };
  const parsed = actionSchema.safeParse(values);
  if (!parsed.success)
    return data({ errors: fieldErrors(parsed.error), clashes: [] as string[], done: null }, { status: 400 });
  const input = parsed.data;
  const origin = appOrigin(request);
  const result =
    input.intent === "book"
      ? await bookBuild(
          user,
          lead,
          company,
          {
            start: input.start,
            days: input.days,
            crewUserIds: input.crewUserIds,
            notes: input.notes,
            allowClash: input.allowClash === "on",
          },
          origin,
        )
      : input.intent === "move"
        ? await moveBuild(
            user,
            lead,
            company,
            {
              buildId: input.buildId,
              sequence: input.sequence,
              start: input.start,
              days: input.days,
              crewUserIds: null,
              allowClash: input.allowClash === "on",
            },
            origin,
          )
        : await cancelBuild(
            user,
            lead,
            company,
            { buildId: input.buildId, sequence: input.sequence, reason: input.reason },
            origin,
          );
  if (!result.ok)
    return data({ errors: result.errors, clashes: result.clashes ?? [], done: null }, { status: result.status });
  const done = {
    book: "Build booked: the homeowner and the crew are e-mailed the dates with a calendar file.",
    move: "Build moved: everyone gets the updated calendar event.",
    cancel: "Build cancelled: the homeowner and the crew are told, and the event leaves their calendars.",
  }[input.intent];
  return data({ errors: {} as Record<string, string>, clashes: [] as string[], done });
}

export default function LeadBuildRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { build, crew } = loaderData;
  const navigation = useNavigation();
  const isBusy = navigation.state === "submitting";
  const errors: Record<string, string> = actionData?.errors ?? {};
  const clashes = actionData?.clashes ?? [];
  return (
    <div className="flex max-w-3xl flex-col gap-6">
      <div>
        <Link to={`/app/leads/${loaderData.leadId}`} className="text-sm font-semibold text-ember-700 hover:underline">
          ← {loaderData.customerName}
        </Link>
        <h1 className="text-2xl font-extrabold">Build dates</h1>
        <p className="text-char-600">{loaderData.site}</p>
      </div>
      {Object.keys(errors).length ? <FormAlert>{Object.values(errors)[0]}</FormAlert> : null}
      {clashes.length ? (
        <div className="card border-ember-300 p-4">
          <h2 className="font-extrabold">Clashes</h2>
          <ul className="list-disc pl-5 text-sm">
            {clashes.map((c) => (
              <li key={c}>{c}</li>
            ))}
          </ul>
        </div>
      ) : null}
      {actionData?.done ? (
        <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
          {actionData.done}
        </p>
      ) : null}
      <section className="card p-4 text-sm text-char-700" aria-labelledby="build-estimate">
        <h2 id="build-estimate" className="font-extrabold">
          How long it takes
        </h2>
        <p>
          {loaderData.labourHours.toFixed(1)} labour-hours ÷ ({loaderData.crewSize} people × {loaderData.dayHours} h a
          day) ={" "}
          <strong>
            {loaderData.suggestedDays} day{loaderData.suggestedDays === 1 ? "" : "s"} on site
          </strong>
          , on the company's working days, skipping its days off.
        </p>
      </section>
      {build ? (
        <>
          <section className="card p-4" aria-labelledby="build-booked">
            <h2 id="build-booked" className="font-extrabold">
              Booked
            </h2>
            <p className="text-lg font-extrabold">{build.daysText}</p>
            <p className="text-sm text-char-600">Crew: {build.crew.map((c) => c.name).join(", ")}</p>
          </section>
          {build.canChange ? (
            <>
              {/* Keyed by the sequence: after a move the fields show the booked days, not what was typed. */}
              <Form
                key={build.sequence}
                method="post"
                className="flex flex-col gap-4 card p-4"
                aria-labelledby="move-build"
              >
                <h2 id="move-build" className="font-extrabold">
                  Move the build
                </h2>
                <input type="hidden" name="intent" value="move" />
                <input type="hidden" name="buildId" value={build.id} />
                <input type="hidden" name="sequence" value={build.sequence} />
                <div className="grid gap-4 sm:grid-cols-2">
                  <TextField
                    label="New first day"
                    name="start"
                    type="date"
                    min={loaderData.today}
                    max={loaderData.lastBookable}
                    defaultValue={build.dates[0]}
                    error={errors.start}
                    required
                  />
                  <TextField
                    label="Days on site"
                    name="days"
                    type="number"
                    min={1}
                    max={30}
                    defaultValue={build.dates.length}
                    error={errors.days}
                  />
                </div>
                {clashes.length ? (
                  <label className="flex items-center gap-2 text-sm font-semibold">
                    <input type="checkbox" name="allowClash" /> Move anyway, clashes and all
                  </label>
                ) : null}
                <button type="submit" className="btn-primary self-start" disabled={isBusy}>
                  Move and tell everyone
                </button>
              </Form>
              <Form method="post" className="flex flex-col gap-4 card p-4" aria-labelledby="cancel-build">
                <h2 id="cancel-build" className="font-extrabold">
                  Cancel the build
                </h2>
                <input type="hidden" name="intent" value="cancel" />
                <input type="hidden" name="buildId" value={build.id} />
                <input type="hidden" name="sequence" value={build.sequence} />
                <TextField
                  label="Reason (sent to the homeowner)"
                  name="reason"
                  error={errors.reason}
                  required
                  maxLength={500}
                />
                <button type="submit" className="btn-quiet self-start" disabled={isBusy}>
                  Cancel the build dates
                </button>
              </Form>
            </>
          ) : (
            <p className="card p-4 text-sm text-char-700">
              The job is built: these days are a record of the work and can no longer be moved or cancelled.
            </p>
          )}
        </>
      ) : loaderData.canBook ? (
        <Form method="post" className="flex flex-col gap-4 card p-4" aria-labelledby="book-build">
          <h2 id="book-build" className="font-extrabold">
            Book the build
          </h2>
          <input type="hidden" name="intent" value="book" />
          <div className="grid gap-4 sm:grid-cols-2">
            <TextField
              label="First day"
              name="start"
              type="date"
              min={loaderData.today}
              max={loaderData.lastBookable}
              defaultValue={loaderData.suggestedStart}
              error={errors.start}
              required
            />
            <TextField
              label="Days on site"
              name="days"
              type="number"
              min={1}
              max={30}
              defaultValue={loaderData.suggestedDays}
              error={errors.days}
              hint="Leave as suggested, or change it."
            />
          </div>
          <fieldset>
            <legend className="field-label">Crew</legend>
            {crew.length === 0 ? (
              <p className="text-sm text-char-600">No active crew yet: invite one from the team page.</p>
            ) : null}
            <div className="flex flex-wrap gap-3">
              {crew.map((c) => (
                <label
                  key={c.id}
                  className="flex items-center gap-2 rounded-lg border border-ash-300 px-3 py-2 text-sm font-semibold"
                >
                  <input
                    type="checkbox"
                    name="crewUserIds"
                    value={c.id}
                    defaultChecked={c.id === loaderData.jobCrewId}
                  />{" "}
                  {c.name}
                </label>
              ))}
            </div>
            {errors.crewUserIds ? <p className="field-error">{errors.crewUserIds}</p> : null}
          </fieldset>
          <TextField label="Notes for the crew (optional)" name="notes" maxLength={2000} error={errors.notes} />
          {clashes.length ? (
            <label className="flex items-center gap-2 text-sm font-semibold">
              <input type="checkbox" name="allowClash" /> Book anyway, clashes and all
            </label>
          ) : null}
          <button type="submit" className="btn-primary self-start" disabled={isBusy}>
            Book and tell everyone
          </button>
        </Form>
      ) : (
        <p className="card p-6 text-char-600">A build is booked once the job is signed and the deposit is paid.</p>
      )}
    </div>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
