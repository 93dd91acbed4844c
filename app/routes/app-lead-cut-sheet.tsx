import { Link } from "react-router";
import type { Route } from "./+types/app-lead-cut-sheet";
import { Wordmark } from "~/components/brand-mark";
import { CapDrawingSvg } from "~/components/cap-drawing-svg";
import { CrewCautions, CutListTables, MaterialsTable } from "~/components/job-sheets";
import { PitPlanSvg } from "~/components/pit-plan-svg";
import { STAFF_ROLES } from "~/db/enums";
import { formatInches } from "~/domain/units";
import { loadCutSheet } from "~/lib/cut-sheet/cut-sheet.server";
import { requireUser } from "~/lib/auth/session.server";
import { isOfficeRole, parseLeadId } from "~/lib/auth/staff.server";
import { LabelledLines } from "~/components/labelled-lines";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: loaderData ? `Cut sheet: ${loaderData.sheet.customerName} · Emberwright` : "Cut sheet · Emberwright" },
];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: STAFF_ROLES });
  const sheet = await loadCutSheet(user, parseLeadId(params.leadId));
  if (!sheet) throw new Response("Not found", { status: 404 });
  return { sheet, backTo: isOfficeRole(user.role) ? `/app/leads/${sheet.leadId}` : "/app/jobs" };
}

function PrintButton() {
  return (
    <button type="button" className="btn-primary" onClick={() => window.print()}>
      Print
    </button>
  );
}

export default function CutSheetRoute({ loaderData }: Route.ComponentProps) {
  const { sheet, backTo } = loaderData;
  const f = (inches: number) => formatInches(inches);
  return (
    <main className="cut-sheet mx-auto max-w-4xl px-4 py-6 sm:px-6 print:max-w-none print:p-0">
      <nav aria-label="Cut sheet" className="no-print mb-6 flex flex-wrap items-center justify-between gap-3">
        <Link to={backTo} className="text-sm font-bold text-ember-700 hover:underline">
          ← Back
        </Link>
        <div className="flex flex-wrap gap-2">
          <PrintButton />
          <a href={`/app/leads/${sheet.leadId}/cut-sheet.pdf`} className="btn-quiet" download>
            PDF with full-size cap template
          </a>
        </div>
      </nav>

      <header className="flex flex-wrap items-start justify-between gap-4 border-b-2 border-char-800 pb-3">
        <div className="min-w-0">
          <p className="text-xs font-extrabold tracking-widest text-ember-600 uppercase">
            Cut sheet · job #{sheet.leadId}
          </p>
          <h1 className="text-2xl font-extrabold">{sheet.customerName}</h1>
          <p className="font-bold">
            {sheet.street}, {sheet.town}
          </p>
          <p className="text-sm text-char-600">
            {sheet.versionLabel} · printed {sheet.printedOn}
          </p>
        </div>
        <div className="text-right text-sm">
          <Wordmark />
          <p className="mt-1 font-bold">{sheet.companyName}</p>
        </div>
      </header>

      <section aria-labelledby="sheet-design" className="mt-4 break-inside-avoid">
        <h2 id="sheet-design" className="text-lg font-extrabold">
          The design
        </h2>
        <LabelledLines
          lines={sheet.summary}
          className="mt-1 grid gap-x-6 gap-y-0.5 text-sm sm:grid-cols-2 print:grid-cols-2"
        />
      </section>

      <section aria-labelledby="sheet-cuts" className="mt-5">
        <h2 id="sheet-cuts" className="mb-2 text-lg font-extrabold">
          Cut list
        </h2>
        <CutListTables sections={sheet.cutList} />
      </section>

      <section
        aria-labelledby="sheet-drawings"
        className="mt-5 grid gap-4 sm:grid-cols-2 print:break-before-page print:grid-cols-2"
      >
        <h2 id="sheet-drawings" className="text-lg font-extrabold sm:col-span-2 print:col-span-2">
          Drawings
        </h2>
        {sheet.caps ? (
          <figure className="break-inside-avoid rounded-lg border border-ash-300 p-3">
            <CapDrawingSvg caps={sheet.caps} />
            <figcaption className="mt-2 text-xs text-char-600">
              One cap on its blank, marks from each corner. Not full size: the PDF has a full-size template.
            </figcaption>
          </figure>
        ) : null}
        <figure className="break-inside-avoid rounded-lg border border-ash-300 p-3">
          <PitPlanSvg input={sheet.sceneInput} unit="in" formatLength={f} />
          <figcaption className="mt-2 text-xs text-char-600">
            The ring from above: first course, caps dashed.
          </figcaption>
        </figure>
      </section>

      <section aria-labelledby="sheet-materials" className="mt-5 break-inside-avoid">
        <h2 id="sheet-materials" className="mb-1 text-lg font-extrabold">
          Material order
        </h2>
        <MaterialsTable materials={sheet.materials} />
      </section>

      <section aria-labelledby="sheet-safety" className="mt-5 break-inside-avoid">
        <h2 id="sheet-safety" className="mb-2 text-lg font-extrabold">
          Safety on site
        </h2>
        <CrewCautions cautions={sheet.cautions} />
      </section>
    </main>
  );
}
