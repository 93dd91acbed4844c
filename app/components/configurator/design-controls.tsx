import { useId, useState, type ReactNode } from "react";
import { MAX_COURSES } from "~/domain/ring";
import { formatNumber } from "~/domain/number-text";
import { formatLength, type LengthUnit } from "~/domain/units";
import {
  MAX_INNER_OVERHANG_IN,
  OVERHANG_STEP_IN,
  PATIO_RADIUS_FT,
  offeredRingSizes,
  suggestPatioRadiusFt,
  type CatalogChoice,
  type Design,
  type LinerKind,
} from "~/lib/design/design";
import { describeSeat } from "~/lib/design/design-plan";
import { FT_TO_M, speakLengths } from "~/lib/format/length-text";

/**
 * A distance field's consequence, said beside the field: what the contractor works to, and a note when the spot is
 * closer.
 */
export type SiteFieldNote = { requiredFt: number | null; note: string | null };
export type SiteFieldNotes = Record<"setback" | "propertyLine" | "branches", SiteFieldNote>;

type Props = {
  design: Design;
  catalog: CatalogChoice[];
  /** The plan's bowl when it is sized to the steel ring (the slider then starts from it). */
  plannedUnitCount: number | null;
  /** The plan's outside diameter (in), for the patio size suggested before a patio is priced. */
  outsideDiameterIn: number | null;
  /** What each distance field means for this design, shown beside it. */
  siteNotes?: SiteFieldNotes;
  onChange: (patch: Partial<Design>) => void;
};

function Section({ title, hint, children }: { title: string; hint?: ReactNode; children: ReactNode }) {
  return (
    <fieldset className="border-b border-ash-200 pb-5 last:border-b-0">
      <legend className="text-base font-extrabold text-char-900">{title}</legend>
      {hint ? <p className="mt-0.5 mb-2 text-sm text-char-600">{hint}</p> : <div className="mb-2" />}
      {children}
    </fieldset>
  );
}

// The farthest distance from the fire the form takes, in feet (the plan's own limit).
const MAX_DISTANCE_FT = 500;

/**
 * A patio's width across, from its radius in feet: feet for inches, metres for millimetres (1 ft = 0.3048 m exactly).
 */
const patioAcross = (radiusFt: number, unit: LengthUnit) =>
  unit === "mm"
    ? `${formatNumber(Math.round(radiusFt * 2 * 0.3048 * 10) / 10, { maxFractionDigits: 1 })} m across`
    : `${radiusFt * 2} ft across`;

const sizeText = (item: CatalogChoice, unit: LengthUnit) =>
  `${formatLength(item.faceIn ?? 0, unit)} face, ${formatLength(item.heightIn ?? 0, unit)} high`;

/**
 * The configurator's controls. Every input carries the search-param name it stands for, so the
 * form also works as a plain GET without JavaScript.
 */
export function DesignControls({ design, catalog, plannedUnitCount, outsideDiameterIn, siteNotes, onChange }: Props) {
  const ids = useId();
  // A patio being sized: its radius is asked for (with a suggestion) before it enters the design and the price.
  const [patioDraftFt, setPatioDraftFt] = useState<number | null>(null);
  const suggestedPatioFt = suggestPatioRadiusFt(outsideDiameterIn);

  const unit = design.unit;
  const f = (inches: number) => formatLength(inches, unit);
  const ofKind = (kind: string) => catalog.filter((i) => i.kind === kind);
  const stones = ofKind("wall-unit");
  const caps = ofKind("cap");
  const rings = ofKind("steel-ring");
  const ring = rings.find((r) => r.id === design.ringId) ?? rings[0] ?? null;
  const hasFirebrick = ofKind("firebrick").length > 0;
  const pavers = ofKind("paver");
  const borders = ofKind("border-unit");
  const stone = stones.find((s) => s.id === design.stoneId) ?? stones[0]!;
  const sizes = offeredRingSizes(stone);
  const shownCount = design.fitToRing && plannedUnitCount ? plannedUnitCount : design.unitCount;
  const shownSize = sizes.find((s) => s.unitCount === shownCount);
  const minCount = sizes[0]?.unitCount ?? 3;
  const maxCount = sizes.at(-1)?.unitCount ?? 40;
  const wallHeightIn =
    design.courses * (stone.heightIn ?? 0) +
    (design.capId !== null ? (caps.find((c) => c.id === design.capId)?.thicknessIn ?? 0) : 0);

  return (
    <div className="flex flex-col gap-5">
      <Section title="Wall stone" hint="The blocks that make the ring. Tapered ones close up into a tight circle.">
        <div className="grid gap-2 sm:grid-cols-2">
          {stones.map((s) => (
            <label
              key={s.id}
              className="relative flex cursor-pointer items-center gap-3 rounded-lg border-2 border-ash-300 bg-white p-2.5 has-checked:border-action has-checked:bg-ember-50 has-focus-visible:outline-3 has-focus-visible:outline-offset-3 has-focus-visible:outline-char-900 has-focus-visible:outline-dashed"
            >
              <input
                type="radio"
                name="stone"
                value={s.id}
                checked={s.id === design.stoneId}
                onChange={() =>
                  onChange({ stoneId: s.id, fitToRing: design.linerKind === "steel-ring" && design.fitToRing })
                }
                className="sr-only"
              />
              <span
                className="h-9 w-9 shrink-0 rounded-md border border-char-800/20"
                style={{ backgroundColor: s.colourHex }}
                aria-hidden="true"
              />
              <span className="min-w-0 text-sm leading-tight">
                <span className="block font-extrabold text-char-900">{s.name}</span>
                <span className="block text-char-600">
                  {s.colourName} · {sizeText(s, unit)}
                </span>
              </span>
              {/* Chosen is shown by a mark too, not by colour alone (WCAG 2.1 SC 1.4.1). Keyboard focus
                  is a dark dashed ring outside the card, so it cannot be mistaken for the orange border
                  that marks the chosen stone (WCAG 2.1 SC 2.4.7). */}
              {s.id === design.stoneId ? (
                <span
                  className="absolute -top-2.5 right-2 rounded-full bg-action px-2 py-0.5 text-[0.7rem] font-extrabold text-white"
                  aria-hidden="true"
                >
                  ✓ Chosen
                </span>
              ) : null}
            </label>
          ))}
        </div>
      </Section>

      <Section
        title="Bowl size"
        hint="Across the inside of the ring. Each step adds or removes one block a course, so every size needs no cut blocks."
      >
        <label htmlFor={`${ids}-units`} className="flex items-baseline justify-between gap-3 text-sm">
          <span className="font-bold text-char-700">Inside diameter</span>
          <output htmlFor={`${ids}-units`} className="text-lg font-extrabold text-char-900 tabular-nums">
            {shownSize ? `${f(shownSize.bowlDiameterIn)} across inside` : `${shownCount} blocks a course`}
          </output>
        </label>
        <input
          id={`${ids}-units`}
          type="range"
          name="units"
          min={minCount}
          max={maxCount}
          step={1}
          value={Math.min(maxCount, Math.max(minCount, shownCount))}
          aria-valuetext={
            shownSize ? `${f(shownSize.bowlDiameterIn)} across inside, ${shownCount} blocks a course` : undefined
          }
          aria-describedby={design.fitToRing ? `${ids}-fit-note` : undefined}
          // Moving the slider is choosing a size by hand: the bowl stops following the ring (and says so below).
          onChange={(e) => onChange({ unitCount: Number(e.target.value), fitToRing: false })}
          className="mt-2 w-full accent-ember-500"
        />
        <p className="text-xs text-char-500">{shownCount} blocks a course</p>
        {design.linerKind === "steel-ring" && rings.length ? (
          <label className="mt-3 flex items-center gap-2 text-sm font-bold text-char-700">
            <input
              type="checkbox"
              name="fit"
              value="ring"
              checked={design.fitToRing}
              onChange={(e) => onChange({ fitToRing: e.target.checked, unitCount: shownCount })}
              className="h-4 w-4 accent-ember-500"
            />
            Size the bowl to fit my steel ring insert
          </label>
        ) : null}
        {design.linerKind === "steel-ring" && rings.length ? (
          <p id={`${ids}-fit-note`} className="mt-1 text-xs text-char-600" aria-live="polite">
            {design.fitToRing
              ? `The bowl follows the ${ring?.name ?? "ring insert"}: the smallest size that fits it with room around it. Moving the slider picks your own size instead.`
              : `The bowl is the size you picked. Tick the box to size it to the ${ring?.name ?? "ring insert"} again.`}
          </p>
        ) : null}
      </Section>

      <Section
        title="Height"
        hint={`${design.courses} courses (rows of blocks): ${f(wallHeightIn)} high with the cap, ${describeSeat(wallHeightIn)}.`}
      >
        <div className="flex items-center gap-3">
          <button
            type="button"
            className="btn-quiet h-10 w-10 text-lg"
            aria-label="One course fewer"
            disabled={design.courses <= 1}
            onClick={() => onChange({ courses: design.courses - 1 })}
          >
            −
          </button>
          <label className="sr-only" htmlFor={`${ids}-courses`}>
            Courses
          </label>
          <input
            id={`${ids}-courses`}
            type="number"
            name="courses"
            min={1}
            max={MAX_COURSES}
            value={design.courses}
            onChange={(e) => onChange({ courses: Math.min(MAX_COURSES, Math.max(1, Number(e.target.value) || 1)) })}
            className="field-input mt-0 w-20 text-center"
          />
          <button
            type="button"
            className="btn-quiet h-10 w-10 text-lg"
            aria-label="One course more"
            disabled={design.courses >= MAX_COURSES}
            onClick={() => onChange({ courses: design.courses + 1 })}
          >
            +
          </button>
          <span className="text-sm text-char-600">courses</span>
        </div>
      </Section>

      <Section title="Cap" hint="Flat stones cut to wedges that finish the top of the wall.">
        <label className="field-label" htmlFor={`${ids}-cap`}>
          Cap stone
        </label>
        <select
          id={`${ids}-cap`}
          name="cap"
          value={design.capId === null ? "none" : String(design.capId)}
          onChange={(e) => onChange({ capId: e.target.value === "none" ? null : Number(e.target.value) })}
          className="field-input"
        >
          {caps.map((c) => (
            <option key={c.id} value={c.id}>
              {c.name} ({c.colourName})
            </option>
          ))}
          <option value="none">No caps</option>
        </select>
        {design.capId !== null ? (
          <>
            <label htmlFor={`${ids}-overhang`} className="mt-3 flex items-baseline justify-between text-sm">
              <span className="font-bold text-char-700">Overhang toward the fire</span>
              <output className="font-extrabold tabular-nums">{f(design.innerOverhangIn)}</output>
            </label>
            <input
              id={`${ids}-overhang`}
              type="range"
              name="overhang"
              min={0}
              max={MAX_INNER_OVERHANG_IN}
              step={OVERHANG_STEP_IN}
              value={design.innerOverhangIn}
              onChange={(e) => onChange({ innerOverhangIn: Number(e.target.value) })}
              className="mt-1 w-full accent-ember-500"
            />
          </>
        ) : null}
      </Section>

      <Section title="Liner" hint="Protects the blocks from direct flame, which can crack or spall them.">
        <div className="flex flex-col gap-2">
          {(
            [
              ["steel-ring", "Steel ring insert", rings.length > 0],
              ["firebrick", "Firebrick lining", hasFirebrick],
              ["none", "No liner", true],
            ] as [LinerKind, string, boolean][]
          )
            .filter(([, , offered]) => offered)
            .map(([kind, label]) => (
              <label key={kind} className="flex items-center gap-2 text-sm font-bold text-char-700">
                <input
                  type="radio"
                  name="liner"
                  value={kind}
                  checked={design.linerKind === kind}
                  onChange={() =>
                    onChange({ linerKind: kind, fitToRing: kind === "steel-ring" ? design.fitToRing : false })
                  }
                  className="h-4 w-4 accent-ember-500"
                />
                {label}
              </label>
            ))}
        </div>
        {design.linerKind === "steel-ring" ? (
          <>
            <label className="mt-3 field-label" htmlFor={`${ids}-ring`}>
              Ring insert
            </label>
            <select
              id={`${ids}-ring`}
              name="ring"
              value={design.ringId ?? ""}
              onChange={(e) => onChange({ ringId: Number(e.target.value) })}
              className="field-input"
            >
              {rings.map((r) => (
                <option key={r.id} value={r.id}>
                  {r.name} ({f(r.diameterIn ?? 0)} outside)
                </option>
              ))}
            </select>
          </>
        ) : null}
      </Section>

      {pavers.length && borders.length ? (
        <Section title="Patio around it" hint="An optional round paver patio with a border course at its edge.">
          <label className="flex items-center gap-2 text-sm font-bold text-char-700">
            <input
              type="checkbox"
              checked={design.patioRadiusFt > 0 || patioDraftFt !== null}
              onChange={(e) => {
                // Ticking asks for the size first; the price changes only once a size is chosen.
                if (e.target.checked) setPatioDraftFt(suggestedPatioFt);
                else {
                  setPatioDraftFt(null);
                  if (design.patioRadiusFt > 0) onChange({ patioRadiusFt: 0 });
                }
              }}
              className="h-4 w-4 accent-ember-500"
            />
            Add a round patio
          </label>
          {design.patioRadiusFt === 0 && patioDraftFt !== null ? (
            <div
              className="mt-3 flex flex-col gap-3 rounded-lg border border-ash-300 bg-ash-50 p-3"
              role="group"
              aria-labelledby={`${ids}-patio-ask`}
            >
              <p id={`${ids}-patio-ask`} className="text-sm font-bold text-char-800">
                How big a patio?
              </p>
              <p className="text-sm text-char-700">
                We suggest {suggestedPatioFt} ft out from the centre ({patioAcross(suggestedPatioFt, unit)}): room for a
                ring of chairs around the pit and a path behind them. The price changes when you add it.
              </p>
              <div>
                <label htmlFor={`${ids}-patio-draft`} className="flex items-baseline justify-between text-sm">
                  <span className="font-bold text-char-700">Patio radius</span>
                  <output htmlFor={`${ids}-patio-draft`} className="font-extrabold tabular-nums">
                    {patioDraftFt} ft ({patioAcross(patioDraftFt, unit)})
                  </output>
                </label>
                <input
                  id={`${ids}-patio-draft`}
                  type="range"
                  min={PATIO_RADIUS_FT.min}
                  max={PATIO_RADIUS_FT.max}
                  step={0.5}
                  value={patioDraftFt}
                  aria-valuetext={`${patioDraftFt} ft radius, ${patioAcross(patioDraftFt, unit)}`}
                  onChange={(e) => setPatioDraftFt(Number(e.target.value))}
                  className="mt-1 w-full accent-ember-500"
                />
              </div>
              <div className="flex flex-wrap gap-2">
                <button
                  type="button"
                  className="btn-primary"
                  onClick={() => {
                    onChange({ patioRadiusFt: patioDraftFt });
                    setPatioDraftFt(null);
                  }}
                >
                  Add a {patioDraftFt} ft patio
                </button>
                <button type="button" className="btn-quiet" onClick={() => setPatioDraftFt(null)}>
                  Not now
                </button>
              </div>
              <input type="hidden" name="patio" value="0" />
            </div>
          ) : design.patioRadiusFt > 0 ? (
            <div className="mt-3 flex flex-col gap-3">
              <div>
                <label htmlFor={`${ids}-patio`} className="flex items-baseline justify-between text-sm">
                  <span className="font-bold text-char-700">Patio radius</span>
                  <output className="font-extrabold tabular-nums">
                    {design.patioRadiusFt} ft ({patioAcross(design.patioRadiusFt, unit)})
                  </output>
                </label>
                <input
                  id={`${ids}-patio`}
                  type="range"
                  name="patio"
                  min={PATIO_RADIUS_FT.min}
                  max={PATIO_RADIUS_FT.max}
                  step={0.5}
                  value={design.patioRadiusFt}
                  onChange={(e) => onChange({ patioRadiusFt: Number(e.target.value) })}
                  className="mt-1 w-full accent-ember-500"
                />
              </div>
              <div className="grid gap-3 sm:grid-cols-2">
                <div>
                  <label className="field-label" htmlFor={`${ids}-paver`}>
                    Pavers
                  </label>
                  <select
                    id={`${ids}-paver`}
                    name="paver"
                    value={design.paverId ?? ""}
                    onChange={(e) => onChange({ paverId: Number(e.target.value) })}
                    className="field-input"
                  >
                    {pavers.map((p) => (
                      <option key={p.id} value={p.id}>
                        {p.name}
                      </option>
                    ))}
                  </select>
                </div>
                <div>
                  <label className="field-label" htmlFor={`${ids}-border`}>
                    Border
                  </label>
                  <select
                    id={`${ids}-border`}
                    name="border"
                    value={design.borderId ?? ""}
                    onChange={(e) => onChange({ borderId: Number(e.target.value) })}
                    className="field-input"
                  >
                    {borders.map((b) => (
                      <option key={b.id} value={b.id}>
                        {b.name}
                      </option>
                    ))}
                  </select>
                </div>
              </div>
            </div>
          ) : (
            <input type="hidden" name="patio" value="0" />
          )}
        </Section>
      ) : null}

      <Section
        title="Where it goes"
        hint="Fires need room: we compare each distance with what your contractor works to. Measure from where the fire will be."
      >
        {(
          [
            ["setback", "setbackFt", "Distance to the nearest building, deck or fence", "e.g. 30"],
            ["propertyLine", "propertyLineFt", "Distance to the property line", "e.g. 15"],
            ["branches", "branchesFt", "Distance to overhanging branches or wires", "e.g. 20"],
          ] as const
        ).map(([name, key, label, example]) => {
          const site = siteNotes?.[name];
          const describedBy = [
            site?.requiredFt != null ? `${ids}-${name}-needs` : null,
            site?.note ? `${ids}-${name}-note` : null,
          ]
            .filter(Boolean)
            .join(" ");
          return (
            <div key={name} className="mt-3 first:mt-0">
              <label className="field-label" htmlFor={`${ids}-${name}`}>
                {label}
              </label>
              <div className="relative mt-1 max-w-48">
                <DistanceInput
                  id={`${ids}-${name}`}
                  name={name}
                  describedBy={describedBy || undefined}
                  invalid={Boolean(site?.note)}
                  feet={design[key]}
                  example={example}
                  unit={unit}
                  onFeet={(feet) => onChange({ [key]: feet })}
                />
              </div>
              {site?.requiredFt != null ? (
                <p id={`${ids}-${name}-needs`} className="mt-1 text-xs text-char-600">
                  {speakLengths(`Your contractor works to at least ${site.requiredFt} ft.`, unit)}
                </p>
              ) : null}
              {/* The consequence sits beside its field; the full list of cautions stays under "Safety first". */}
              <p
                id={`${ids}-${name}-note`}
                aria-live="polite"
                className={
                  site?.note
                    ? "mt-1 rounded-md bg-alert-100 px-2 py-1.5 text-sm font-semibold text-alert-700"
                    : "sr-only"
                }
              >
                {site?.note ?? ""}
              </p>
            </div>
          );
        })}
      </Section>
    </div>
  );
}

/*
 * A distance from the fire. Stored in feet (to a tenth, what a tape reads on a yard); with millimetres
 * chosen it is typed and shown in metres to a tenth, so a metric reader never meets feet here.
 */
function DistanceInput({
  id,
  name,
  describedBy,
  invalid,
  feet,
  example,
  unit,
  onFeet,
}: {
  id: string;
  name: string;
  describedBy: string | undefined;
  invalid: boolean;
  feet: number | null;
  example: string;
  unit: LengthUnit;
  onFeet: (feet: number | null) => void;
}) {
  const metric = unit === "mm";
  const shown = feet === null ? "" : metric ? String(Math.round(feet * FT_TO_M * 10) / 10) : String(feet);
  const max = metric ? Math.floor(MAX_DISTANCE_FT * FT_TO_M) : MAX_DISTANCE_FT;
  return (
    <>
      <input
        id={id}
        aria-describedby={describedBy}
        aria-invalid={invalid || undefined}
        type="number"
        name={metric ? `${name}M` : name}
        min={0}
        max={max}
        step={0.1}
        inputMode="decimal"
        value={shown}
        placeholder={metric ? `e.g. ${Math.round(Number(example.replace(/\D/g, "")) * FT_TO_M)}` : example}
        onChange={(e) => {
          if (e.target.value === "") return onFeet(null);
          const typed = Number(e.target.value);
          if (!Number.isFinite(typed)) return;
          const inFeet = metric ? typed / FT_TO_M : typed;
          onFeet(Math.max(0, Math.min(MAX_DISTANCE_FT, Math.round(inFeet * 10) / 10)));
        }}
        className="field-input mt-0 pr-10"
      />
      {/* The form posts feet whatever the reader typed in. */}
      {metric ? <input type="hidden" name={name} value={feet ?? ""} /> : null}
      <span className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm text-char-500">
        {metric ? "m" : "ft"}
      </span>
    </>
  );
}
