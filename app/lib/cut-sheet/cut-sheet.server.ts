import type { CapPlan } from "~/domain/caps";
import type { Caution } from "~/domain/advice";
import type { MaterialLine } from "~/domain/quantities";
import { getCompany } from "~/lib/catalog/catalog.server";
import { buildCutList, crewCautionsOf, legacyCutList, type CutSection } from "~/lib/cut-sheet/cut-list";
import { planToSceneInput, type SummaryLine } from "~/lib/design/design-plan";
import { listRevisions, originalVersion } from "~/lib/leads/lead-workspace.server";
import { refreshStoredPlan } from "~/lib/design/plan-refresh.server";
import type { SessionUser } from "~/lib/auth/session.server";
import { findLeadFor } from "~/lib/auth/staff.server";
import { formatZonedDate, formatZonedDateTime, zonedDay } from "~/lib/format/zoned-time";
import type { PitSceneInput } from "~/domain/pit-layout";

/** Everything a cut sheet prints, for the HTML page and the PDF alike. No prices, no contact details. */
export type CutSheet = {
  leadId: number;
  companyName: string;
  customerName: string;
  street: string;
  town: string;
  versionLabel: string;
  printedOn: string;
  /** YYYY-MM-DD in the company's zone, for file names. */
  day: string;
  summary: SummaryLine[];
  cutList: CutSection[];
  materials: MaterialLine[];
  cautions: Caution[];
  caps: CapPlan | null;
  sceneInput: PitSceneInput;
};

/**
 * The cut sheet of a lead the user may open (null otherwise: callers answer 404), built to its latest design version.
 */
export async function loadCutSheet(user: SessionUser, leadId: number | null): Promise<CutSheet | null> {
  const lead = await findLeadFor(user, leadId);
  if (!lead) return null;
  const [company, revisions] = await Promise.all([getCompany(user.companyId), listRevisions(lead)]);
  const version = revisions.at(-1) ?? originalVersion(lead);
  const shown = refreshStoredPlan(version);
  const { plan } = shown;
  const now = new Date();
  return {
    leadId: lead.id,
    companyName: company.name,
    customerName: lead.customerName,
    street: lead.street,
    town: lead.town,
    versionLabel:
      version.revisionId === null
        ? "Design as the homeowner sent it"
        : `Revision ${revisions.length} by ${version.authorName ?? "staff"}, ${formatZonedDateTime(version.createdAt, company.timeZone)}`,
    printedOn: formatZonedDate(now.toISOString(), company.timeZone),
    day: zonedDay(now, company.timeZone),
    summary: version.design.summary,
    cutList: shown.isLegacy ? legacyCutList() : buildCutList(shown.plan),
    materials: plan.materials,
    cautions: crewCautionsOf(plan.cautions),
    caps: shown.isLegacy ? null : shown.plan.caps,
    sceneInput: planToSceneInput(plan, version.design.inputs.engine),
  };
}
