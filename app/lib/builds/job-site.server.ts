import { randomUUID } from "node:crypto";
import { and, asc, eq, inArray } from "drizzle-orm";
import {
  catalogItems,
  jobExtras,
  jobHours,
  jobStepTicks,
  leadEvents,
  leadPhotos,
  users,
  type Lead,
  type LeadStatus,
} from "~/db/schema";
import { listBuildSteps, type BuildStep } from "~/domain/build-steps";
import { resolveFactors } from "~/domain/factors";
import type { Caution } from "~/domain/advice";
import { formatInches } from "~/domain/units";
import type { SessionUser } from "~/lib/auth/session.server";
import { findBookedBuild, describeBuildDays } from "~/lib/builds/builds.server";
import { markJobBuilt } from "~/lib/builds/mark-built.server";
import type { ExtraInput, HoursInput, TickChange } from "~/lib/builds/job-site-schema";
import { getCompany } from "~/lib/catalog/catalog.server";
import { crewCautionsOf } from "~/lib/cut-sheet/cut-list";
import { refreshStoredPlan } from "~/lib/design/plan-refresh.server";
import { formatMoney } from "~/lib/format/money";
import { zonedDay } from "~/lib/format/zoned-time";
import { listPhotos, listRevisions, originalVersion } from "~/lib/leads/lead-workspace.server";
import { PhotoQuotaExceeded, photoBytesToday } from "~/lib/leads/leads.server";
import { findSiteVisit } from "~/lib/leads/site-visit.server";
import { SLOPE_LABEL, SOIL_LABEL, SPOIL_LABEL, UTILITY_LABEL } from "~/lib/leads/site-visit-schema";
import { db, writeTransaction } from "~/lib/platform/db.server";
import { deleteStoredPhotos, MAX_COMPANY_PHOTO_BYTES_PER_DAY, type StoredPhoto } from "~/lib/platform/uploads.server";

/*
 * A signed job on site: what the crew reads (the plan's figures, the site notes and photos, the
 * build days, the checklist and the cautions) and what they record (ticks, hours, extra material,
 * photos, "built"). Every record writes a timeline event with it, in the same transaction.
 */

/** Who may record on a job: its crew (the page's access check has let them in already) and the owner. */
export function canRecordOnJob(user: Pick<SessionUser, "role">): boolean {
  return user.role === "crew" || user.role === "owner";
}

/** The steps of the job's checklist, from the design it is built to (the latest revision). */
export async function jobBuildSteps(
  lead: Lead,
): Promise<{ steps: BuildStep[]; cautions: Caution[]; figures: Figure[] }> {
  const revisions = await listRevisions(lead);
  const version = revisions.at(-1) ?? originalVersion(lead);
  const { plan } = refreshStoredPlan(version);
  const factors = resolveFactors(version.design.inputs.factors);
  const steps = listBuildSteps({
    ring: plan.ring,
    caps: plan.caps,
    liner: plan.liner,
    patio: plan.patio,
    base: plan.base,
    adhesive: {
      gluedCourses: typeof plan.adhesive.gluedCourses === "number" ? plan.adhesive.gluedCourses : undefined,
      gluedCaps: typeof plan.adhesive.gluedCaps === "boolean" ? plan.adhesive.gluedCaps : undefined,
    },
    baseDepthIn: factors.baseDepthIn,
    patioBaseDepthIn: factors.patioBaseDepthIn,
  });
  const f = formatInches;
  const figures: Figure[] = [
    { label: "Bowl", value: `${f(plan.ring.bowlDiameterIn)} inside, ${f(plan.ring.outsideDiameterIn)} outside` },
    { label: "Wall", value: `${plan.ring.courses} courses of ${plan.ring.unitsPerCourse}, ${lead.stoneName}` },
    { label: "Height", value: `${f(plan.ring.wallHeightIn)} with the cap` },
    { label: "Layout radius", value: f(plan.ring.edgeDistanceIn) },
    { label: "Caps", value: plan.caps ? `${plan.caps.count}, ${f(plan.caps.thicknessIn)} thick` : "None" },
    {
      label: "Liner",
      value:
        plan.liner?.kind === "steel-ring"
          ? `Steel ring, ${f(plan.liner.outsideDiameterIn)} across`
          : plan.liner?.kind === "firebrick"
            ? `Firebrick, ${plan.liner.totalBricks} bricks`
            : "None",
    },
  ];
  if (plan.patio) figures.push({ label: "Patio", value: `${f(plan.patio.outsideRadiusIn * 2)} across` });
  return { steps, cautions: crewCautionsOf(plan.cautions), figures };
}

export type Figure = { label: string; value: string };
export type StepState = { done: boolean; changedAt: string; byName: string | null };

/** Everything the job page shows. Money (extras' costs) only for the office. */
export async function loadJobSite(user: SessionUser, lead: Lead) {
  const isOffice = user.role === "owner" || user.role === "estimator";
  const [company, { steps, cautions, figures }, build, visit, photos, ticks, hours, extras] = await Promise.all([
    getCompany(lead.companyId),
    jobBuildSteps(lead),
    findBookedBuild(lead),
    findSiteVisit(lead),
    listPhotos(lead),
    listTicks(lead),
    listHours(lead),
    listExtras(lead),
  ]);
  const workers = await jobWorkers(lead, build?.crew ?? null);
  const catalog = canRecordOnJob(user)
    ? await db
        .select({ id: catalogItems.id, name: catalogItems.name, kind: catalogItems.kind })
        .from(catalogItems)
        .where(and(eq(catalogItems.companyId, lead.companyId), eq(catalogItems.isActive, true)))
        .orderBy(asc(catalogItems.name))
    : [];
  return {
    today: zonedDay(new Date(), company.timeZone),
    steps,
    ticks,
    figures,
    cautions,
    build: build
      ? { dates: build.dates, days: describeBuildDays(build.dates), crew: build.crew, notes: build.notes }
      : null,
    visit: visit
      ? {
          notes: visit.notes,
          lines: [
            { label: "Nearest structure", value: `${visit.structureFt} ft` },
            { label: "Property line", value: `${visit.propertyLineFt} ft` },
            { label: "Slope", value: SLOPE_LABEL[visit.slope] },
            { label: "Soil", value: SOIL_LABEL[visit.soil] },
            { label: "Access", value: `${formatInches(visit.accessWidthIn)} at the narrowest` },
            { label: "Utilities", value: UTILITY_LABEL[visit.utilityMarks] },
            { label: "Dug soil", value: SPOIL_LABEL[visit.spoil] },
          ],
        }
      : null,
    photos,
    workers,
    hours: hours.map((h) => ({ id: h.id, workerName: h.workerName, day: h.day, hours: h.hours })),
    extras: extras.map((e) => ({
      id: e.id,
      description: e.description,
      quantity: e.quantity,
      ...(isOffice ? { cost: formatMoney(e.costCents) } : {}),
    })),
    catalog,
    // A fresh id per page load: a form posted twice (a double tap, a retry) is kept once.
    formClientId: randomUUID(),
  };
}

/** The people who may be named on the job's hours: the booked build's crew, else the job's crew member. */
async function jobWorkers(lead: Lead, buildCrew: { id: number; name: string }[] | null) {
  if (buildCrew && buildCrew.length) return buildCrew;
  if (lead.crewUserId === null) return [];
  return db
    .select({ id: users.id, name: users.name })
    .from(users)
    .where(and(eq(users.id, lead.crewUserId), eq(users.companyId, lead.companyId)));
}

export async function listTicks(lead: Pick<Lead, "id" | "companyId">): Promise<Record<string, StepState>> {
  const rows = await db
    .select({ tick: jobStepTicks, byName: users.name })
    .from(jobStepTicks)
    .leftJoin(users, eq(users.id, jobStepTicks.byUserId))
    .where(and(eq(jobStepTicks.leadId, lead.id), eq(jobStepTicks.companyId, lead.companyId)));
  return Object.fromEntries(
    rows.map((r) => [r.tick.stepKey, { done: r.tick.done, changedAt: r.tick.changedAt, byName: r.byName }]),
  );
}

function listHours(lead: Pick<Lead, "id" | "companyId">) {
  return db
    .select({ id: jobHours.id, day: jobHours.day, hours: jobHours.hours, workerName: users.name })
    .from(jobHours)
    .innerJoin(users, eq(users.id, jobHours.workerUserId))
    .where(and(eq(jobHours.leadId, lead.id), eq(jobHours.companyId, lead.companyId)))
    .orderBy(asc(jobHours.day), asc(users.name));
}

function listExtras(lead: Pick<Lead, "id" | "companyId">) {
  return db
    .select()
    .from(jobExtras)
    .where(and(eq(jobExtras.leadId, lead.id), eq(jobExtras.companyId, lead.companyId)))
    .orderBy(asc(jobExtras.id));
}

export type TickSyncResult = {
  /** Changes now recorded (or recorded before: the same clientId sent again). */
  applied: string[];
  /** Changes older than what the step already holds: acknowledged, not recorded. */
  superseded: string[];
  /** Changes for steps this job does not have. */
  refused: { clientId: string; message: string }[];
  ticks: Record<string, StepState>;
};

/** How far ahead of the server's clock a phone's changedAt may be (clocks drift a little). */
export const TICK_CLOCK_SKEW_MS = 5 * 60_000;
/** How far back a queued change may be: a phone kept offline longer has the wrong date. */
export const TICK_MAX_AGE_MS = 366 * 86_400_000;

/**
 * Records tick changes sent by a phone, each clientId once; per step the change the phone made
 * last (by its changedAt) wins, whatever order they arrive in. Ties go to the larger clientId so
 * every server decides alike. Times are compared as instants and stored in one form
 * (toISOString): "10:00:00Z" and "10:00:00.500Z" do not sort as text. A changedAt more than a few
 * minutes ahead of the server, or over a year back, is refused: a phone with a wrong clock would
 * otherwise hold the step against every later change. The whole batch and its timeline events are
 * one transaction.
 */
export async function applyTickChanges(
  user: Pick<SessionUser, "id">,
  lead: Lead,
  changes: TickChange[],
  stepKeys: readonly BuildStep[],
  now: Date = new Date(),
): Promise<TickSyncResult> {
  const titles = new Map(stepKeys.map((s) => [s.key, s.title]));
  const result: TickSyncResult = { applied: [], superseded: [], refused: [], ticks: {} };
  const latest = now.getTime() + TICK_CLOCK_SKEW_MS;
  const earliest = now.getTime() - TICK_MAX_AGE_MS;
  const accepted: (TickChange & { at: number })[] = [];
  const seen = new Map<string, string>();
  for (const change of changes) {
    const at = Date.parse(change.changedAt);
    const refuse = (message: string) => result.refused.push({ clientId: change.clientId, message });
    const fingerprint = `${change.stepKey}|${change.done}|${at}`;
    const earlier = seen.get(change.clientId);
    if (earlier !== undefined) {
      // The same change sent twice in one batch counts once; one id for two changes is refused.
      if (earlier !== fingerprint)
        refuse(`clientId ${change.clientId} names two different changes: give each change its own id.`);
      continue;
    }
    seen.set(change.clientId, fingerprint);
    if (!titles.has(change.stepKey)) refuse(`This job has no step "${change.stepKey}".`);
    else if (at > latest)
      refuse(
        `changedAt ${change.changedAt} is ahead of the server's clock (${now.toISOString()}): check the phone's date and time.`,
      );
    else if (at < earliest)
      refuse(`changedAt ${change.changedAt} is more than a year ago: check the phone's date and time.`);
    else accepted.push({ ...change, changedAt: new Date(at).toISOString(), at });
  }
  // Oldest first, so a batch holding two changes of one step ends on the later.
  accepted.sort((a, b) => (a.at === b.at ? (a.clientId < b.clientId ? -1 : 1) : a.at - b.at));
  const updatedAt = now.toISOString();
  await writeTransaction(async (tx) => {
    for (const change of accepted) {
      const title = titles.get(change.stepKey)!;
      const [held] = await tx
        .select()
        .from(jobStepTicks)
        .where(and(eq(jobStepTicks.leadId, lead.id), eq(jobStepTicks.stepKey, change.stepKey)))
        .limit(1);
      if (held?.clientId === change.clientId) {
        result.applied.push(change.clientId);
        continue;
      }
      const heldAt = held ? Date.parse(held.changedAt) : null;
      const isNewer =
        heldAt === null ||
        Number.isNaN(heldAt) ||
        heldAt < change.at ||
        (heldAt === change.at && held!.clientId < change.clientId);
      if (!isNewer) {
        result.superseded.push(change.clientId);
        continue;
      }
      const values = {
        done: change.done,
        changedAt: change.changedAt,
        clientId: change.clientId,
        byUserId: user.id,
        updatedAt,
      };
      await tx
        .insert(jobStepTicks)
        .values({ ...values, companyId: lead.companyId, leadId: lead.id, stepKey: change.stepKey })
        .onConflictDoUpdate({ target: [jobStepTicks.leadId, jobStepTicks.stepKey], set: values });
      result.applied.push(change.clientId);
      if (held?.done === change.done) continue;
      await tx.insert(leadEvents).values({
        companyId: lead.companyId,
        leadId: lead.id,
        actorUserId: user.id,
        kind: "build-step",
        detail: `${change.done ? "Done" : "Not done after all"}: ${title}.`,
        createdAt: updatedAt,
      });
    }
  });
  result.ticks = await listTicks(lead);
  return result;
}

export type RecordResult = { ok: true } | { ok: false; status: 400 | 404 | 409 | 429; errors: Record<string, string> };

const describeDay = (day: string) => describeBuildDays([day]);
const hoursText = (h: number) => `${h} h`;

/**
 * Records the hours one person worked on one day of the job (a second entry for the same person
 * and day replaces the first). The person must be on the job's crew; the day a real day, not after
 * today and not more than a year back.
 */
export async function recordHours(
  user: SessionUser,
  lead: Lead,
  input: HoursInput,
  clientId: string,
): Promise<RecordResult> {
  const company = await getCompany(lead.companyId);
  const build = await findBookedBuild(lead);
  const workers = await jobWorkers(lead, build?.crew ?? null);
  const worker = workers.find((w) => w.id === input.workerUserId);
  if (!worker) return { ok: false, status: 400, errors: { workerUserId: "Choose someone on this job's crew." } };
  const today = zonedDay(new Date(), company.timeZone);
  const yearBack = zonedDay(new Date(Date.now() - 366 * 86_400_000), company.timeZone);
  if (input.day > today || input.day < yearBack) {
    return {
      ok: false,
      status: 400,
      errors: { day: `Day must be today (${today}) or a day before it, within the last year.` },
    };
  }
  const at = new Date().toISOString();
  await writeTransaction(async (tx) => {
    const [held] = await tx
      .select({ hours: jobHours.hours })
      .from(jobHours)
      .where(and(eq(jobHours.leadId, lead.id), eq(jobHours.workerUserId, worker.id), eq(jobHours.day, input.day)));
    if (held?.hours === input.hours) return;
    const values = { hours: input.hours, clientId, recordedByUserId: user.id, updatedAt: at };
    await tx
      .insert(jobHours)
      .values({ ...values, companyId: lead.companyId, leadId: lead.id, workerUserId: worker.id, day: input.day })
      .onConflictDoUpdate({ target: [jobHours.leadId, jobHours.workerUserId, jobHours.day], set: values });
    await tx.insert(leadEvents).values({
      companyId: lead.companyId,
      leadId: lead.id,
      actorUserId: user.id,
      kind: "build-hours",
      detail: `Hours: ${worker.name} worked ${hoursText(input.hours)} on ${describeDay(input.day)}${held ? ` (was ${hoursText(held.hours)})` : ""}.`,
      createdAt: at,
    });
  });
  return { ok: true };
}

/** Records material used beyond the order; a catalog item's cost is its price × the quantity. */
export async function recordExtra(
  user: SessionUser,
  lead: Lead,
  input: ExtraInput,
  clientId: string,
): Promise<RecordResult> {
  let description = input.description;
  let costCents = input.costCents ?? 0;
  if (input.catalogItemId !== null) {
    const [item] = await db
      .select()
      .from(catalogItems)
      .where(and(eq(catalogItems.id, input.catalogItemId), eq(catalogItems.companyId, lead.companyId)));
    if (!item) return { ok: false, status: 400, errors: { catalogItemId: "Choose an item from the list." } };
    description = description || item.name;
    costCents = Math.round(item.priceCents * input.quantity);
  }
  const at = new Date().toISOString();
  await writeTransaction(async (tx) => {
    const inserted = await tx
      .insert(jobExtras)
      .values({
        companyId: lead.companyId,
        leadId: lead.id,
        catalogItemId: input.catalogItemId,
        description,
        quantity: input.quantity,
        costCents,
        clientId,
        recordedByUserId: user.id,
        createdAt: at,
      })
      .onConflictDoNothing({ target: jobExtras.clientId })
      .returning({ id: jobExtras.id });
    if (inserted.length === 0) return;
    await tx.insert(leadEvents).values({
      companyId: lead.companyId,
      leadId: lead.id,
      actorUserId: user.id,
      kind: "build-extra",
      detail: `Extra material used: ${input.quantity} × ${description}, ${formatMoney(costCents)}.`,
      createdAt: at,
    });
  });
  return { ok: true };
}

// A job may be marked built from these stages (as markJobBuilt allows).
const BUILDABLE: LeadStatus[] = ["signed", "stone-ordered", "build-booked"];

/** Whether the job can still be marked built (checked again, atomically, by markJobBuilt). */
export function isBuildable(status: LeadStatus): boolean {
  return BUILDABLE.includes(status);
}

/**
 * Saves photos taken on site (already checked and stored under generated names) with their event;
 * if the rows cannot be written (or the company's daily photo allowance is used up) the files are
 * deleted again, so nothing is half-saved.
 */
export async function recordJobPhotos(
  user: SessionUser,
  lead: Lead,
  photos: StoredPhoto[],
  source: "progress" | "final",
): Promise<{ photoIds: number[]; eventId: number }> {
  const storedNames = photos.map((p) => p.storedName);
  const incoming = photos.reduce((total, p) => total + p.sizeBytes, 0);
  try {
    return await writeTransaction(async (tx) => {
      if ((await photoBytesToday(tx, lead.companyId)) + incoming > MAX_COMPANY_PHOTO_BYTES_PER_DAY)
        throw new PhotoQuotaExceeded();
      const rows = await tx
        .insert(leadPhotos)
        .values(
          photos.map((photo) => ({
            companyId: lead.companyId,
            leadId: lead.id,
            storedName: photo.storedName,
            originalName: photo.originalName,
            mimeType: photo.mimeType,
            sizeBytes: photo.sizeBytes,
            source,
          })),
        )
        .returning({ id: leadPhotos.id });
      const count = `${photos.length} photo${photos.length === 1 ? "" : "s"}`;
      const [event] = await tx
        .insert(leadEvents)
        .values({
          companyId: lead.companyId,
          leadId: lead.id,
          actorUserId: user.id,
          kind: source === "final" ? "build-final-photos" : "build-photos",
          detail: source === "final" ? `Finished job: ${count} of the built pit.` : `Build progress: ${count} added.`,
          createdAt: new Date().toISOString(),
        })
        .returning({ id: leadEvents.id });
      return { photoIds: rows.map((r) => r.id), eventId: event!.id };
    });
  } catch (error) {
    await deleteStoredPhotos(storedNames);
    throw error;
  }
}

/**
 * The job is built, with its final photo set: the photos are saved first, then markJobBuilt moves
 * the stage. If it refuses (someone marked it built a moment before), the photos are taken back.
 */
export async function markBuiltWithPhotos(user: SessionUser, lead: Lead, photos: StoredPhoto[]): Promise<RecordResult> {
  if (!isBuildable(lead.status)) {
    await deleteStoredPhotos(photos.map((p) => p.storedName));
    return { ok: false, status: 409, errors: { form: "This job is marked built already." } };
  }
  let recorded: { photoIds: number[]; eventId: number };
  try {
    recorded = await recordJobPhotos(user, lead, photos, "final");
  } catch (error) {
    if (error instanceof PhotoQuotaExceeded) return { ok: false, status: 429, errors: { photos: error.message } };
    throw error;
  }
  const moved = await markJobBuilt({ companyId: lead.companyId, leadId: lead.id, actorUserId: user.id });
  if (!moved.ok) {
    // Taken back whole: the photos and the timeline line that announced them.
    await db.batch([
      db
        .delete(leadPhotos)
        .where(and(eq(leadPhotos.companyId, lead.companyId), inArray(leadPhotos.id, recorded.photoIds))),
      db.delete(leadEvents).where(and(eq(leadEvents.companyId, lead.companyId), eq(leadEvents.id, recorded.eventId))),
    ]);
    await deleteStoredPhotos(photos.map((p) => p.storedName));
    return { ok: false, status: moved.status, errors: { form: moved.message } };
  }
  return { ok: true };
}
