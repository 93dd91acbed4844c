import { findCompanyBySlug, listCatalog } from "~/lib/catalog/catalog.server";
import { planForDesign, recordPlan, toCatalogChoice } from "~/lib/design/configurator.server";
import { publicFactors, readCompanyFactors } from "~/lib/settings/factor-settings";
import { parseDesign } from "~/lib/design/design";
import { summarizeDesign, type PublicPlan } from "~/lib/design/design-plan";
import { appOrigin } from "~/lib/platform/email.server";
import { env } from "~/lib/platform/env.server";
import { fieldErrors } from "~/lib/format/form-fields";
import { leadFormSchema } from "~/lib/leads/lead-schema";
import { createLead, PhotoQuotaExceeded, photoBytesToday } from "~/lib/leads/leads.server";
import { summaryInUnit } from "~/lib/format/length-text";
import type { PlanFieldError } from "~/lib/design/plan-schema";
import { publicPlan } from "~/lib/design/plan.server";
import { clientAddress, createLimiter, spendLimit } from "~/lib/platform/rate-limit.server";
import {
  checkReceivedPhotos,
  discardReceivedPhotos,
  MAX_COMPANY_PHOTO_BYTES_PER_DAY,
  MAX_FORM_BYTES,
  readLeadForm,
  storeReceivedPhotos,
} from "~/lib/platform/uploads.server";

export type LeadRequestOutcome =
  | { ok: true; location: string }
  | {
      ok: false;
      status: number;
      errors: Record<string, string>;
      values: Record<string, string>;
      headers?: Record<string, string>;
    };

/**
 * A contractor by its public slug, with its active catalog as the configurator sees it and the factors the browser may
 * see; 404 when unknown.
 */
export async function loadCompanyCatalog(slug: string) {
  const company = await findCompanyBySlug(slug);
  if (!company) throw new Response("Not found", { status: 404 });
  const catalog = (await listCatalog(company.id, { activeOnly: true })).map(toCatalogChoice);
  return { company, catalog, factors: publicFactors(readCompanyFactors(company)) };
}

const refused = (
  status: number,
  errors: Record<string, string>,
  values: Record<string, string>,
  headers?: Record<string, string>,
): LeadRequestOutcome => ({
  ok: false,
  status,
  errors,
  values,
  ...(headers ? { headers } : {}),
});

// Requests from one address to one company in 10 minutes; honest households send one or two. Keyed
// by company too, so a bot on one contractor's page cannot close every contractor's form.
const requestLimiter = createLimiter("lead-request:company+address", env.PUBLIC_FORM_LIMIT, 10 * 60);

/**
 * Reads and answers a homeowner's request form: the configurator's action (a plain form post) and
 * the upload endpoint its enhanced form posts to (with progress) share every check through here.
 */
export async function receiveLeadRequest({
  request,
  companySlug,
  context,
}: {
  request: Request;
  companySlug: string;
  context: Parameters<typeof clientAddress>[1];
}): Promise<LeadRequestOutcome> {
  const { company, catalog, factors } = await loadCompanyCatalog(companySlug);
  const limit = await spendLimit(requestLimiter, `${company.id}|${clientAddress(request, context)}`);
  if (!limit.ok) {
    return refused(
      429,
      { form: "Too many requests from this address. Please wait a few minutes and try again." },
      {},
      { "Retry-After": String(limit.retryAfterSeconds) },
    );
  }
  const length = Number(request.headers.get("Content-Length") ?? "NaN");
  if (!Number.isFinite(length) || length > MAX_FORM_BYTES) {
    return refused(413, { photos: "The request is too large: attach at most 6 photos of 10 MB each." }, {});
  }
  // Photos stream to temporary files as they arrive; the limits stop the reading itself.
  const reading = await readLeadForm(request);
  if (!reading.ok) return refused(reading.status, reading.errors, {});
  const { fields, photos: received } = reading;
  const parsed = leadFormSchema.safeParse(fields);
  const { website: _honeypot, ...values } = fields;
  const errors: Record<string, string> = parsed.success ? {} : fieldErrors(parsed.error);
  const design = parsed.success ? parseDesign(new URLSearchParams(fields.design ?? ""), catalog) : null;
  const result = design
    ? await planForDesign(company.slug, design, catalog, factors)
    : { plan: null, errors: [] as PlanFieldError[] };
  if (!parsed.success || !design || !result.plan) {
    // Only the quick checks here: nothing is decoded for a request that is refused anyway.
    const quick = await checkReceivedPhotos(received);
    await discardReceivedPhotos(received);
    if (!quick.ok) errors.photos = quick.message;
    if (!parsed.success || !quick.ok) return refused(400, errors, values);
    const message = result.errors[0]?.message ?? "This design cannot be built as it stands.";
    return refused(422, { form: `Change the design first: ${message}` }, values);
  }
  const quotaRefusal = () =>
    refused(429, { photos: new PhotoQuotaExceeded().message }, values, { "Retry-After": "3600" });
  if (received.length && (await photoBytesToday(undefined, company.id)) >= MAX_COMPANY_PHOTO_BYTES_PER_DAY) {
    await discardReceivedPhotos(received);
    return quotaRefusal();
  }
  const stored = await storeReceivedPhotos(received);
  if (!stored.ok) return refused(400, { photos: stored.message }, values);
  const { plan } = result;
  // The stored record (lead page, cut sheet, PDF) stays in inches for the crew; the e-mails speak the homeowner's
  // chosen unit.
  const summary = summarizeDesign(publicPlan(plan) as PublicPlan, design, catalog, "in");
  const summaryInChosenUnit = summaryInUnit(summary, design.unit);
  let lead: Awaited<ReturnType<typeof createLead>>;
  try {
    lead = await createLead({
      company,
      form: parsed.data,
      photos: stored.photos,
      origin: appOrigin(request),
      snapshot: {
        record: recordPlan({ design, summary, resolved: result.resolved, plan }),
        stoneName: catalog.find((i) => i.id === design.stoneId)?.name ?? "",
        bowlDiameterIn: plan.ring.bowlDiameterIn,
        priceLowCents: plan.price?.lowCents ?? null,
        priceHighCents: plan.price?.highCents ?? null,
        summary: summaryInChosenUnit,
      },
    });
  } catch (error) {
    // createLead deletes the stored photos itself when it fails; nothing of the request is kept.
    if (error instanceof PhotoQuotaExceeded) return quotaRefusal();
    throw error;
  }
  return { ok: true, location: `/c/${company.slug}/sent/${lead.ref}` };
}
