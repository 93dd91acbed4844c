import type { PhoneDisplay } from "~/lib/format/phone";

/** "1 hour", "90 minutes", "2 hours". */
export function visitLength(minutes: number): string {
  if (minutes % 60 === 0) return minutes === 60 ? "1 hour" : `${minutes / 60} hours`;
  return `${minutes} minutes`;
}

/** The visit at a glance, above the choice of time: how long, where, what it costs. */
export function VisitFacts(props: { minutes: number; address: string; fee: string; design: string }) {
  const facts = [
    ["How long", `About ${visitLength(props.minutes)}`],
    ["Where", props.address],
    ["Fee", `${props.fee}, credited toward the build`],
    ["Your design", props.design],
  ] as const;
  return (
    <dl className="grid grid-cols-1 gap-px overflow-hidden rounded-xl border border-ash-200 bg-ash-200 min-[420px]:grid-cols-2 lg:grid-cols-4">
      {facts.map(([term, value]) => (
        <div key={term} className="bg-white px-4 py-3">
          <dt className="text-xs font-bold tracking-wide text-char-600 uppercase">{term}</dt>
          <dd className="mt-0.5 font-bold text-char-900">{value}</dd>
        </div>
      ))}
    </dl>
  );
}

/**
 * What happens at the visit and what to have ready: the homeowner's side of the consult, in plain
 * words. Trade practice, no source: these are the things a site visit for a masonry pit settles.
 */
export function VisitBrief(props: { companyName: string; phone: PhoneDisplay; minutes: number }) {
  return (
    <aside
      aria-labelledby="visit-title"
      className="flex flex-col gap-5 rounded-2xl bg-char-800 p-5 text-ash-100 sm:p-6"
    >
      <h2 id="visit-title" className="text-lg font-extrabold text-white">
        At the visit
      </h2>
      <div>
        <h3 className="text-sm font-extrabold tracking-wide text-ember-200 uppercase">What gets measured</h3>
        <ul className="mt-2 flex list-disc flex-col gap-1.5 pl-5 text-sm">
          <li>The spot: how level it is, and what is underfoot (lawn, soil, gravel or an old patio).</li>
          <li>
            How far the fire sits from the house, fences, trees and branches overhead, and from the property line.
          </li>
          <li>The way in for materials: gate width and the path a loaded wheelbarrow takes.</li>
          <li>
            Your design on the ground: bowl size, seat height, stone and any patio, priced again from what is seen.
          </li>
        </ul>
      </div>
      <div>
        <h3 className="text-sm font-extrabold tracking-wide text-ember-200 uppercase">Have ready</h3>
        <ul className="mt-2 flex list-disc flex-col gap-1.5 pl-5 text-sm">
          <li>The spot clear enough to walk around; a garden hose laid in a circle shows where you picture it.</li>
          <li>Gates unlocked and pets inside.</li>
          <li>A survey or plot plan showing your property lines, if you have one.</li>
          <li>Any rules from your town or homeowners' association about outdoor fires.</li>
        </ul>
      </div>
      <p className="rounded-lg bg-char-700 px-3 py-2 text-xs leading-relaxed">
        Nothing is dug at the visit. Before any digging, buried lines are marked by your area's free call-before-you-dig
        service; a gas burner is piped by a licensed gas fitter; your fire authority and local codes have the last word
        on where a fire may go.
      </p>
      <p className="text-sm">
        About {visitLength(props.minutes)}. Questions first? Call {props.companyName}
        {props.phone ? (
          <>
            {" "}
            at{" "}
            <a href={props.phone.href} className="font-bold whitespace-nowrap text-white underline underline-offset-2">
              {props.phone.text}
            </a>
          </>
        ) : null}
        .
      </p>
    </aside>
  );
}
