import { useEffect, useEffectEvent, useRef, useState } from "react";
import { data, Form, Link, useFetcher } from "react-router";
import type { Route } from "./+types/app-inbox";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { JobProgressCompact } from "~/components/job-progress";
import { FormAlert, SelectField, TextField } from "~/components/ui/field";
import { LEAD_STATUSES } from "~/db/enums";
import { formatInches } from "~/domain/units";
import { getCompany } from "~/lib/catalog/catalog.server";
import {
  FIRST_DIRECTION,
  inboxSearchParams,
  type InboxFilters,
  type InboxPage,
  type InboxSort,
} from "~/lib/leads/inbox-options";
import { parseInboxQuery, usableInboxFilters } from "~/lib/leads/inbox-schema";
import { inboxSeenAt, loadInboxPage } from "~/lib/leads/inbox.server";
import { STATUS_LABEL } from "~/lib/leads/lead-status";
import { formatMoneyWhole } from "~/lib/format/money";
import { requireUser } from "~/lib/auth/session.server";
import { OFFICE_ROLES } from "~/lib/auth/staff.server";
import { listTeam } from "~/lib/auth/team.server";

export const meta: Route.MetaFunction = () => [{ title: "Inbox · Emberwright" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: OFFICE_ROLES });
  const [company, team, seenAt] = await Promise.all([
    getCompany(user.companyId),
    listTeam(user.companyId),
    inboxSeenAt(user.id),
  ]);
  const estimators = team
    .filter((m) => m.role === "owner" || m.role === "estimator")
    .map((m) => ({ id: m.id, name: m.name, isActive: m.isActive }));
  const params = new URL(request.url).searchParams;
  const parsed = parseInboxQuery(params);
  // Refused filters are shown beside their fields as typed; the list stays, filtered by the rest.
  const errors = parsed.ok ? null : parsed.errors;
  const typed = parsed.ok
    ? null
    : {
        q: params.get("q") ?? "",
        from: params.get("from") ?? "",
        to: params.get("to") ?? "",
        assignee: params.get("assignee") ?? "",
      };
  const now = new Date();
  const inbox = await loadInboxPage({
    companyId: company.id,
    timeZone: company.timeZone,
    filters: parsed.ok ? parsed.filters : usableInboxFilters(params, parsed.errors),
    // Someone opening the inbox for the first time has no "last visit": nothing before now is marked.
    unseenSince: seenAt ?? now.toISOString(),
    now,
  });
  // Viewing the inbox is what "seen" means: the page posts `viewedAt` back once it is shown (a loader
  // never writes); the marks on this page still compare with the old time.
  const answer = { inbox, errors, typed, estimators, myId: user.id, viewedAt: now.toISOString() };
  return errors ? data(answer, { status: 400 }) : answer;
}

const POLL_MS = 30_000;

function hrefFor(filters: InboxFilters, patch: Partial<InboxFilters>): string {
  const query = inboxSearchParams({ ...filters, ...patch }).toString();
  return query ? `/app/inbox?${query}` : "/app/inbox";
}

const COLUMNS: { sort: InboxSort; label: string; className?: string }[] = [
  { sort: "status", label: "Stage", className: "hidden sm:table-cell" },
  { sort: "customer", label: "Customer" },
  { sort: "town", label: "Town", className: "hidden md:table-cell" },
  { sort: "bowl", label: "Bowl and stone", className: "hidden lg:table-cell" },
  { sort: "price", label: "Price range", className: "hidden md:table-cell text-right" },
  { sort: "consult", label: "Consult", className: "hidden xl:table-cell" },
  { sort: "assignee", label: "Estimator", className: "hidden lg:table-cell" },
  { sort: "received", label: "Received" },
];

/** Keeps the inbox fresh: polls the JSON API every 30 s and when the window regains focus. */
function useLiveInbox(initial: InboxPage, since: string | null): InboxPage {
  const fetcher = useFetcher<InboxPage>();
  const load = useEffectEvent((url: string) => void fetcher.load(url));
  const query = initial.query;
  useEffect(() => {
    const params = new URLSearchParams(query);
    if (since) params.set("since", since);
    const url = `/api/leads?${params.toString()}`;
    const poll = () => {
      if (document.visibilityState === "visible") load(url);
    };
    const timer = window.setInterval(poll, POLL_MS);
    window.addEventListener("focus", poll);
    document.addEventListener("visibilitychange", poll);
    return () => {
      window.clearInterval(timer);
      window.removeEventListener("focus", poll);
      document.removeEventListener("visibilitychange", poll);
    };
  }, [query, since]);
  const polled = fetcher.data;
  // A poll answers the filters it was asked with; an answer for other filters, or an older one, is ignored.
  return polled && polled.query === initial.query && polled.generatedAt > initial.generatedAt ? polled : initial;
}

/** Tells the server the inbox was seen as it stood at `viewedAt`, once per page load. */
function useMarkSeen(viewedAt: string) {
  const sent = useRef<string | null>(null);
  useEffect(() => {
    if (sent.current === viewedAt) return;
    sent.current = viewedAt;
    void fetch("/app/inbox/seen", {
      method: "POST",
      body: new URLSearchParams({ at: viewedAt }),
      keepalive: true,
    }).catch(() => {});
  }, [viewedAt]);
}

export default function InboxRoute({ loaderData }: Route.ComponentProps) {
  const { errors, typed, estimators, myId } = loaderData;
  useMarkSeen(loaderData.viewedAt);
  return (
    <InboxView initial={loaderData.inbox} estimators={estimators} myId={myId} errors={errors ?? {}} typed={typed} />
  );
}

type TypedFilters = { q: string; from: string; to: string; assignee: string } | null;

function InboxView({
  initial,
  estimators,
  myId,
  errors,
  typed,
}: {
  initial: InboxPage;
  estimators: { id: number; name: string; isActive: boolean }[];
  myId: number;
  errors: Record<string, string>;
  typed: TypedFilters;
}) {
  // Marks stay put while the person moves between filters: compare with the time they arrived.
  const [since] = useState(initial.unseenSince);
  const inbox = useLiveInbox(initial, since);
  const { filters, rows, counts } = inbox;
  const isUnseen = (createdAt: string) => since === null || createdAt > since;
  const csvQuery = inboxSearchParams({ ...filters, page: 1 });
  csvQuery.delete("page");
  const csvHref = `/app/inbox.csv${csvQuery.size ? `?${csvQuery}` : ""}`;

  return (
    <div className="flex flex-col gap-5">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-extrabold">Inbox</h1>
          <p className="text-char-600" role="status" aria-live="polite">
            {inbox.unseenCount > 0
              ? `${inbox.unseenCount} unread ${inbox.unseenCount === 1 ? "request" : "requests"}: sent since your last visit.`
              : "Fire-pit requests from your configurator, newest first."}
          </p>
        </div>
        <a href={csvHref} className="btn-quiet" download>
          Export CSV
        </a>
      </div>

      {/* The tabs wrap rather than scroll: on a phone a sideways-scrolling strip hides the stages past the edge. */}
      <nav aria-label="Filter by stage">
        <ul className="flex flex-wrap gap-x-1 gap-y-0.5">
          {([null, ...LEAD_STATUSES] as const).map((status) => {
            const isCurrent = filters.status === status;
            return (
              <li key={status ?? "all"}>
                <Link
                  to={hrefFor(filters, { status, page: 1 })}
                  aria-current={isCurrent ? "page" : undefined}
                  className={`inline-flex items-center gap-1.5 border-b-3 px-2 py-1.5 text-sm font-bold whitespace-nowrap ${
                    isCurrent
                      ? "border-ember-500 text-char-900"
                      : "border-transparent text-char-700 hover:border-ash-300"
                  }`}
                >
                  {status ? STATUS_LABEL[status] : "All"}
                  <span className="text-char-600 tabular-nums">{counts[status ?? "all"]}</span>
                </Link>
              </li>
            );
          })}
        </ul>
      </nav>

      <FilterForm
        key={initial.query + JSON.stringify(errors)}
        filters={filters}
        estimators={estimators}
        myId={myId}
        errors={errors}
        typed={typed}
      />

      <div className="overflow-hidden card">
        <table className="w-full text-left text-sm">
          <caption className="sr-only">
            Requests, page {inbox.page} of {inbox.pageCount}, sorted by {filters.sort}{" "}
            {filters.dir === "asc" ? "ascending" : "descending"}
          </caption>
          <thead className="border-b border-ash-200 bg-ash-100 text-xs text-char-600 uppercase">
            <tr>
              {COLUMNS.map((col) => {
                const isSorted = filters.sort === col.sort;
                const nextDir = isSorted ? (filters.dir === "asc" ? "desc" : "asc") : FIRST_DIRECTION[col.sort];
                return (
                  <th
                    key={col.sort}
                    scope="col"
                    aria-sort={isSorted ? (filters.dir === "asc" ? "ascending" : "descending") : "none"}
                    className={`px-3 py-2 font-extrabold ${col.className ?? ""}`}
                  >
                    <Link
                      to={hrefFor(filters, { sort: col.sort, dir: nextDir, page: 1 })}
                      className="inline-flex items-center gap-1 hover:text-char-900"
                    >
                      {col.label}
                      <span aria-hidden="true" className={isSorted ? "text-ember-600" : "text-ash-400"}>
                        {isSorted ? (filters.dir === "asc" ? "▲" : "▼") : "↕"}
                      </span>
                    </Link>
                  </th>
                );
              })}
            </tr>
          </thead>
          <tbody className="divide-y divide-ash-200">
            {rows.map((row) => {
              const unseen = isUnseen(row.createdAt);
              return (
                <tr key={row.id} className={unseen ? "bg-ember-50/60" : undefined}>
                  <td className="hidden px-3 py-2.5 align-top sm:table-cell">
                    <JobProgressCompact stage={row.status} pausedStage={row.pausedStage} />
                  </td>
                  <td className="px-3 py-2.5 align-top">
                    <Link
                      to={`/app/leads/${row.id}`}
                      className={`text-char-900 underline-offset-2 hover:underline ${unseen ? "font-extrabold" : "font-bold"}`}
                    >
                      {row.customerName}
                    </Link>
                    {unseen ? (
                      <span className="ml-2 rounded bg-action px-1.5 py-0.5 align-middle text-[0.65rem] font-extrabold tracking-wide text-white uppercase">
                        Unread<span className="sr-only"> since your last visit</span>
                      </span>
                    ) : null}
                    <span className="hidden text-xs break-all text-char-500 sm:block">{row.email}</span>
                    <span className="block text-xs text-char-500 md:hidden">
                      {row.town} · {formatInches(row.bowlDiameterIn)} bowl
                    </span>
                    <span className="mt-1 block sm:hidden">
                      <JobProgressCompact stage={row.status} pausedStage={row.pausedStage} />
                    </span>
                  </td>
                  <td className="hidden px-3 py-2.5 align-top md:table-cell">{row.town}</td>
                  <td className="hidden px-3 py-2.5 align-top lg:table-cell">
                    <span className="tabular-nums">{formatInches(row.bowlDiameterIn)}</span>
                    <span className="block text-xs text-char-500">{row.stoneName}</span>
                  </td>
                  <td className="hidden px-3 py-2.5 text-right align-top tabular-nums md:table-cell">
                    {row.priceLowCents !== null && row.priceHighCents !== null
                      ? `${formatMoneyWhole(row.priceLowCents)}–${formatMoneyWhole(row.priceHighCents)}`
                      : "—"}
                  </td>
                  <td className="hidden px-3 py-2.5 align-top xl:table-cell">
                    {row.consult ? (
                      <span>
                        <span className="block text-xs font-bold text-moss-700">Confirmed</span>
                        {row.consult.label}
                      </span>
                    ) : (
                      <span className="text-char-500">—</span>
                    )}
                  </td>
                  <td className="hidden px-3 py-2.5 align-top lg:table-cell">
                    {row.assignee?.name ?? <span className="text-char-500">Unassigned</span>}
                  </td>
                  <td className="px-3 py-2.5 align-top whitespace-nowrap" title={row.receivedLabel}>
                    {row.ageLabel}
                    <span className="block text-xs text-char-500">{row.ageLabel === "just now" ? "" : "ago"}</span>
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
        {rows.length === 0 ? (
          <p className="px-4 py-8 text-center text-char-600">
            {inbox.total === 0 ? "No requests match these filters." : "No requests on this page."}{" "}
            <Link to="/app/inbox" className="font-bold text-ember-700 hover:underline">
              Show all requests
            </Link>
          </p>
        ) : null}
      </div>

      <nav aria-label="Pages" className="flex flex-wrap items-center justify-between gap-3 text-sm">
        <p className="text-char-600">
          {inbox.total} {inbox.total === 1 ? "request" : "requests"} · page {inbox.page} of {inbox.pageCount}
        </p>
        <div className="flex gap-2">
          {inbox.page > 1 ? (
            <Link to={hrefFor(filters, { page: inbox.page - 1 })} className="btn-quiet" rel="prev">
              Previous page
            </Link>
          ) : null}
          {inbox.page < inbox.pageCount ? (
            <Link to={hrefFor(filters, { page: inbox.page + 1 })} className="btn-quiet" rel="next">
              Next page
            </Link>
          ) : null}
        </div>
      </nav>
    </div>
  );
}

function FilterForm({
  filters,
  estimators,
  myId,
  errors,
  typed,
}: {
  filters: InboxFilters;
  estimators: { id: number; name: string; isActive: boolean }[];
  myId: number;
  errors: Record<string, string>;
  typed: TypedFilters;
}) {
  const errorOf = (field: string) =>
    errors[field] ? (
      <p id={`filter-${field}-error`} className="field-error">
        {errors[field]}
      </p>
    ) : null;
  const hasErrors = Object.keys(errors).length > 0;
  return (
    <Form
      method="get"
      action="/app/inbox"
      className="grid grid-cols-2 gap-3 card p-4 lg:grid-cols-[minmax(0,2fr)_minmax(0,1.3fr)_auto_auto_auto]"
      aria-label="Filter requests"
    >
      {hasErrors ? (
        <FormAlert className="col-span-2 lg:col-span-5">
          Some filters could not be used, so the list below ignores them. Fix the fields marked below.
        </FormAlert>
      ) : null}
      {filters.status ? <input type="hidden" name="status" value={filters.status} /> : null}
      {errors.status ? <div className="col-span-2 lg:col-span-5">{errorOf("status")}</div> : null}
      {filters.sort !== "received" || filters.dir !== "desc" ? (
        <>
          <input type="hidden" name="sort" value={filters.sort} />
          <input type="hidden" name="dir" value={filters.dir} />
        </>
      ) : null}
      <TextField
        label="Search"
        name="q"
        type="search"
        defaultValue={typed?.q ?? filters.q}
        placeholder="Name, e-mail, phone or town"
        maxLength={100}
        error={errors.q}
        className="col-span-2 lg:col-span-1"
      />
      <SelectField
        label="Estimator"
        name="assignee"
        defaultValue={typed?.assignee ?? (filters.assignee === null ? "" : String(filters.assignee))}
        error={errors.assignee}
        className="col-span-2 lg:col-span-1"
      >
        <option value="">Anyone</option>
        <option value="none">Unassigned</option>
        {estimators.map((e) => (
          <option key={e.id} value={e.id}>
            {e.id === myId ? `${e.name} (me)` : e.name}
            {e.isActive ? "" : " (inactive)"}
          </option>
        ))}
      </SelectField>
      <TextField
        label="Received from"
        name="from"
        type="date"
        defaultValue={typed?.from ?? filters.from ?? ""}
        error={errors.from}
        className="min-w-0"
      />
      <TextField
        label="to"
        name="to"
        type="date"
        defaultValue={typed?.to ?? filters.to ?? ""}
        error={errors.to}
        className="min-w-0"
      />
      <div className="col-span-2 flex items-end gap-2 lg:col-span-1">
        <button type="submit" className="btn-primary">
          Apply
        </button>
        <Link to="/app/inbox" className="btn-quiet">
          Clear
        </Link>
      </div>
      {errors.sort || errors.dir || errors.page ? (
        <div className="col-span-2 lg:col-span-5">
          {errorOf("sort")}
          {errorOf("dir")}
          {errorOf("page")}
        </div>
      ) : null}
    </Form>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
