/** The lead page's money once a job is built: the balance (office) and the job's cost (owners). */

export type BalanceCardView = {
  lines: { label: string; amount: string }[];
  amount: string;
  dueSince: string;
  paidOn: string | null;
  how: string | null;
  refund: string | null;
};

export function BalanceCard({ balance }: { balance: BalanceCardView }) {
  return (
    <section aria-labelledby="balance-title" className="flex flex-col gap-3 card p-5 text-sm">
      <h2 id="balance-title" className="text-lg font-extrabold">
        Balance
      </h2>
      <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-1 rounded-lg bg-ash-100 p-3">
        {balance.lines.map((line) => (
          <div key={line.label} className="contents">
            <dt>{line.label}</dt>
            <dd className="text-right tabular-nums">{line.amount}</dd>
          </div>
        ))}
        <dt className="border-t border-ash-300 pt-1 font-extrabold">
          {balance.paidOn ? "Balance paid" : "Balance due"}
        </dt>
        <dd className="border-t border-ash-300 pt-1 text-right font-extrabold tabular-nums">{balance.amount}</dd>
      </dl>
      <p>
        {balance.paidOn
          ? `Paid ${balance.how} on ${balance.paidOn}.`
          : `Due since ${balance.dueSince}. The homeowner pays from their page; the e-mail with the photos links there.`}
      </p>
      {balance.refund ? <p className="text-char-700">{balance.refund}</p> : null}
    </section>
  );
}

export type JobCostCardView = {
  rate: string;
  rows: { label: string; estimated: string; actual: string; difference: string }[];
  estimated: string;
  actual: string;
  difference: string;
  verdict: string;
  revenue: string;
  grossProfit: string;
  margin: string | null;
  accuracy: string | null;
  unpriced: string[];
};

export function JobCostCard({ cost }: { cost: JobCostCardView }) {
  return (
    <section aria-labelledby="job-cost-title" className="flex flex-col gap-3 card p-5 text-sm">
      <h2 id="job-cost-title" className="text-lg font-extrabold">
        Job cost
      </h2>
      <p className="text-char-600">
        Owners only. Labour at the plan&apos;s cost rate of {cost.rate}; the estimate is the signed plan.
      </p>
      <div
        className="overflow-x-auto"
        tabIndex={0}
        role="region"
        aria-label="Estimated against actual cost, scrolls sideways"
      >
        <table className="w-full min-w-[18rem] text-left">
          <caption className="sr-only">Estimated against actual cost</caption>
          <thead>
            <tr className="border-b border-ash-300">
              <th scope="col" className="py-1 pr-2">
                Cost
              </th>
              <th scope="col" className="py-1 pr-2 text-right">
                Estimated
              </th>
              <th scope="col" className="py-1 pr-2 text-right">
                Actual
              </th>
              <th scope="col" className="py-1 text-right">
                Difference
              </th>
            </tr>
          </thead>
          <tbody>
            {cost.rows.map((row) => (
              <tr key={row.label} className="border-b border-ash-200 align-top">
                <th scope="row" className="py-1 pr-2 font-bold">
                  {row.label}
                </th>
                <td className="py-1 pr-2 text-right tabular-nums">{row.estimated}</td>
                <td className="py-1 pr-2 text-right tabular-nums">{row.actual}</td>
                <td className="py-1 text-right tabular-nums">{row.difference}</td>
              </tr>
            ))}
            <tr className="font-extrabold">
              <th scope="row" className="py-1 pr-2">
                Total
              </th>
              <td className="py-1 pr-2 text-right tabular-nums">{cost.estimated}</td>
              <td className="py-1 pr-2 text-right tabular-nums">{cost.actual}</td>
              <td className="py-1 text-right tabular-nums">{cost.difference}</td>
            </tr>
          </tbody>
        </table>
      </div>
      <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-1 rounded-lg bg-ash-100 p-3">
        <dt>Revenue (the job&apos;s total)</dt>
        <dd className="text-right tabular-nums">{cost.revenue}</dd>
        <dt className="font-extrabold">Gross profit</dt>
        <dd className="text-right font-extrabold tabular-nums" data-testid="gross-profit">
          {cost.grossProfit}
          {cost.margin ? ` (${cost.margin})` : ""}
        </dd>
        {cost.accuracy ? (
          <>
            <dt>Actual ÷ estimated cost</dt>
            <dd className="text-right tabular-nums">{cost.accuracy}</dd>
          </>
        ) : null}
      </dl>
      <p>{cost.verdict}</p>
      {cost.unpriced.length ? (
        <p className="text-char-700">
          Ordered items without a price in the plan (counted at nothing): {cost.unpriced.join(", ")}.
        </p>
      ) : null}
    </section>
  );
}
