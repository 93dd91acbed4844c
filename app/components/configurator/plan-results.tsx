import { formatLength, type LengthUnit } from "~/domain/units";
import type { PublicPlan } from "~/lib/design/design-plan";
import { formatAreaFt2, speakLengths } from "~/lib/format/length-text";
import { formatMoneyWhole } from "~/lib/format/money";

/** The price and the key numbers, kept in view beside the preview while the controls change them. */
export function PlanPrice({ plan, unit, isUpdating }: { plan: PublicPlan; unit: LengthUnit; isUpdating: boolean }) {
  const f = (inches: number) => formatLength(inches, unit);
  const wallUnits = plan.materials.find((m) => m.key === "wall-unit");
  const caps = plan.materials.find((m) => m.key === "cap");
  return (
    <section aria-labelledby="plan-summary-title" aria-busy={isUpdating}>
      <div className="card p-4 lg:p-5">
        <h2 id="plan-summary-title" className="text-sm font-extrabold tracking-wide text-char-600 uppercase">
          Your fire pit
        </h2>
        <p className="mt-1 text-3xl font-extrabold text-char-900" data-testid="price-range">
          {plan.price
            ? `${formatMoneyWhole(plan.price.lowCents)} – ${formatMoneyWhole(plan.price.highCents)}`
            : "Price on request"}
        </p>
        <p className="text-sm text-char-600">
          Installed, as an estimate. The contractor confirms the price after seeing your yard.
        </p>
        <dl className="mt-4 grid grid-cols-2 gap-x-4 gap-y-3 text-sm lg:mt-3 lg:grid-cols-3" data-testid="plan-summary">
          <div>
            <dt className="text-char-500">Inside (bowl)</dt>
            <dd className="font-extrabold text-char-900 tabular-nums">{f(plan.ring.bowlDiameterIn)}</dd>
          </div>
          <div>
            <dt className="text-char-500">Outside footprint</dt>
            <dd className="font-extrabold text-char-900 tabular-nums">{f(plan.ring.outsideDiameterIn)}</dd>
          </div>
          {plan.liner &&
          typeof plan.fireOpeningIn === "number" &&
          plan.fireOpeningIn < plan.ring.bowlDiameterIn - 1e-9 ? (
            <div>
              <dt className="text-char-500">
                Fire opening (inside the {plan.liner.kind === "firebrick" ? "firebrick" : "ring"})
              </dt>
              <dd className="font-extrabold text-char-900 tabular-nums">{f(plan.fireOpeningIn)}</dd>
            </div>
          ) : null}
          <div>
            <dt className="text-char-500">Wall height</dt>
            <dd className="font-extrabold text-char-900 tabular-nums">{f(plan.ring.wallHeightIn)}</dd>
          </div>
          <div>
            <dt className="text-char-500">Wall blocks</dt>
            <dd className="font-extrabold text-char-900 tabular-nums">
              {plan.ring.totalUnits}
              {wallUnits && wallUnits.quantity > plan.ring.totalUnits
                ? ` + ${wallUnits.quantity - plan.ring.totalUnits} spare`
                : ""}
            </dd>
          </div>
          <div>
            <dt className="text-char-500">Caps</dt>
            <dd className="font-extrabold text-char-900 tabular-nums">
              {plan.caps
                ? `${plan.caps.count}${caps && caps.quantity > plan.caps.count ? ` + ${caps.quantity - plan.caps.count} spare` : ""}`
                : "None"}
            </dd>
          </div>
          {plan.patio ? (
            <div>
              <dt className="text-char-500">Patio</dt>
              <dd className="font-extrabold text-char-900 tabular-nums">
                {formatAreaFt2(plan.patio.pavedAreaFt2, unit)}
              </dd>
            </div>
          ) : null}
        </dl>
      </div>
    </section>
  );
}

/** The engine's notes on this design, for the contractor to check, said in the chosen unit. */
export function PlanWarnings({ plan, unit }: { plan: PublicPlan; unit: LengthUnit }) {
  return plan.warnings.length ? (
    <div className="rounded-(--radius-card) border border-ember-300 bg-ember-50 p-4" role="status">
      <h2 className="font-extrabold text-ember-700">Notes for your contractor</h2>
      <p className="mt-1 text-sm text-char-700">
        Nothing for you to do: your contractor checks these when they measure the yard, and may suggest a change.
      </p>
      <ul className="mt-2 flex list-disc flex-col gap-1.5 pl-5 text-sm text-char-800">
        {plan.warnings.map((w) => (
          <li key={w.code} data-code={w.code}>
            {speakLengths(w.message, unit)}
          </li>
        ))}
      </ul>
    </div>
  ) : null;
}

/** Every caution for the homeowner, in one list. */
export function PlanCautions({ plan, unit }: { plan: PublicPlan; unit: LengthUnit }) {
  const cautions = plan.cautions.filter((c) => c.audience !== "crew");
  return (
    <div className="card p-4 render-when-near">
      <h2 className="font-extrabold">Safety first</h2>
      <ul className="mt-2 flex flex-col gap-2 text-sm text-char-700">
        {cautions.map((c) => (
          <li key={c.code} data-code={c.code} className="border-l-3 border-ash-300 pl-3">
            {speakLengths(c.message, unit)}
          </li>
        ))}
      </ul>
    </div>
  );
}
