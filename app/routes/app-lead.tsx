import { data, Form, Link, redirect, useLocation, useNavigation } from "react-router";
import type { Route } from "./+types/app-lead";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { CapDrawingSvg } from "~/components/cap-drawing-svg";
import { CrewCautions, CutListTables, MaterialsTable } from "~/components/job-sheets";
import { JobProgress } from "~/components/job-progress";
import { PitPlanSvg } from "~/components/pit-plan-svg";
import { PitPreview } from "~/components/pit-preview";
import { FormAlert, SelectField } from "~/components/ui/field";
import { STAFF_ROLES } from "~/db/enums";
import { formatInches } from "~/domain/units";
import { getCompany } from "~/lib/catalog/catalog.server";
import { appOrigin } from "~/lib/platform/email.server";
import { buildCutList, crewCautionsOf, legacyCutList } from "~/lib/cut-sheet/cut-list";
import { refreshStoredPlan } from "~/lib/design/plan-refresh.server";
import { describePreview, planToSceneInput } from "~/lib/design/design-plan";
import { leadActionErrors, leadActionSchema } from "~/lib/leads/lead-action-schema";
import {
  allowedMoves,
  BUILD_WINDOW_LABEL,
  describeNextStep,
  isFinishedJob,
  isSignedStage,
  STATUS_LABEL,
} from "~/lib/leads/lead-status";
import { findLiveBooking } from "~/lib/consults/booking.server";
import { jobTotalsFor } from "~/lib/proposals/change-orders.server";
import { parseProposalDocument, PROPOSAL_STATE_LABEL } from "~/lib/proposals/proposal-document";
import { requestDepositRefund } from "~/lib/proposals/proposal-payments.server";
import { listProposals } from "~/lib/proposals/proposals.server";
import { checkSite } from "~/domain/site-checks";
import { getProposalTerms } from "~/lib/proposals/proposal-terms.server";
import { findSiteVisit } from "~/lib/leads/site-visit.server";
import { SLOPE_LABEL, SOIL_LABEL, SPOIL_LABEL, UTILITY_LABEL } from "~/lib/leads/site-visit-schema";
import {
  addNote,
  assignCrew,
  assignEstimator,
  sendRevision,
  changeStage,
  listPhotos,
  listRevisions,
  listTimeline,
  originalVersion,
  type ActionResult,
  type DesignVersion,
} from "~/lib/leads/lead-workspace.server";
import { formatMoney, formatMoneyWhole } from "~/lib/format/money";
import { describeBreakdown, readBreakdown } from "~/lib/design/price-breakdown";
import { requireUser } from "~/lib/auth/session.server";
import { isOfficeRole, OFFICE_ROLES, findLeadFor, parseLeadId } from "~/lib/auth/staff.server";
import { listTeam } from "~/lib/auth/team.server";
import { describeAge, formatZonedDateTime } from "~/lib/format/zoned-time";
import { formatPhone, phoneHref } from "~/lib/format/phone";
import { BalanceCard, JobCostCard } from "~/components/job-money-cards";
import { describeBalance, findJobBalance } from "~/lib/builds/job-balance.server";
import { describeBuildDays, findBookedBuild } from "~/lib/builds/builds.server";
import { describeJobCost, jobCostFor } from "~/lib/builds/job-cost.server";
import { LabelledLines } from "~/components/labelled-lines";
import { readTextFields } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: loaderData ? `${loaderData.lead.customerName} · Emberwright` : "Request · Emberwright" },
];

function versionLabel(version: DesignVersion, index: number): string {
  return version.revisionId === null ? "Homeowner's original" : `Revision ${index}`;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: STAFF_ROLES });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead) throw new Response("Not found", { status: 404 });
  const isOffice = isOfficeRole(user.role);
  const [company, revisions, photos, booking, visit, terms] = await Promise.all([
    getCompany(user.companyId),
    listRevisions(lead),
    listPhotos(lead),
    findLiveBooking(lead.id),
    findSiteVisit(lead),
    getProposalTerms(user.companyId),
  ]);
  const original = originalVersion(lead);
  const versions = [original, ...revisions];
  const wanted = new URL(request.url).searchParams.get("version");
  let shownIndex = versions.length - 1;
  if (wanted === "original") shownIndex = 0;
  else if (wanted !== null) {
    shownIndex = versions.findIndex((v) => v.revisionId !== null && String(v.revisionId) === wanted);
    if (shownIndex < 0) throw new Response("Not found", { status: 404 });
  }
  const shown = versions[shownIndex]!;
  const refreshed = refreshStoredPlan(shown);
  const { plan } = refreshed;
  const tz = company.timeZone;
  const [timeline, team] = isOffice ? await Promise.all([listTimeline(lead), listTeam(user.companyId)]) : [[], []];

  const allProposals = isOffice ? await listProposals(lead) : [];
  const mainProposal =
    allProposals.find(
      (p) => p.kind === "proposal" && (p.status === "sent" || p.status === "accepted" || p.status === "signed"),
    ) ?? null;
  const signedProposal = allProposals.find((p) => p.kind === "proposal" && p.status === "signed") ?? null;
  const totals = signedProposal ? await jobTotalsFor(signedProposal) : null;
  const isOwner = user.role === "owner";
  const [balance, cost, booked] = await Promise.all([
    isOffice ? findJobBalance(lead) : null,
    isOwner && signedProposal ? jobCostFor(lead) : null,
    isOffice && isSignedStage(lead.status) ? findBookedBuild(lead) : null,
  ]);
  const nextStep = describeNextStep(lead.status, lead.pausedStage, isOffice, {
    firstName: lead.customerName.split(" ")[0] ?? lead.customerName,
    consultLabel: booking?.status === "confirmed" ? formatZonedDateTime(booking.startsAt, tz) : null,
    proposal: mainProposal
      ? { state: mainProposal.status as "sent" | "accepted" | "signed", opened: mainProposal.firstOpenedAt !== null }
      : null,
    openChangeOrder: allProposals.some((p) => p.kind === "change-order" && p.status === "sent"),
    stopReason: lead.stopReason,
  });

  return {
    isOffice,
    nextStep,
    moves: isOffice ? allowedMoves(lead.status, lead.pausedStage) : [],
    isOwner,
    balance: balance ? describeBalance(balance, tz) : null,
    jobCost: cost ? describeJobCost(cost) : null,
    build: booked
      ? {
          days: describeBuildDays(booked.dates),
          crew: booked.crew.map((c) => c.name).join(", ") || "no crew yet",
          // Once the job is built its days are a record, not a plan.
          canChange: !isFinishedJob(lead),
        }
      : null,
    proposals: allProposals.map((p) => {
      const document = parseProposalDocument(p.documentJson);
      return {
        id: p.id,
        kind: p.kind,
        number: document.number,
        status: p.status,
        stateLabel: PROPOSAL_STATE_LABEL[p.status],
        href: `/p/${p.token}`,
        amount: formatMoney(p.kind === "change-order" ? p.priceCents : (p.totalCents ?? p.priceCents)),
        sent: formatZonedDateTime(p.sentAt, tz),
        opened: p.firstOpenedAt
          ? `opened ${p.openCount} time${p.openCount === 1 ? "" : "s"}, last ${formatZonedDateTime(p.lastOpenedAt!, tz)}`
          : "not opened yet",
        signed: p.signedAt ? `signed by ${p.signerName}, ${formatZonedDateTime(p.signedAt, tz)}` : null,
        deposit: p.depositPaidAt && p.depositCents ? `deposit ${formatMoney(p.depositCents)} paid` : null,
        refund: p.refundOwedAt ? `deposit refunded${p.refundedAt ? "" : " (on its way)"}: ${p.refundReason}` : null,
        canWithdraw: p.status === "sent" || p.status === "accepted",
        canRefund:
          p.kind === "proposal" &&
          p.status === "signed" &&
          p.paymentIntentId !== null &&
          p.refundOwedAt === null &&
          !isFinishedJob(lead) &&
          !balance,
        expires: p.status === "sent" || p.status === "accepted" ? formatZonedDateTime(p.expiresAt, tz) : null,
      };
    }),
    totals: totals
      ? {
          contract: formatMoney(totals.contractCents),
          deposit: formatMoney(totals.depositCents),
          balance:
            totals.balanceCents >= 0 ? formatMoney(totals.balanceCents) : `${formatMoney(-totals.balanceCents)} credit`,
        }
      : null,
    lead: {
      id: lead.id,
      status: lead.status,
      stageLabel: STATUS_LABEL[lead.status],
      pausedStage: lead.pausedStage,
      isSigned: isSignedStage(lead.status),
      stopReason: lead.stopReason,
      customerName: lead.customerName,
      // The crew gets the site address and nothing else of the customer's contact details.
      email: isOffice ? lead.email : null,
      phone: isOffice ? lead.phone : null,
      street: lead.street,
      town: lead.town,
      buildWindow: BUILD_WINDOW_LABEL[lead.buildWindow],
      notes: lead.notes,
      receivedLabel: formatZonedDateTime(lead.createdAt, tz),
      ageLabel: describeAge(lead.createdAt, new Date()),
      assignedUserId: lead.assignedUserId,
      crewUserId: lead.crewUserId,
    },
    photos,
    visit: visit
      ? {
          lines: [
            ["Nearest structure", `${visit.structureFt} ft`],
            ["Property line", `${visit.propertyLineFt} ft`],
            ["Overhanging branches", visit.branchesFt === null ? "None over the spot" : `${visit.branchesFt} ft`],
            ["Slope", SLOPE_LABEL[visit.slope]],
            ["Soil", SOIL_LABEL[visit.soil]],
            ["Access width", `${visit.accessWidthIn} in`],
            ["Utility marks", UTILITY_LABEL[visit.utilityMarks]],
            ["Dug soil", SPOIL_LABEL[visit.spoil]],
          ] as [string, string][],
          notes: visit.notes,
          checks: checkSite(visit, { setbackFt: company.setbackFt, narrowAccessIn: terms.narrowAccessIn }).map(
            (c) => c.message,
          ),
          when: formatZonedDateTime(visit.updatedAt, tz),
        }
      : null,
    versions: versions.map((v, i) => ({
      key: v.revisionId === null ? "original" : String(v.revisionId),
      label: versionLabel(v, i),
      detail:
        v.revisionId === null
          ? `sent ${formatZonedDateTime(v.createdAt, tz)}`
          : `by ${v.authorName ?? "staff"}, ${formatZonedDateTime(v.createdAt, tz)}`,
      isShown: i === shownIndex,
      isLatest: i === versions.length - 1,
      revisionId: v.revisionId,
      sentOn: v.sentAt ? formatZonedDateTime(v.sentAt, tz) : null,
    })),
    shown: {
      summary: shown.design.summary,
      sceneInput: planToSceneInput(plan, shown.design.inputs.engine),
      caption: describePreview(plan, "in"),
      cutList: refreshed.isLegacy ? legacyCutList() : buildCutList(refreshed.plan),
      caps: refreshed.isLegacy ? null : refreshed.plan.caps,
      materials: plan.materials,
      warnings: plan.warnings,
      cautions: crewCautionsOf(plan.cautions),
      labour: isOffice && !refreshed.isLegacy ? refreshed.plan.labour : null,
      unpricedItems: isOffice && !refreshed.isLegacy ? refreshed.plan.unpricedItems : null,
      price: isOffice && plan.price ? readBreakdown(plan.price.breakdown) : null,
    },
    timeline: timeline.map((t) => ({ ...t, when: formatZonedDateTime(t.createdAt, tz) })),
    team: isOffice
      ? {
          estimators: team.filter(
            (m) => (m.role === "owner" || m.role === "estimator") && (m.isActive || m.id === lead.assignedUserId),
          ),
          crew: team.filter((m) => m.role === "crew" && (m.isActive || m.id === lead.crewUserId)),
        }
      : null,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: OFFICE_ROLES });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead) throw new Response("Not found", { status: 404 });
  const fields = await readTextFields(request);
  const parsed = leadActionSchema.safeParse(fields);
  if (!parsed.success) {
    return data({ intent: fields.intent ?? null, fields, errors: leadActionErrors(parsed.error) }, { status: 400 });
  }
  const input = parsed.data;
  let result: ActionResult;
  switch (input.intent) {
    case "status":
      result = await changeStage(user, lead, input.status, input.reason);
      break;
    case "note":
      result = await addNote(user, lead, input.note);
      break;
    case "assign":
      result = await assignEstimator(user, lead, input.assigneeId, appOrigin(request));
      break;
    case "crew":
      result = await assignCrew(user, lead, input.crewUserId, appOrigin(request));
      break;
    case "send-revision":
      result = await sendRevision(user, lead, input.revisionId, appOrigin(request));
      break;
    case "refund": {
      if (user.role !== "owner") {
        result = { ok: false, status: 403, errors: { reason: "Only an owner can refund a deposit." } };
        break;
      }
      const refused = await requestDepositRefund({
        actorUserId: user.id,
        lead,
        proposalId: input.proposalId,
        reason: input.reason,
      });
      result = refused ? { ok: false, status: 409, errors: { reason: refused } } : { ok: true };
      break;
    }
  }
  if (!result.ok)
    return data({ intent: input.intent as string | null, fields, errors: result.errors }, { status: result.status });
  return redirect(`/app/leads/${lead.id}`);
}

const kindLabel: Record<string, string> = {
  received: "Request received",
  status: "Status",
  note: "Note",
  assigned: "Assignment",
  "crew-assigned": "Crew",
  revision: "Design revised",
  email: "E-mail",
  "consult-booked": "Consult booked",
  "consult-cancelled": "Consult cancelled",
  "supplier-order": "Supplier order",
  "build-booked": "Build booked",
  "build-moved": "Build moved",
  "build-cancelled": "Build cancelled",
  "consult-moved": "Consult moved",
  "revision-sent": "Revision sent to the homeowner",
  balance: "Balance due",
  "balance-paid": "Balance paid",
  "balance-refund": "Balance refund",
};

/** A heading for an event kind this page has no words for yet: "site-visit" reads "Site visit", never the raw code. */
const describeKind = (kind: string) =>
  kindLabel[kind] ?? `${kind.charAt(0).toUpperCase()}${kind.slice(1).replace(/-/g, " ")}`;

export default function LeadRoute({ loaderData, actionData }: Route.ComponentProps) {
  const {
    lead,
    isOffice,
    shown,
    versions,
    photos,
    timeline,
    team,
    nextStep,
    moves,
    visit,
    proposals,
    totals,
    isOwner,
    balance,
    jobCost,
  } = loaderData;
  const errorsFor = (intent: string): Record<string, string> =>
    actionData && actionData.intent === intent ? actionData.errors : {};
  const formErrors = actionData && !actionData.intent ? actionData.errors : {};
  // A refused form comes back with what was typed and chosen, not the saved values.
  const typed = (intent: string): Record<string, string | undefined> =>
    actionData && actionData.intent === intent ? actionData.fields : {};
  const navigation = useNavigation();
  // Each successful post redirects to a new location: keyed on it, the forms start again from the saved values.
  const { key: formKey } = useLocation();
  const isBusy = navigation.state === "submitting";
  const f = (inches: number) => formatInches(inches);
  const shownVersion = versions.find((v) => v.isShown)!;

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-start justify-between gap-4">
        <div className="min-w-0">
          <Link to={isOffice ? "/app/inbox" : "/app/jobs"} className="text-sm font-bold text-ember-700 hover:underline">
            ← {isOffice ? "Inbox" : "My jobs"}
          </Link>
          <h1 className="mt-1 text-2xl font-extrabold">{lead.customerName}</h1>
          <p className="text-sm text-char-600">
            {lead.town} · request #{lead.id}, received {lead.receivedLabel} (
            {lead.ageLabel === "just now" ? "just now" : `${lead.ageLabel} ago`})
          </p>
        </div>
        <div className="flex flex-wrap gap-2">
          <Link to={`/app/leads/${lead.id}/cut-sheet`} className="btn-primary">
            Cut sheet
          </Link>
          <a href={`/app/leads/${lead.id}/cut-sheet.pdf`} className="btn-quiet" download>
            PDF with cap template
          </a>
          {isOffice ? (
            <Link to={`/app/leads/${lead.id}/design`} className="btn-quiet">
              Revise the design
            </Link>
          ) : null}
        </div>
      </div>

      <section aria-labelledby="next-step-title" className="flex flex-col gap-4 card border-l-4 border-l-ember-500 p-5">
        <div>
          <p className="text-xs font-extrabold tracking-widest text-char-600 uppercase">
            Next step <span className="sr-only">· stage: {lead.stageLabel}</span>
          </p>
          <h2 id="next-step-title" className="text-xl font-extrabold">
            {nextStep.title}
          </h2>
          {nextStep.detail ? <p className="mt-1 text-sm text-char-700">{nextStep.detail}</p> : null}
        </div>
        <JobProgress stage={lead.status} pausedStage={lead.pausedStage} />
        {isOffice ? (
          <div className="flex flex-wrap gap-2">
            {!visit && !lead.isSigned ? (
              <Link
                to={`/app/leads/${lead.id}/visit`}
                className={lead.status === "consult-booked" ? "btn-primary" : "btn-quiet"}
              >
                Record the site visit
              </Link>
            ) : null}
            {!lead.isSigned ? (
              <Link
                to={`/app/leads/${lead.id}/proposal`}
                className={lead.status === "measured" ? "btn-primary" : "btn-quiet"}
              >
                {proposals.some((p) => p.kind === "proposal" && p.canWithdraw)
                  ? "Send a new proposal"
                  : "Write the proposal"}
              </Link>
            ) : (
              <Link to={`/app/leads/${lead.id}/change-order`} className="btn-quiet">
                Send a change order
              </Link>
            )}
            {lead.isSigned && isOwner ? (
              <Link
                to={`/app/leads/${lead.id}/supplier-orders`}
                className={lead.status === "signed" ? "btn-primary" : "btn-quiet"}
              >
                Supplier orders
              </Link>
            ) : null}
            {lead.isSigned && isOwner ? (
              <Link
                to={`/app/leads/${lead.id}/build`}
                className={lead.status === "stone-ordered" ? "btn-primary" : "btn-quiet"}
              >
                Build dates
              </Link>
            ) : null}
          </div>
        ) : null}
      </section>

      {Object.keys(formErrors).length ? <FormAlert>{Object.values(formErrors).join(" ")}</FormAlert> : null}

      {isOffice && team ? (
        // On a phone the design and cut list come first and run long: a way straight to the work.
        <a href="#work" className="btn-quiet self-start lg:hidden">
          Go to “Work the request”
        </a>
      ) : null}

      <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_22rem] lg:grid-rows-[auto_1fr]">
        <div className="flex min-w-0 flex-col gap-6 lg:col-start-2 lg:row-start-1">
          <CustomerCard lead={lead} isOffice={isOffice} />
          {loaderData.build ? (
            <section aria-labelledby="build-title" className="card p-5 text-sm">
              <h2 id="build-title" className="text-lg font-extrabold">
                Build
              </h2>
              <p className="mt-2 font-bold">{loaderData.build.days}</p>
              <p className="text-char-700">Crew: {loaderData.build.crew}</p>
              {isOwner && loaderData.build.canChange ? (
                <Link
                  to={`/app/leads/${lead.id}/build`}
                  className="mt-2 inline-block font-bold text-ember-700 hover:underline"
                >
                  Move or cancel the build
                </Link>
              ) : null}
            </section>
          ) : null}
          {visit ? <SiteVisitCard visit={visit} leadId={lead.id} isOffice={isOffice} /> : null}
          <PhotoList photos={photos} />
        </div>

        <div className="flex min-w-0 flex-col gap-6 lg:col-start-1 lg:row-span-2 lg:row-start-1">
          <section aria-labelledby="design-title" className="flex flex-col gap-4">
            <div className="flex flex-wrap items-baseline justify-between gap-2">
              <h2 id="design-title" className="text-xl font-extrabold">
                Design <span className="text-base font-semibold text-char-600">· {shownVersion.label}</span>
              </h2>
              {versions.length > 1 ? (
                <nav aria-label="Design versions" className="flex flex-wrap gap-1 text-sm">
                  {versions.map((v) => (
                    <Link
                      key={v.key}
                      to={v.isLatest ? `/app/leads/${lead.id}` : `/app/leads/${lead.id}?version=${v.key}`}
                      aria-current={v.isShown ? "page" : undefined}
                      title={v.detail}
                      className={`rounded-full border px-3 py-1 font-bold ${v.isShown ? "border-char-800 bg-char-800 text-ash-50" : "border-ash-300 bg-white text-char-700 hover:bg-ash-100"}`}
                    >
                      {v.label}
                      {v.isLatest && v.key !== "original" ? " (latest)" : ""}
                    </Link>
                  ))}
                </nav>
              ) : null}
            </div>
            <p className="-mt-2 text-sm text-char-600">
              {shownVersion.label}, {shownVersion.detail}.
              {versions.length > 1 && !shownVersion.isLatest ? " The job is built to the latest version." : ""}
              {shownVersion.sentOn ? ` Sent to the homeowner ${shownVersion.sentOn}.` : ""}
            </p>
            {isOffice && shownVersion.revisionId !== null && !shownVersion.sentOn ? (
              <Form method="post" className="-mt-1 flex flex-wrap items-center gap-3">
                <input type="hidden" name="intent" value="send-revision" />
                <input type="hidden" name="revisionId" value={shownVersion.revisionId} />
                <button type="submit" className="btn-quiet" disabled={isBusy}>
                  Send {shownVersion.label.toLowerCase()} to {lead.customerName}
                </button>
                <span className="text-xs text-char-600">
                  They get an e-mail, and the plan drawing shows on their page.
                </span>
                {errorsFor("send-revision").revisionId ? (
                  <span className="field-error">{errorsFor("send-revision").revisionId}</span>
                ) : null}
              </Form>
            ) : null}
            <div className="grid gap-4 xl:grid-cols-2">
              <PitPreview input={shown.sceneInput} caption={shown.caption} unit="in" formatLength={f} />
              <figure className="overflow-hidden card">
                <div className="aspect-square bg-white p-2 sm:aspect-[4/3]">
                  <PitPlanSvg input={shown.sceneInput} unit="in" formatLength={f} className="h-full w-full" />
                </div>
                <figcaption className="border-t border-ash-200 px-4 py-3 text-sm text-char-700">
                  Plan, first course and caps (dashed), to scale.
                </figcaption>
              </figure>
            </div>
            <LabelledLines lines={shown.summary} className="grid gap-x-6 gap-y-1 card p-4 text-sm sm:grid-cols-2" />
            {shown.warnings.length ? (
              <div className="rounded-(--radius-card) border border-ember-300 bg-ember-50 p-4 text-sm">
                <h3 className="font-extrabold text-ember-700">Worth a second look</h3>
                <ul className="mt-1 list-disc pl-5">
                  {shown.warnings.map((w) => (
                    <li key={w.code}>{w.message}</li>
                  ))}
                </ul>
              </div>
            ) : null}
          </section>

          <section aria-labelledby="cut-title" className="card p-5">
            <h2 id="cut-title" className="mb-3 text-xl font-extrabold">
              Cut list
            </h2>
            <CutListTables sections={shown.cutList} />
            {shown.caps ? (
              <figure className="mt-4 rounded-lg border border-ash-200 p-3">
                <CapDrawingSvg caps={shown.caps} className="mx-auto max-h-96" />
                <figcaption className="mt-2 text-center text-xs text-char-600">
                  One cap on its blank. The PDF has it full size to tape on.
                </figcaption>
              </figure>
            ) : null}
          </section>

          <section aria-labelledby="materials-title" className="card p-5">
            <h2 id="materials-title" className="mb-2 text-xl font-extrabold">
              Material order
            </h2>
            <MaterialsTable materials={shown.materials} />
          </section>

          {shown.labour || shown.price ? (
            <section aria-labelledby="job-title" className="grid gap-6 card p-5 md:grid-cols-2">
              <h2 id="job-title" className="text-xl font-extrabold md:col-span-2">
                Labour and price
              </h2>
              {shown.labour ? (
                <div>
                  <h3 className="font-extrabold">Labour: {shown.labour.hours} h</h3>
                  <table className="mt-1 w-full text-sm">
                    <tbody className="divide-y divide-ash-200">
                      {shown.labour.tasks.map((t) => (
                        <tr key={t.task}>
                          <td className="py-1 pr-2">{t.label}</td>
                          <td className="py-1 text-right whitespace-nowrap tabular-nums">{t.hours} h</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                  {shown.unpricedItems?.length ? (
                    <p className="mt-2 text-sm text-ember-700" data-testid="unpriced-items">
                      Not in the price: {shown.unpricedItems.join(", ")}. Add{" "}
                      {shown.unpricedItems.length === 1 ? "it" : "them"} to your catalog to price{" "}
                      {shown.unpricedItems.length === 1 ? "it" : "them"}.
                    </p>
                  ) : null}
                </div>
              ) : null}
              {shown.price ? (
                <div>
                  <h3 className="font-extrabold">
                    Price range: {formatMoneyWhole(shown.price.lowCents)}–{formatMoneyWhole(shown.price.highCents)}
                  </h3>
                  <table className="mt-1 w-full text-sm" aria-label="Price breakdown">
                    <tbody className="divide-y divide-ash-200">
                      {describeBreakdown(shown.price).map((row) => (
                        <tr key={row.label} className={row.kind === "line" ? undefined : "font-extrabold"}>
                          <td className="py-1 pr-2">
                            {row.label}
                            {row.detail ? (
                              <span className="block text-xs font-normal text-char-600">{row.detail}</span>
                            ) : null}
                          </td>
                          <td className="py-1 text-right align-top whitespace-nowrap tabular-nums">
                            {formatMoney(row.cents)}
                          </td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                  <details className="mt-2 text-sm">
                    <summary className="cursor-pointer font-bold text-char-700">Material cost by line</summary>
                    <table className="mt-1 w-full">
                      <tbody className="divide-y divide-ash-200">
                        {shown.price.lines.map((line) => (
                          <tr key={line.item}>
                            <td className="py-1 pr-2">
                              {line.item} <span className="text-char-500">× {line.quantity}</span>
                            </td>
                            <td className="py-1 text-right tabular-nums">{formatMoney(line.totalCents)}</td>
                          </tr>
                        ))}
                      </tbody>
                    </table>
                  </details>
                </div>
              ) : (
                <p className="text-sm text-char-600">
                  No price: some items of this design have no cost in the catalog.
                </p>
              )}
            </section>
          ) : null}

          <section aria-labelledby="safety-title" className="card p-5">
            <h2 id="safety-title" className="mb-2 text-xl font-extrabold">
              Safety on site
            </h2>
            <CrewCautions cautions={shown.cautions} />
          </section>
        </div>

        <aside className="flex flex-col gap-6 lg:col-start-2 lg:row-start-2">
          {isOffice && team ? (
            <section id="work" aria-labelledby="work-title" className="flex scroll-mt-4 flex-col gap-5 card p-5">
              <h2 id="work-title" className="text-lg font-extrabold">
                Work the request
              </h2>
              <StageForm
                key={`${formKey}-status`}
                stageLabel={lead.stageLabel}
                moves={moves}
                errors={errorsFor("status")}
                submitted={actionData?.intent === "status" ? actionData.fields : null}
                isBusy={isBusy}
              />

              <Form key={`${formKey}-assign`} method="post" className="flex flex-col gap-2" noValidate>
                <input type="hidden" name="intent" value="assign" />
                <NotSaved errors={errorsFor("assign")} />
                <SelectField
                  label="Estimator"
                  name="assigneeId"
                  defaultValue={
                    typed("assign").assigneeId ?? (lead.assignedUserId === null ? "" : String(lead.assignedUserId))
                  }
                  error={errorsFor("assign").assigneeId}
                >
                  <option value="">Unassigned</option>
                  {team.estimators.map((m) => (
                    <option key={m.id} value={m.id}>
                      {m.name}
                      {m.isActive ? "" : " (inactive)"}
                    </option>
                  ))}
                </SelectField>
                <button type="submit" className="btn-quiet self-start" disabled={isBusy}>
                  Assign
                </button>
              </Form>

              {lead.isSigned ? (
                <Form key={`${formKey}-crew`} method="post" className="flex flex-col gap-2" noValidate>
                  <input type="hidden" name="intent" value="crew" />
                  <NotSaved errors={errorsFor("crew")} />
                  <SelectField
                    label="Crew"
                    name="crewUserId"
                    hint={
                      loaderData.build
                        ? `On the booked build: ${loaderData.build.crew}. The one chosen here leads the job and gets the cut sheet.`
                        : "The one chosen here leads the job and gets the cut sheet."
                    }
                    defaultValue={typed("crew").crewUserId ?? (lead.crewUserId === null ? "" : String(lead.crewUserId))}
                    error={errorsFor("crew").crewUserId}
                  >
                    <option value="">No crew yet</option>
                    {team.crew.map((m) => (
                      <option key={m.id} value={m.id}>
                        {m.name}
                        {m.isActive ? "" : " (inactive)"}
                      </option>
                    ))}
                  </SelectField>
                  <button type="submit" className="btn-quiet self-start" disabled={isBusy}>
                    Give the job to the crew
                  </button>
                </Form>
              ) : (
                <p className="text-sm text-char-600">
                  Once the job is signed and the deposit paid, give it to a crew here.
                </p>
              )}

              <Form key={`${formKey}-note`} method="post" className="flex flex-col gap-2" noValidate>
                <input type="hidden" name="intent" value="note" />
                <NotSaved errors={errorsFor("note")} />
                <label htmlFor="note" className="field-label">
                  Add a note
                </label>
                <textarea
                  id="note"
                  name="note"
                  rows={3}
                  maxLength={2000}
                  defaultValue={typed("note").note ?? ""}
                  aria-invalid={errorsFor("note").note ? true : undefined}
                  aria-describedby={errorsFor("note").note ? "note-error" : undefined}
                  className="field-input"
                />
                {errorsFor("note").note ? (
                  <p id="note-error" className="field-error">
                    {errorsFor("note").note}
                  </p>
                ) : null}
                <button type="submit" className="btn-quiet self-start" disabled={isBusy}>
                  Add note
                </button>
              </Form>
            </section>
          ) : null}

          {isOffice && (proposals.length || totals) ? (
            <ProposalsCard
              leadId={lead.id}
              proposals={proposals}
              totals={totals}
              isOwner={isOwner}
              errors={errorsFor("refund")}
              isBusy={isBusy}
            />
          ) : null}

          {balance ? <BalanceCard balance={balance} /> : null}
          {jobCost ? <JobCostCard cost={jobCost} /> : null}

          {isOffice ? (
            <section aria-labelledby="timeline-title" className="card p-5">
              <h2 id="timeline-title" className="text-lg font-extrabold">
                Timeline
              </h2>
              <ol className="mt-2 flex flex-col gap-3 text-sm">
                {timeline.map((t) => (
                  <li key={t.key} data-kind={t.kind} className="border-l-3 border-ash-300 pl-3">
                    <p className="font-bold text-char-800">{describeKind(t.kind)}</p>
                    <p className="break-words whitespace-pre-line">{t.detail}</p>
                    <p className="text-xs text-char-500">
                      {t.when}
                      {t.actorName ? ` · ${t.actorName}` : ""}
                    </p>
                  </li>
                ))}
              </ol>
            </section>
          ) : null}
        </aside>
      </div>
    </div>
  );
}

type LeadView = Route.ComponentProps["loaderData"]["lead"];
type ProposalView = Route.ComponentProps["loaderData"]["proposals"][number];

/** The job's proposals and change orders: where each stands, and what the office can do with it. */
function ProposalsCard({
  leadId,
  proposals,
  totals,
  isOwner,
  errors,
  isBusy,
}: {
  leadId: number;
  proposals: ProposalView[];
  totals: { contract: string; deposit: string; balance: string } | null;
  isOwner: boolean;
  errors: Record<string, string>;
  isBusy: boolean;
}) {
  return (
    <section aria-labelledby="proposals-title" className="flex flex-col gap-3 card p-5 text-sm">
      <h2 id="proposals-title" className="text-lg font-extrabold">
        Proposal and changes
      </h2>
      {totals ? (
        <dl className="grid grid-cols-[auto_1fr] gap-x-3 rounded-lg bg-ash-100 p-3">
          <dt className="font-bold">Job total</dt>
          <dd className="text-right tabular-nums">{totals.contract}</dd>
          <dt className="font-bold">Deposit paid</dt>
          <dd className="text-right tabular-nums">{totals.deposit}</dd>
          <dt className="font-bold">Balance on completion</dt>
          <dd className="text-right tabular-nums">{totals.balance}</dd>
        </dl>
      ) : null}
      <ul className="flex flex-col gap-3">
        {proposals.map((p) => (
          <li key={p.id} className="border-l-3 border-ash-300 pl-3">
            <p className="font-bold">
              <a href={p.href} className="text-ember-700 underline">
                {p.number}
              </a>
              : {p.stateLabel}
            </p>
            <p>
              {p.amount} · sent {p.sent} · {p.opened}
            </p>
            {p.signed ? <p>{p.signed}</p> : null}
            {p.deposit ? <p>{p.deposit}</p> : null}
            {p.refund ? <p>{p.refund}</p> : null}
            {p.expires ? <p className="text-char-600">Open to sign until {p.expires}</p> : null}
            <p>
              <a href={`${p.href}.pdf`} download className="font-bold text-ember-700 underline">
                PDF
              </a>
            </p>
            {p.canWithdraw ? (
              <Form
                method="post"
                action={`/app/leads/${leadId}/proposal`}
                className="mt-1 flex flex-wrap items-end gap-2"
              >
                <input type="hidden" name="intent" value="withdraw" />
                <input type="hidden" name="proposalId" value={p.id} />
                <label className="flex flex-col text-xs font-bold">
                  Why withdraw {p.number}
                  <input name="reason" required minLength={3} maxLength={200} className="field-input text-sm" />
                </label>
                <button type="submit" className="btn-quiet" disabled={isBusy}>
                  Withdraw
                </button>
              </Form>
            ) : null}
            {p.canRefund && isOwner ? (
              <Form method="post" className="mt-1 flex flex-wrap items-end gap-2">
                <input type="hidden" name="intent" value="refund" />
                <input type="hidden" name="proposalId" value={p.id} />
                <label className="flex flex-col text-xs font-bold">
                  Reason for refunding the deposit
                  <input
                    name="reason"
                    maxLength={200}
                    aria-invalid={errors.reason ? true : undefined}
                    className="field-input text-sm"
                  />
                </label>
                <button type="submit" className="btn-quiet" disabled={isBusy}>
                  Refund the deposit
                </button>
                {errors.reason ? <p className="field-error w-full">{errors.reason}</p> : null}
              </Form>
            ) : null}
          </li>
        ))}
      </ul>
    </section>
  );
}

/** Moves the job by hand; a refused move keeps what was chosen and typed. */
/** The summary a refused form opens with (it takes focus); each message stays beside its field. */
function NotSaved({ errors }: { errors: Record<string, string> }) {
  const count = Object.keys(errors).length;
  return count ? <FormAlert>Not saved: see the {count === 1 ? "message" : "messages"} below.</FormAlert> : null;
}

function StageForm({
  stageLabel,
  moves,
  errors,
  submitted,
  isBusy,
}: {
  stageLabel: string;
  moves: { to: string; label: string; needsReason: boolean }[];
  errors: Record<string, string>;
  submitted: Record<string, string> | null;
  isBusy: boolean;
}) {
  if (moves.length === 0)
    return <p className="text-sm text-char-600">Stage: {stageLabel}. It moves on with the next step above.</p>;
  return (
    <Form method="post" className="flex flex-col gap-2" noValidate>
      <input type="hidden" name="intent" value="status" />
      <NotSaved errors={errors} />
      <SelectField
        label={`Move the job (now: ${stageLabel})`}
        name="status"
        defaultValue={submitted?.status ?? moves[0]!.to}
        error={errors.status}
      >
        {moves.map((m) => (
          <option key={m.to} value={m.to}>
            {m.label}
          </option>
        ))}
      </SelectField>
      <label htmlFor="stage-reason" className="field-label">
        Why (for on hold or not going ahead)
      </label>
      <input
        id="stage-reason"
        name="reason"
        defaultValue={submitted?.reason ?? ""}
        maxLength={200}
        aria-invalid={errors.reason ? true : undefined}
        aria-describedby={errors.reason ? "stage-reason-error" : "stage-reason-hint"}
        className="field-input"
      />
      {errors.reason ? (
        <p id="stage-reason-error" className="field-error">
          {errors.reason}
        </p>
      ) : (
        <p id="stage-reason-hint" className="field-hint">
          Consult, visit, proposal and deposit move the job by themselves.
        </p>
      )}
      <button type="submit" className="btn-primary self-start" disabled={isBusy}>
        Move the job
      </button>
    </Form>
  );
}

function CustomerCard({ lead, isOffice }: { lead: LeadView; isOffice: boolean }) {
  return (
    <section aria-labelledby="customer-title" className="card p-5 text-sm">
      <h2 id="customer-title" className="text-lg font-extrabold">
        {isOffice ? "Customer" : "Site"}
      </h2>
      <p className="mt-2 font-bold">{lead.customerName}</p>
      <p>
        {lead.street}
        <br />
        {lead.town}
      </p>
      {lead.email ? (
        <p className="mt-2 break-all">
          <a href={`mailto:${lead.email}`} className="font-bold text-ember-700 hover:underline">
            {lead.email}
          </a>
        </p>
      ) : null}
      {lead.phone ? (
        <p>
          <a href={phoneHref(lead.phone)} className="font-bold text-ember-700 hover:underline">
            {formatPhone(lead.phone)}
          </a>
        </p>
      ) : null}
      <p className="mt-2 text-char-600">Hopes to build: {lead.buildWindow}</p>
      {lead.notes ? (
        <blockquote className="mt-3 border-l-3 border-ash-300 pl-3 text-char-700">{lead.notes}</blockquote>
      ) : null}
    </section>
  );
}

function SiteVisitCard({
  visit,
  leadId,
  isOffice,
}: {
  visit: NonNullable<Route.ComponentProps["loaderData"]["visit"]>;
  leadId: number;
  isOffice: boolean;
}) {
  return (
    <section aria-labelledby="visit-title" className="card p-5 text-sm">
      <div className="flex items-baseline justify-between gap-2">
        <h2 id="visit-title" className="text-lg font-extrabold">
          Site visit
        </h2>
        {isOffice ? (
          <Link to={`/app/leads/${leadId}/visit`} className="font-bold text-ember-700 underline">
            Edit
          </Link>
        ) : null}
      </div>
      <p className="text-xs text-char-600">Measured {visit.when}; these replace the homeowner's guesses.</p>
      <dl className="mt-2 grid gap-1">
        {visit.lines.map(([label, value]) => (
          <div key={label} className="flex flex-wrap gap-x-2">
            <dt className="font-bold text-char-700">{label}:</dt>
            <dd>{value}</dd>
          </div>
        ))}
      </dl>
      {visit.notes ? (
        <p className="mt-2 border-l-3 border-ash-300 pl-3 whitespace-pre-line text-char-700">{visit.notes}</p>
      ) : null}
      {visit.checks.length ? (
        <ul className="mt-3 list-disc rounded-lg border border-ember-300 bg-ember-50 py-2 pr-3 pl-7">
          {visit.checks.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      ) : (
        <p className="mt-3 font-semibold text-moss-700">Setback, access and ground check out.</p>
      )}
    </section>
  );
}

type PhotoSource = "homeowner" | "site-visit" | "progress" | "final";
const PHOTO_ORIGIN: Record<PhotoSource, { alt: string; caption: string }> = {
  homeowner: { alt: "Homeowner's", caption: "From the homeowner" },
  "site-visit": { alt: "Site visit", caption: "At the visit" },
  progress: { alt: "Build progress", caption: "During the build" },
  final: { alt: "Finished job", caption: "The finished job" },
};

function PhotoList({ photos }: { photos: { id: number; originalName: string; source: PhotoSource }[] }) {
  return (
    <section aria-labelledby="photos-title" className="card p-5">
      <h2 id="photos-title" className="text-lg font-extrabold">
        Yard photos
      </h2>
      {photos.length ? (
        <ul className="mt-2 grid grid-cols-2 gap-2">
          {photos.map((p) => (
            <li key={p.id}>
              <a
                href={`/photos/${p.id}`}
                target="_blank"
                rel="noreferrer"
                className="block overflow-hidden rounded-lg border border-ash-200"
              >
                <img
                  src={`/photos/${p.id}`}
                  alt={`${PHOTO_ORIGIN[p.source].alt} photo: ${p.originalName}`}
                  loading="lazy"
                  className="aspect-square w-full object-cover"
                />
              </a>
              <p className="mt-0.5 text-xs text-char-600">{PHOTO_ORIGIN[p.source].caption}</p>
            </li>
          ))}
        </ul>
      ) : (
        <p className="mt-1 text-sm text-char-600">No photos were sent.</p>
      )}
    </section>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
