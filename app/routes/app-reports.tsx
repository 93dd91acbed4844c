import type { Route } from "./+types/app-reports";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { MonthlyChart, type ChartMonth } from "~/components/monthly-chart";
import { requireUser } from "~/lib/auth/session.server";
import { monthlyJobReport } from "~/lib/builds/job-cost.server";
import { formatMoney } from "~/lib/format/money";

export const meta: Route.MetaFunction = () => [{ title: "Reports · Emberwright" }];

const monthName = (month: string) =>
  new Intl.DateTimeFormat("en-US", { month: "long", year: "numeric", timeZone: "UTC" }).format(
    new Date(`${month}-15T12:00:00Z`),
  );

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const { rows } = await monthlyJobReport(user.companyId);
  const signedMoney = (cents: number) => (cents < 0 ? `−${formatMoney(-cents)}` : formatMoney(cents));
  return {
    months: rows.map(
      (
        row,
      ): ChartMonth & { revenue: string; grossProfit: string; cost: string; estimated: string; accuracy: string } => ({
        month: row.month,
        label: monthName(row.month),
        jobsBuilt: row.jobsBuilt,
        revenueCents: row.revenueCents,
        grossProfitCents: row.grossProfitCents,
        revenue: formatMoney(row.revenueCents),
        grossProfit: signedMoney(row.grossProfitCents),
        cost: formatMoney(row.actualCents),
        estimated: formatMoney(row.estimatedCents),
        accuracy: row.accuracy === null ? "–" : `${(row.accuracy * 100).toFixed(0)} %`,
      }),
    ),
  };
}

export default function ReportsRoute({ loaderData }: Route.ComponentProps) {
  const { months } = loaderData;
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-2xl font-extrabold">Jobs built by month</h1>
        <p className="text-char-600">
          Each job counts in the month it was marked built. Revenue is the job&apos;s total (signed proposal with
          add-ons and change orders); gross profit is revenue less the actual cost (hours worked at the labour cost
          rate, material as ordered, extras); accuracy is actual ÷ estimated cost, so 100 % means the estimate was right
          and more means the jobs cost more than planned.
        </p>
      </div>
      {months.length === 0 ? (
        <p className="card p-6 text-char-600">No job has been marked built yet.</p>
      ) : (
        <>
          <section aria-labelledby="chart-title" className="card p-5">
            <h2 id="chart-title" className="text-lg font-extrabold">
              Revenue and gross profit
            </h2>
            <MonthlyChart months={months} />
          </section>
          <section aria-labelledby="table-title" className="card p-5">
            <h2 id="table-title" className="text-lg font-extrabold">
              The figures
            </h2>
            <div
              className="mt-2 overflow-x-auto"
              tabIndex={0}
              role="region"
              aria-label="Monthly figures, scrolls sideways"
            >
              <table className="w-full min-w-[36rem] text-left text-sm">
                <caption className="sr-only">
                  Jobs built, revenue, cost, gross profit and estimate accuracy by month
                </caption>
                <thead>
                  <tr className="border-b border-ash-300">
                    <th scope="col" className="py-2 pr-3">
                      Month
                    </th>
                    <th scope="col" className="py-2 pr-3 text-right">
                      Jobs built
                    </th>
                    <th scope="col" className="py-2 pr-3 text-right">
                      Revenue
                    </th>
                    <th scope="col" className="py-2 pr-3 text-right">
                      Estimated cost
                    </th>
                    <th scope="col" className="py-2 pr-3 text-right">
                      Actual cost
                    </th>
                    <th scope="col" className="py-2 pr-3 text-right">
                      Gross profit
                    </th>
                    <th scope="col" className="py-2 text-right">
                      Accuracy
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {months.map((m) => (
                    <tr key={m.month} className="border-b border-ash-200">
                      <th scope="row" className="py-2 pr-3 font-bold">
                        {m.label}
                      </th>
                      <td className="py-2 pr-3 text-right tabular-nums">{m.jobsBuilt}</td>
                      <td className="py-2 pr-3 text-right tabular-nums">{m.revenue}</td>
                      <td className="py-2 pr-3 text-right tabular-nums">{m.estimated}</td>
                      <td className="py-2 pr-3 text-right tabular-nums">{m.cost}</td>
                      <td className="py-2 pr-3 text-right tabular-nums">{m.grossProfit}</td>
                      <td className="py-2 text-right tabular-nums">{m.accuracy}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </section>
        </>
      )}
    </div>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
