import { inArray } from "drizzle-orm";
import { Form } from "react-router";
import type { Route } from "./+types/my";
import { PublicShell } from "~/components/public-shell";
import { leadPhotos } from "~/db/schema";
import type { DesignSummaryLine } from "~/emails/design-summary";
import { db } from "~/lib/db.server";
import { HOMEOWNER_STATUS_LABEL } from "~/lib/lead-status";
import { listHomeownerLeads } from "~/lib/leads.server";
import { formatMoneyWhole } from "~/lib/money";
import { requireUser } from "~/lib/session.server";

export const meta: Route.MetaFunction = () => [{ title: "My fire-pit requests · Emberwright" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ["homeowner"] });
  const rows = await listHomeownerLeads(user.id);
  const photos = rows.length
    ? await db
        .select({ id: leadPhotos.id, leadId: leadPhotos.leadId, originalName: leadPhotos.originalName })
        .from(leadPhotos)
        .where(inArray(leadPhotos.leadId, rows.map((r) => r.id)))
    : [];
  return {
    name: user.name,
    requests: rows.map((lead) => {
      const design = JSON.parse(lead.designJson) as { summary?: DesignSummaryLine[] };
      return {
        id: lead.id,
        status: HOMEOWNER_STATUS_LABEL[lead.status],
        sentOn: new Date(lead.createdAt).toLocaleDateString("en-US", { dateStyle: "medium" }),
        summary: design.summary ?? [],
        price:
          lead.priceLowCents !== null && lead.priceHighCents !== null
            ? `${formatMoneyWhole(lead.priceLowCents)} – ${formatMoneyWhole(lead.priceHighCents)}`
            : null,
        photos: photos.filter((p) => p.leadId === lead.id),
      };
    }),
  };
}

export default function MyRequestsRoute({ loaderData }: Route.ComponentProps) {
  return (
    <PublicShell
      right={
        <Form method="post" action="/logout">
          <button type="submit" className="btn-quiet">Sign out</button>
        </Form>
      }
    >
      <main className="mx-auto flex max-w-4xl flex-col gap-6 px-4 py-10 sm:px-6">
        <div>
          <h1 className="text-3xl font-extrabold">Your fire-pit requests</h1>
          <p className="mt-1 text-char-600">Signed in as {loaderData.name}.</p>
        </div>
        {loaderData.requests.length === 0 ? <p className="card p-6">You have not sent a request yet.</p> : null}
        {loaderData.requests.map((req) => (
          <article key={req.id} className="card flex flex-col gap-4 p-6" aria-labelledby={`req-${req.id}`}>
            <div className="flex flex-wrap items-baseline justify-between gap-2">
              <h2 id={`req-${req.id}`} className="text-xl font-extrabold">Request sent {req.sentOn}</h2>
              <span className="rounded-full bg-ember-50 px-3 py-1 text-sm font-bold text-ember-700">{req.status}</span>
            </div>
            <dl className="grid gap-x-6 gap-y-1 text-sm sm:grid-cols-2">
              {req.summary.map((line) => (
                <div key={line.label} className="flex gap-2">
                  <dt className="font-bold text-char-700">{line.label}:</dt>
                  <dd>{line.value}</dd>
                </div>
              ))}
            </dl>
            {req.price ? <p className="text-lg font-extrabold">Estimated {req.price}</p> : null}
            {req.photos.length ? (
              <ul className="flex flex-wrap gap-3" aria-label="Your yard photos">
                {req.photos.map((photo) => (
                  <li key={photo.id}>
                    <img src={`/photos/${photo.id}`} alt={photo.originalName} className="h-24 w-32 rounded-lg object-cover" loading="lazy" />
                  </li>
                ))}
              </ul>
            ) : null}
          </article>
        ))}
      </main>
    </PublicShell>
  );
}
