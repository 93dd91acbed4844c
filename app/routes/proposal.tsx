import { useEffect, useRef, useState } from "react";
import { data, Form, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/proposal";
import { PitPlanSvg } from "~/components/pit-plan-svg";
import { PitPreview } from "~/components/pit-preview";
import { PublicShell } from "~/components/public-shell";
import { FormAlert } from "~/components/ui/field";
import { basePriceCents, depositCents, proposalTotalCents } from "~/domain/proposal-money";
import { formatInches } from "~/domain/units";
import { getCompany } from "~/lib/catalog/catalog.server";
import { describePreview, planToSceneInput } from "~/lib/design/design-plan";
import { appOrigin } from "~/lib/platform/email.server";
import { env } from "~/lib/platform/env.server";
import { formatMoney } from "~/lib/format/money";
import { jobTotalsFor } from "~/lib/proposals/change-orders.server";
import { describeDeposit } from "~/lib/proposals/proposal-document";
import { chosenAddOnsSchema } from "~/lib/proposals/proposal-schema";
import { startDepositCheckout } from "~/lib/proposals/proposal-payments.server";
import { CheckoutRefused } from "~/lib/platform/payments.server";
import { acceptProposal } from "~/lib/proposals/proposal-signing.server";
import { countsAsOpen, findProposalByToken, linkStateOf } from "~/lib/proposals/proposals.server";
import { readStoredPlan } from "~/lib/design/stored-plan";
import { resolveClientAddress } from "~/lib/platform/client-address";
import { clientAddress, createLimiter, socketAddressContext, spendLimit } from "~/lib/platform/rate-limit.server";
import { getSessionUser } from "~/lib/auth/session.server";
import { isOfficeRole } from "~/lib/auth/staff.server";
import { formatZonedDateTime } from "~/lib/format/zoned-time";
import { LabelledLines } from "~/components/labelled-lines";
import { readForm, textFields } from "~/lib/platform/forms.server";
import { toSingleLine } from "~/lib/format/clean-text";
import { formatPhone } from "~/lib/format/phone";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  {
    title: loaderData
      ? `${loaderData.document.number}: ${loaderData.document.title} · ${loaderData.document.letterhead.name}`
      : "Proposal · Emberwright",
  },
];

async function load(token: string) {
  const found = await findProposalByToken(token);
  if (!found) throw new Response("Not found", { status: 404 });
  return found;
}

// The link is the credential: anyone holding it may read and sign. The page counts the homeowner's
// visit by posting to /p/:token/opened once shown (a loader never writes); staff previews are not counted.
export async function loader({ request, params }: Route.LoaderArgs) {
  const { proposal, lead, document } = await load(params.token);
  const viewer = await getSessionUser(request);
  const isStaffPreview = viewer !== null && isOfficeRole(viewer.role) && viewer.companyId === proposal.companyId;
  const now = new Date();
  const state = linkStateOf(proposal, now);
  const company = await getCompany(proposal.companyId);
  // Drawn from the inputs stored with the proposal, never today's catalog.
  const { design, plan } = readStoredPlan({ designJson: proposal.designJson, planJson: proposal.planJson });
  const chosen = proposal.chosenAddOnsJson ? chosenAddOnsSchema.parse(JSON.parse(proposal.chosenAddOnsJson)) : [];
  const url = new URL(request.url);
  const totals = proposal.kind === "proposal" && state === "signed" ? await jobTotalsFor(proposal) : null;
  return {
    token: proposal.token,
    state,
    kind: proposal.kind,
    document,
    isStaffPreview,
    countsAsOpen: countsAsOpen(proposal, viewer, now),
    firstName: lead.customerName.split(" ")[0] ?? lead.customerName,
    sceneInput: proposal.kind === "proposal" ? planToSceneInput(plan, design.inputs.engine) : null,
    caption: describePreview(plan, "in"),
    base: basePriceCents(document.fixedPriceCents, document.allowances),
    chosen,
    signed: proposal.signedAt
      ? {
          name: proposal.signerName,
          when: formatZonedDateTime(proposal.signedAt, company.timeZone),
          total: proposal.totalCents,
          deposit: proposal.depositCents,
          sha256: proposal.acceptedPdfSha256,
        }
      : null,
    totals,
    withdrawReason: proposal.withdrawReason,
    didLeave: url.searchParams.has("left"),
    didPay: url.searchParams.has("paid"),
  };
}

const signSchema = z.object({
  intent: z.literal("sign"),
  signerName: z
    .string()
    .overwrite(toSingleLine)
    .trim()
    .min(3, "Type your full name as your signature (3 to 120 characters).")
    .max(120, "Type your full name as your signature (3 to 120 characters).")
    .refine((v) => /\S\s+\S/.test(v), "Type your full name, first and last, as your signature."),
  consent: z.literal("on", { error: "Tick the box to agree to sign electronically." }),
});

/** The signer's own address for the signature record (the limits use a coarser bucket). */
function signerAddress(request: Request, context: Route.ActionArgs["context"]): string {
  const socket = typeof context?.get === "function" ? context.get(socketAddressContext) : null;
  return resolveClientAddress(socket, request.headers.get("x-forwarded-for"), env.trustProxy) ?? "unknown";
}

const signLimiter = createLimiter("proposal-sign:address", env.PUBLIC_FORM_LIMIT, 10 * 60);

export async function action({ request, params, context }: Route.ActionArgs) {
  const limit = await spendLimit(signLimiter, clientAddress(request, context));
  if (!limit.ok)
    return data(
      {
        errors: { form: "Too many tries from this address. Please wait a few minutes." },
        fields: {} as Record<string, string>,
        chosen: [] as string[],
      },
      { status: 429, headers: { "Retry-After": String(limit.retryAfterSeconds) } },
    );
  const found = await load(params.token);
  const form = await readForm(request);
  const fields = textFields(form);
  const chosen = form.getAll("addOn").filter((v): v is string => typeof v === "string");
  const company = await getCompany(found.proposal.companyId);
  const origin = appOrigin(request);

  if (fields.intent === "pay") {
    return payDeposit(found, company, origin, fields, chosen);
  }
  const parsed = signSchema.safeParse(fields);
  if (!parsed.success) {
    const errors: Record<string, string> = {};
    for (const issue of parsed.error.issues) errors[String(issue.path[0])] ??= issue.message;
    return data({ errors, fields, chosen }, { status: 400 });
  }
  const accepted = await acceptProposal({
    proposal: found.proposal,
    lead: found.lead,
    document: found.document,
    input: {
      name: parsed.data.signerName,
      chosenKeys: chosen,
      ip: signerAddress(request, context),
      userAgent: (request.headers.get("User-Agent") ?? "unknown").slice(0, 300),
    },
  });
  if (!accepted.ok) return data({ errors: { form: accepted.message }, fields, chosen }, { status: accepted.status });
  if (accepted.proposal.status === "signed") return redirect(`/p/${params.token}`);
  return payDeposit({ ...found, proposal: accepted.proposal }, company, origin, fields, chosen);
}

async function payDeposit(
  found: Awaited<ReturnType<typeof load>>,
  company: Awaited<ReturnType<typeof getCompany>>,
  origin: string,
  fields: Record<string, string>,
  chosen: string[],
) {
  try {
    const url = await startDepositCheckout({ proposal: found.proposal, lead: found.lead, company, origin });
    return redirect(url, 303);
  } catch (error) {
    if (error instanceof CheckoutRefused)
      return data({ errors: { form: error.message }, fields, chosen }, { status: 409 });
    console.error("deposit checkout could not start", (error as Error).message);
    return data(
      {
        errors: {
          form: "Your signature is saved, but the payment service is not answering right now. Nothing was charged: try “Pay the deposit” again in a moment.",
        },
        fields,
        chosen,
      },
      { status: 503 },
    );
  }
}

/** Counts the homeowner's visit once the page is shown (not for staff previews or closed links). */
function useRecordOpen(token: string, counts: boolean) {
  const sent = useRef(false);
  useEffect(() => {
    if (!counts || sent.current) return;
    sent.current = true;
    void fetch(`/p/${token}/opened`, { method: "POST", keepalive: true }).catch(() => {});
  }, [token, counts]);
}

export default function ProposalRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { document, state, token, base, sceneInput, caption, signed, kind, firstName, totals } = loaderData;
  const isChange = kind === "change-order";
  const [chosen, setChosen] = useState<string[]>(actionData?.chosen ?? loaderData.chosen);
  const navigation = useNavigation();
  const isBusy = navigation.state !== "idle" && navigation.formMethod === "POST";
  const picked = document.addOns.filter((a) => chosen.includes(a.key));
  const total = proposalTotalCents(base, picked);
  const deposit = depositCents(document.deposit, total);
  const errors: Record<string, string> = actionData?.errors ?? {};
  const pdfHref = `/p/${token}.pdf${chosen.length && state === "open" ? `?addOns=${chosen.join(",")}` : ""}`;
  const what = isChange ? "change order" : "proposal";
  useRecordOpen(token, loaderData.countsAsOpen);

  return (
    <PublicShell right={<span className="text-sm font-bold text-char-700">{document.letterhead.name}</span>}>
      <main className="mx-auto flex max-w-4xl flex-col gap-6 px-4 py-8 sm:px-6">
        <header className="flex flex-col gap-1">
          <p className="text-sm font-extrabold tracking-widest text-ember-700 uppercase">{document.number}</p>
          <h1 className="text-3xl font-extrabold">{document.title}</h1>
          <p className="text-char-700">
            For {document.customer.name}, {document.customer.street}, {document.customer.town}. From{" "}
            {document.letterhead.name}
            {document.letterhead.phone ? ` (${formatPhone(document.letterhead.phone)})` : ""}
            {document.letterhead.licence ? `, licence ${document.letterhead.licence}` : ""}. Prepared{" "}
            {document.preparedOn}; open to sign until {document.validUntil}.
          </p>
          {loaderData.isStaffPreview ? (
            <p className="text-sm font-bold text-char-600">
              You are viewing this as staff: your visit is not counted as opened.
            </p>
          ) : null}
        </header>

        {state === "expired" ? (
          <StateNotice title={`This ${what} has expired`}>
            It was open to sign until {document.validUntil} and can no longer be signed. Ask {document.letterhead.name}{" "}
            for a new one
            {document.letterhead.phone ? ` at ${formatPhone(document.letterhead.phone)}` : ""}.
          </StateNotice>
        ) : null}
        {state === "withdrawn" ? (
          <StateNotice title={`This ${what} was withdrawn`}>
            {document.letterhead.name} withdrew it{loaderData.withdrawReason ? `: ${loaderData.withdrawReason}` : "."}{" "}
            It can no longer be signed.
          </StateNotice>
        ) : null}
        {state === "accepted" && signed ? (
          <section aria-labelledby="deposit-title" className="card border-l-4 border-l-ember-500 p-5">
            <h2 id="deposit-title" className="text-xl font-extrabold">
              Signed: one step left, the deposit
            </h2>
            <p className="mt-1">
              {signed.name} signed on {signed.when}. The job is booked once the deposit of{" "}
              {formatMoney(signed.deposit ?? 0)} is paid
              {loaderData.didLeave ? ". You left the payment page, so nothing was charged." : "."}
            </p>
            {errors.form ? (
              <div className="mt-3">
                <FormAlert>{errors.form}</FormAlert>
              </div>
            ) : null}
            <Form method="post" className="mt-3">
              <input type="hidden" name="intent" value="pay" />
              <button type="submit" className="btn-primary" disabled={isBusy}>
                Pay the deposit of {formatMoney(signed.deposit ?? 0)}
              </button>
            </Form>
          </section>
        ) : null}
        {state === "signed" && signed ? (
          <section aria-labelledby="signed-title" className="card border-l-4 border-l-moss-600 p-5">
            <h2 id="signed-title" className="text-xl font-extrabold">
              {isChange ? "Change order signed" : "Signed and deposit paid"}
            </h2>
            <p className="mt-1">
              {signed.name} signed on {signed.when}
              {isChange ? "." : `. Thank you, ${firstName}: the job is booked with ${document.letterhead.name}.`}
            </p>
            {totals ? (
              <p className="mt-1">
                The job: {formatMoney(totals.contractCents)}; deposit paid {formatMoney(totals.depositCents)};{" "}
                {totals.balanceCents >= 0
                  ? `balance on completion ${formatMoney(totals.balanceCents)}`
                  : `credit due to you ${formatMoney(-totals.balanceCents)}`}
                .
              </p>
            ) : null}
            <p className="mt-1 text-xs break-all text-char-600">SHA-256 of the PDF you accepted: {signed.sha256}</p>
          </section>
        ) : null}

        {sceneInput ? (
          <section aria-labelledby="design-title" className="flex flex-col gap-3">
            <h2 id="design-title" className="text-xl font-extrabold">
              The design
            </h2>
            <div className="grid gap-4 md:grid-cols-2">
              <PitPreview input={sceneInput} caption={caption} unit="in" formatLength={formatInches} />
              <figure className="overflow-hidden card">
                <div className="aspect-square bg-white p-2 sm:aspect-[4/3]">
                  <PitPlanSvg input={sceneInput} unit="in" formatLength={formatInches} className="h-full w-full" />
                </div>
                <figcaption className="border-t border-ash-200 px-4 py-3 text-sm text-char-700">
                  Plan, first course and caps (dashed), to scale.
                </figcaption>
              </figure>
            </div>
            <LabelledLines lines={document.design} className="grid gap-x-6 gap-y-1 card p-4 text-sm sm:grid-cols-2" />
          </section>
        ) : null}

        {document.change ? (
          <section aria-labelledby="change-title" className="card p-5">
            <h2 id="change-title" className="text-xl font-extrabold">
              What changes
            </h2>
            {document.change.added.length ? (
              <>
                <h3 className="mt-2 font-extrabold">Added or changed</h3>
                <ul className="list-disc pl-5">
                  {document.change.added.map((l) => (
                    <li key={l}>{l}</li>
                  ))}
                </ul>
              </>
            ) : null}
            {document.change.removed.length ? (
              <>
                <h3 className="mt-2 font-extrabold">No longer part of the job</h3>
                <ul className="list-disc pl-5">
                  {document.change.removed.map((l) => (
                    <li key={l}>{l}</li>
                  ))}
                </ul>
              </>
            ) : null}
            <table className="mt-3 w-full text-sm">
              <tbody className="divide-y divide-ash-200">
                <tr>
                  <td className="py-1">The job as signed so far</td>
                  <td className="py-1 text-right tabular-nums">{formatMoney(document.change.previousContractCents)}</td>
                </tr>
                <tr>
                  <td className="py-1">
                    {document.change.deltaCents >= 0 ? "This change adds" : "This change credits"}
                  </td>
                  <td className="py-1 text-right tabular-nums">{formatMoney(document.change.deltaCents)}</td>
                </tr>
                <tr className="font-extrabold">
                  <td className="py-1">The job with this change</td>
                  <td className="py-1 text-right tabular-nums">
                    {formatMoney(document.change.previousContractCents + document.change.deltaCents)}
                  </td>
                </tr>
              </tbody>
            </table>
            <p className="mt-2 text-sm text-char-600">
              The difference is added to (or credited against) the balance due on completion.
            </p>
          </section>
        ) : (
          <>
            <section aria-labelledby="scope-title" className="card p-5">
              <h2 id="scope-title" className="text-xl font-extrabold">
                Scope of work
              </h2>
              <ul className="mt-2 list-disc pl-5">
                {document.scope.map((l) => (
                  <li key={l}>{l}</li>
                ))}
              </ul>
              {document.siteFacts.length ? (
                <>
                  <h3 className="mt-4 font-extrabold">What we measured at the site visit</h3>
                  <ul className="list-disc pl-5">
                    {document.siteFacts.map((l) => (
                      <li key={l}>{l}</li>
                    ))}
                  </ul>
                </>
              ) : null}
            </section>
            <section aria-labelledby="price-title" className="card p-5">
              <h2 id="price-title" className="text-xl font-extrabold">
                Price
              </h2>
              <table className="mt-2 w-full text-sm">
                <tbody className="divide-y divide-ash-200">
                  <tr>
                    <td className="py-1.5">Fixed price for the work above</td>
                    <td className="py-1.5 text-right tabular-nums">{formatMoney(document.fixedPriceCents)}</td>
                  </tr>
                  {document.allowances.map((a) => (
                    <tr key={a.key}>
                      <td className="py-1.5">{a.label}</td>
                      <td className="py-1.5 text-right tabular-nums">{formatMoney(a.cents)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
              {document.addOns.length ? (
                <fieldset className="mt-3" form="sign-form" disabled={state !== "open"}>
                  <legend className="font-extrabold">Optional add-ons</legend>
                  <ul className="mt-1 flex flex-col gap-1">
                    {document.addOns.map((a) => (
                      <li key={a.key}>
                        <label className="flex items-center gap-2 text-sm">
                          <input
                            type="checkbox"
                            name="addOn"
                            value={a.key}
                            form="sign-form"
                            checked={chosen.includes(a.key)}
                            onChange={(e) =>
                              setChosen((now) => (e.target.checked ? [...now, a.key] : now.filter((k) => k !== a.key)))
                            }
                            className="size-4 accent-ember-600"
                          />
                          <span className="flex-1">{a.label}</span>
                          <span className="tabular-nums">{formatMoney(a.cents)}</span>
                        </label>
                      </li>
                    ))}
                  </ul>
                </fieldset>
              ) : null}
              <p
                className="mt-3 flex justify-between border-t-2 border-char-800 pt-2 text-lg font-extrabold"
                aria-live="polite"
              >
                <span>Total</span>
                <span className="tabular-nums" data-testid="proposal-total">
                  {formatMoney(signed?.total ?? total)}
                </span>
              </p>
              <h3 className="mt-4 font-extrabold">Payment schedule</h3>
              <ul className="text-sm">
                <li>
                  Deposit on signing ({describeDeposit(document.deposit)}):{" "}
                  <strong className="tabular-nums">{formatMoney(signed?.deposit ?? deposit)}</strong>
                </li>
                <li>
                  Balance on completion:{" "}
                  <strong className="tabular-nums">
                    {formatMoney((signed?.total ?? total) - (signed?.deposit ?? deposit))}
                  </strong>
                </li>
              </ul>
            </section>
            <section aria-labelledby="terms-title" className="grid gap-4 card p-5 sm:grid-cols-2">
              <h2 id="terms-title" className="text-xl font-extrabold sm:col-span-2">
                Terms
              </h2>
              <div>
                <h3 className="font-extrabold">Included</h3>
                <ul className="list-disc pl-5 text-sm">
                  {document.included.map((l) => (
                    <li key={l}>{l}</li>
                  ))}
                </ul>
              </div>
              <div>
                <h3 className="font-extrabold">Not included</h3>
                <ul className="list-disc pl-5 text-sm">
                  {document.excluded.map((l) => (
                    <li key={l}>{l}</li>
                  ))}
                </ul>
              </div>
            </section>
          </>
        )}

        <section aria-labelledby="cautions-title" className="card p-5">
          <h2 id="cautions-title" className="text-xl font-extrabold">
            Codes and cautions
          </h2>
          <ul className="mt-2 list-disc pl-5 text-sm">
            {document.cautions.map((l) => (
              <li key={l}>{l}</li>
            ))}
          </ul>
        </section>

        <p>
          <a href={pdfHref} download className="font-bold text-ember-700 underline">
            Download the {what} as a PDF{state === "signed" || state === "accepted" ? " (signed copy)" : ""}
          </a>
        </p>

        {state === "open" ? (
          <section aria-labelledby="sign-title" className="card border-l-4 border-l-ember-500 p-5">
            <h2 id="sign-title" className="text-xl font-extrabold">
              Sign {isChange ? "the change order" : "the proposal"}
            </h2>
            {errors.form || errors.signerName || errors.consent ? (
              <div className="mt-2">
                {/* Takes focus after a refused signature, so keyboard and screen-reader users hear why. */}
                <FormAlert>
                  {errors.form ??
                    `Not signed yet: ${[errors.signerName, errors.consent].filter(Boolean).join(" ")} Fix the marked ${errors.signerName && errors.consent ? "fields" : "field"} below.`}
                </FormAlert>
              </div>
            ) : null}
            <Form id="sign-form" method="post" className="mt-3 flex flex-col gap-3" noValidate>
              <input type="hidden" name="intent" value="sign" />
              <div>
                <label htmlFor="signer-name" className="field-label">
                  Your full name, as your signature
                </label>
                <input
                  id="signer-name"
                  name="signerName"
                  autoComplete="name"
                  defaultValue={actionData?.fields.signerName ?? ""}
                  aria-invalid={errors.signerName ? true : undefined}
                  aria-describedby={errors.signerName ? "signer-name-error" : undefined}
                  className="field-input max-w-md"
                />
                {errors.signerName ? (
                  <p id="signer-name-error" className="field-error">
                    {errors.signerName}
                  </p>
                ) : null}
              </div>
              <div>
                <label className="flex items-start gap-2 text-sm">
                  <input
                    type="checkbox"
                    name="consent"
                    defaultChecked={actionData?.fields.consent === "on"}
                    aria-invalid={errors.consent ? true : undefined}
                    aria-describedby={errors.consent ? "consent-error" : undefined}
                    className="mt-1 size-4 accent-ember-600"
                  />
                  <span>
                    I agree to sign this {what} electronically, and that my typed name is my signature. I can download a
                    copy to keep (the PDF above, and the signed copy by e-mail).
                  </span>
                </label>
                {errors.consent ? (
                  <p id="consent-error" className="field-error">
                    {errors.consent}
                  </p>
                ) : null}
              </div>
              <button type="submit" className="btn-primary self-start" disabled={isBusy}>
                {isChange ? "Sign the change order" : `Sign and pay the deposit of ${formatMoney(deposit)}`}
              </button>
              <p className="text-xs text-char-600">
                We record your name, the time, your address and browser, the add-ons you chose and a fingerprint
                (SHA-256) of the exact PDF you accept.
              </p>
            </Form>
          </section>
        ) : null}
      </main>
    </PublicShell>
  );
}

function StateNotice({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <section role="status" className="card border-l-4 border-l-char-600 p-5">
      <h2 className="text-xl font-extrabold">{title}</h2>
      <p className="mt-1">{children}</p>
    </section>
  );
}
