/**
 * Warnings (the pit can be built, but not well) and cautions (safety and code notes shown with
 * every plan). Codes are stable kebab-case keys for the UI; messages are plain words. Codes and
 * fire-safety rules vary by place, so every caution defers to the local fire authority and codes.
 */
import type { CapPlan } from "~/domain/caps";
import type { LinerPlan } from "~/domain/liner";
import type { PatioPlan } from "~/domain/patio";
import type { RingNeighbour, RingPlan } from "~/domain/ring";
import { formatInches } from "~/domain/units";

export type WarningCode =
  | "open-face-joints"
  | "closure-units"
  | "back-trims"
  | "cap-overhang-outside-large"
  | "cap-overhang-outside-negative"
  | "cap-inner-overhang-large"
  | "cap-inner-overhang-short"
  | "liner-does-not-fit"
  | "liner-too-tall"
  | "bond-offset-small"
  | "bowl-small"
  | "bowl-large"
  | "seat-height";

export type Warning = { code: WarningCode; message: string };

export type CautionCode =
  | "setback"
  | "setback-too-close"
  | "property-line-too-close"
  | "branches-too-close"
  | "recreational-fire-size"
  | "line-the-bowl"
  | "drainage"
  | "base-and-cure"
  | "hot-caps-and-ash"
  | "attend-fire"
  | "burning-rules"
  | "gas-appliances"
  | "call-before-digging"
  | "wet-cutting"
  | "heavy-lifting";

export type CautionAudience = "homeowner" | "crew" | "both";

export type Caution = { code: CautionCode; message: string; audience: CautionAudience };

/** Thresholds for the warnings, inches. */
export const ADVICE_LIMITS = {
  // A face joint wider than a sanded joint shows (common practice, no source).
  openFaceJointIn: 1 / 16,
  // Outward overhang is usually 1–2 in; past 3 in the cap's edge is unsupported (common practice, no source).
  outerOverhangLargeIn: 3,
  // Inward 0–2 in: cap edges in the flame crack and spall (common practice, no source).
  innerOverhangLargeIn: 2,
  // Wood-burning bowls are commonly 36–44 in; under 30 in or over 48 in is unusual (from memory).
  bowlSmallIn: 30,
  bowlLargeIn: 48,
  // A recreational fire is at most 3 ft across and 2 ft high (International Fire Code §202, "recreational fire").
  recreationalFireAcrossIn: 36,
  // Walls commonly stand 12–18 in; a seat is 17–20 in high (from memory).
  wallLowIn: 12,
  wallHighIn: 20,
} as const;

/** Lists what is buildable but poor about the plan (lengths in, formatted to 1/16 in). */
export function listWarnings(args: {
  ring: RingPlan;
  caps: CapPlan | null;
  liner: LinerPlan | null;
  /** The smallest whole-unit ring that clears the chosen steel insert, when one exists. */
  ringForLiner?: RingNeighbour | null;
  /** Company limits: the largest outer overhang and the smallest joint offset between courses, in. */
  limits?: { capMaxOuterOverhangIn: number; minBondOffsetIn: number };
}): Warning[] {
  const { ring, caps, liner } = args;
  const maxOuterIn = args.limits?.capMaxOuterOverhangIn ?? ADVICE_LIMITS.outerOverhangLargeIn;
  const minBondIn = args.limits?.minBondOffsetIn ?? 0;
  const warnings: Warning[] = [];

  if (ring.limitedBy === "back" && ring.faceGapIn > ADVICE_LIMITS.openFaceJointIn) {
    const fix =
      ring.tightestBowlDiameterIn !== null
        ? `Rings with a bowl of ${formatInches(ring.tightestBowlDiameterIn)} or more close them.`
        : "Units with square ends always leave open joints on a curve: fill them or choose tapered units.";
    warnings.push({
      code: "open-face-joints",
      message: `The backs of these units meet first, so each joint on the outside face stays open about ${formatInches(ring.faceGapIn)}. ${fix}`,
    });
  }
  if (ring.closure) {
    const each = ring.closure.countPerCourse === 1 ? "one closure unit" : "two closure units";
    warnings.push({
      code: "closure-units",
      message: `An exact bowl needs ${each} in every course, cut along two radial lines to ${formatInches(ring.closure.faceWidthIn)} at the face. A whole-unit ring avoids these cuts.`,
    });
  }
  if (ring.bondOffsetIn !== null && ring.bondOffsetIn < minBondIn - 1e-9) {
    warnings.push({
      code: "bond-offset-small",
      message: `Even with the closures of alternate courses set apart, some joints fall only ${formatInches(ring.bondOffsetIn)} from the joints below; at least ${formatInches(minBondIn)} is usual. A whole-unit ring or a different bowl size lays a better bond.`,
    });
  }
  if (ring.backTrimPerSideIn > 0) {
    warnings.push({
      code: "back-trims",
      message: `So the face joints close at this bowl size, every unit needs ${formatInches(ring.backTrimPerSideIn)} trimmed off each back corner (${2 * ring.unitCount * ring.courses} extra cuts).`,
    });
  }

  if (caps) {
    const range = caps.overhangRange;
    if (range.outerMaxIn > maxOuterIn + 1e-9) {
      warnings.push({
        code: "cap-overhang-outside-large",
        message: `The caps overhang the outside of the wall by up to ${formatInches(range.outerMaxIn)} at their corners (${formatInches(caps.outerOverhangIn)} at the middle); 1 to 2 in is usual and ${formatInches(maxOuterIn)} the most you allow. Rip the blanks narrower to bring it in.`,
      });
    }
    if (range.outerMinIn < -1e-9) {
      warnings.push({
        code: "cap-overhang-outside-negative",
        message:
          caps.outerOverhangIn < 0
            ? `The caps stop ${formatInches(-caps.outerOverhangIn)} short of the wall's outside face, leaving the top of the wall showing. Use deeper caps or a smaller inner overhang.`
            : `The caps overhang the wall by ${formatInches(caps.outerOverhangIn)} at their middle, but where a cap's middle passes a wall unit's outside corner the corner shows by up to ${formatInches(-range.outerMinIn)}. Use deeper caps or a smaller inner overhang.`,
      });
    }
    if (
      caps.innerOverhangIn > ADVICE_LIMITS.innerOverhangLargeIn ||
      range.innerMaxIn > ADVICE_LIMITS.innerOverhangLargeIn + 0.5
    ) {
      warnings.push({
        code: "cap-inner-overhang-large",
        message: `The caps reach ${formatInches(caps.innerOverhangIn)} over the fire at the middle of the wall's back faces, up to ${formatInches(range.innerMaxIn)} where they pass a back corner. Cap edges in the flame crack and spall; keep the inner overhang to 2 in or less.`,
      });
    }
    if (range.innerMinIn < -1e-9) {
      warnings.push({
        code: "cap-inner-overhang-short",
        message: `At their inner corners the straight caps fall ${formatInches(-range.innerMinIn)} short of the wall's back face, so the top of the wall shows toward the fire there. Give the caps a little more inner overhang.`,
      });
    }
  }

  if (liner && !liner.fits) {
    const suggestion = args.ringForLiner
      ? ` A ring of ${args.ringForLiner.unitCount} units a course (${formatInches(args.ringForLiner.bowlDiameterIn)} bowl) clears it.`
      : "";
    warnings.push({
      code: "liner-does-not-fit",
      message:
        liner.kind === "steel-ring"
          ? `The ${formatInches(liner.outsideDiameterIn)} steel ring needs a bowl of at least ${formatInches(liner.requiredBowlDiameterIn)}; this bowl is ${formatInches(ring.bowlDiameterIn)}.${suggestion}`
          : `This bowl (${formatInches(ring.bowlDiameterIn)}) is too small to line with these firebricks on edge.`,
    });
  }

  if (liner?.kind === "steel-ring" && liner.tooTall) {
    warnings.push({
      code: "liner-too-tall",
      message: `The ${formatInches(liner.heightIn)} steel ring stands above the top of the block (${formatInches(liner.linedHeightIn)} under the caps), so the caps would rest on the ring. Add a course or choose a lower ring.`,
    });
  }

  const openingIn = fireOpeningOf(ring, liner);
  if (openingIn < ADVICE_LIMITS.bowlSmallIn) {
    const inside =
      openingIn < ring.bowlDiameterIn - 1e-9
        ? ` (${formatInches(openingIn)} inside the ${liner?.kind === "firebrick" ? "firebrick" : "ring"})`
        : "";
    warnings.push({
      code: "bowl-small",
      message: `The fire's opening${inside || ` of ${formatInches(openingIn)}`} is small for a wood fire: 36 to 44 in is usual, and small bowls push flames onto the walls.`,
    });
  }
  if (ring.bowlDiameterIn > ADVICE_LIMITS.bowlLargeIn) {
    warnings.push({
      code: "bowl-large",
      message: `A ${formatInches(ring.bowlDiameterIn)} bowl is large: 36 to 44 in is usual, and a big fire is harder to keep in hand.`,
    });
  }
  if (ring.wallHeightIn < ADVICE_LIMITS.wallLowIn || ring.wallHeightIn > ADVICE_LIMITS.wallHighIn) {
    warnings.push({
      code: "seat-height",
      message: `The wall stands ${formatInches(ring.wallHeightIn)} with its caps. Walls of 12 to 18 in are usual, and 17 to 20 in makes a comfortable seat.`,
    });
  }
  return warnings;
}

/** The fire's clear opening: inside the firebrick, inside a steel ring that fits, or the bowl itself, in. */
export function fireOpeningOf(ring: RingPlan, liner: LinerPlan | null): number {
  if (liner?.kind === "firebrick" && liner.fits) return liner.fireboxDiameterIn;
  if (liner?.kind === "steel-ring" && liner.fits) return liner.outsideDiameterIn;
  return ring.bowlDiameterIn;
}

const LOCAL_RULES = "Check with your local fire authority and codes.";

/** Distances from the fire on this site, ft; each is checked against the company's own setting. */
export type SiteDistances = { structureFt?: number; propertyLineFt?: number; branchesFt?: number };

export type CautionLimits = {
  requiredSetbackFt: number;
  requiredPropertyLineFt: number;
  requiredBranchClearanceFt: number;
};

/** Lists the safety and code notes to show with the plan (distances in ft, weights in lb). */
export function listCautions(args: {
  linerKind: "none" | "steel-ring" | "firebrick";
  requiredSetbackFt: number;
  /** The distance to the nearest structure (kept under its old name). */
  siteSetbackFt?: number;
  site?: SiteDistances;
  limits?: Partial<CautionLimits>;
  /** The fire's clear opening, in (for the recreational-fire size). */
  fireOpeningIn?: number;
  /** Heaviest wall unit and cap blank, lb. */
  weights?: { wallUnitLb: number; capBlankLb: number | null; lbPerFt3: number };
  /** True when the caps have arced edges to cut with a handheld saw. */
  handheldCuts?: boolean;
  patio?: PatioPlan | null;
}): Caution[] {
  const { linerKind, requiredSetbackFt } = args;
  const structureFt = args.site?.structureFt ?? args.siteSetbackFt;
  const propertyLineFt = args.limits?.requiredPropertyLineFt;
  const branchFt = args.limits?.requiredBranchClearanceFt;
  const cautions: Caution[] = [
    {
      code: "setback",
      audience: "both",
      message: `Keep the fire at least ${requiredSetbackFt} ft from buildings, fences, decks and anything that burns${propertyLineFt !== undefined ? `, ${propertyLineFt} ft from the property line` : ""}${branchFt !== undefined ? ` and ${branchFt} ft from overhanging branches and wires` : ""}. The International Fire Code (§307.4.2) sets 25 ft for recreational fires, and some local editions allow permanent fire pits closer; local rules range from 10 to 50 ft. ${LOCAL_RULES}`,
    },
  ];
  if (structureFt !== undefined && structureFt < requiredSetbackFt) {
    cautions.push({
      code: "setback-too-close",
      audience: "both",
      message: `The spot chosen is ${structureFt} ft from the nearest building or combustible, closer than the ${requiredSetbackFt} ft required. Move the pit, or confirm with your local fire authority before building.`,
    });
  }
  const propertyLine = args.site?.propertyLineFt;
  if (propertyLine !== undefined && propertyLineFt !== undefined && propertyLine < propertyLineFt) {
    cautions.push({
      code: "property-line-too-close",
      audience: "both",
      message: `The spot chosen is ${propertyLine} ft from the property line, closer than the ${propertyLineFt} ft asked for. Move the pit, or confirm the local rule with your town before building.`,
    });
  }
  const branches = args.site?.branchesFt;
  if (branches !== undefined && branchFt !== undefined && branches < branchFt) {
    cautions.push({
      code: "branches-too-close",
      audience: "both",
      message: `Overhanging branches or wires are ${branches} ft from the fire, closer than the ${branchFt} ft asked for. Move the pit, or have the branches cut back before the first fire.`,
    });
  }
  if (args.fireOpeningIn !== undefined && args.fireOpeningIn > ADVICE_LIMITS.recreationalFireAcrossIn + 1e-9) {
    cautions.push({
      code: "recreational-fire-size",
      audience: "both",
      message: `The fire's opening is about ${Math.round(args.fireOpeningIn)} in across. The International Fire Code (§202) treats a fire up to 3 ft across and 2 ft high as a recreational fire; a bigger fire may count as open burning, which the local fire authority may limit, require a permit for or forbid. Keep fires under 3 ft across and 2 ft high, or ask first. ${LOCAL_RULES}`,
    });
  }
  cautions.push(
    {
      code: "line-the-bowl",
      audience: "both",
      message:
        linerKind === "none"
          ? "This bowl has no liner. Ordinary concrete block, river rock and wet stone can crack or burst in direct flame as trapped moisture turns to steam: line the bowl with firebrick or a steel ring."
          : "Keep the liner in place: ordinary concrete block and wet stone can crack or burst in direct flame as trapped moisture turns to steam.",
    },
    {
      code: "drainage",
      audience: "crew",
      message:
        "Let the bowl drain: do not fill it with dense-graded base, which holds water under the fire. Use open-graded stone (clean gravel) under the fire, or a drain to daylight.",
    },
    {
      code: "base-and-cure",
      audience: "both",
      message:
        "Build on a compacted, well-drained base, below the frost depth where local practice asks for it. Let the adhesive cure (commonly about 7 days) before the first fire, and keep the first few fires small so the block and caps dry out slowly.",
    },
    {
      code: "attend-fire",
      audience: "homeowner",
      message: `Never leave a fire unattended, and keep a fire extinguisher (rated 4-A or better), a garden hose or a bucket of sand at hand (International Fire Code §307.5). ${LOCAL_RULES}`,
    },
    {
      code: "burning-rules",
      audience: "homeowner",
      message:
        "Do not burn during a burn ban. Burn only dry, seasoned, untreated wood. Never build a fire pit on a wooden deck, and keep it clear of overhanging branches, eaves and wires. Local ordinances may add more rules.",
    },
    {
      code: "hot-caps-and-ash",
      audience: "homeowner",
      message:
        "The caps get hot: watch children and pets around the fire. Use a spark screen for wood fires. Put out the fire fully, and carry cold ashes in a metal can with a tight lid, never in a bag or a plastic bin.",
    },
    {
      code: "gas-appliances",
      audience: "homeowner",
      message:
        "For gas instead of wood, use a burner listed as an outdoor gas fire pit appliance (ANSI Z21.97), installed and leak-tested by a licensed gas fitter (NFPA 54). Gas fire pits are for outdoors only: they give off carbon monoxide.",
    },
    {
      code: "call-before-digging",
      audience: "both",
      message: "Call 811 a few days before digging so buried gas, power and water lines are marked.",
    },
    {
      code: "wet-cutting",
      audience: "crew",
      message: `Cut block, caps and pavers wet, on a stationary masonry saw with its water feed running, to keep silica dust down (OSHA 29 CFR 1926.1153, Table 1). Keep the blade guard on (29 CFR 1926.702(i)) and wear eye and hearing protection.${args.handheldCuts === false ? "" : " Arced cap edges cut with a handheld saw need its water feed running too, and anyone cutting that way for more than 4 hours in a shift needs a respirator of APF 10 or more (Table 1)."}`,
    },
    {
      code: "heavy-lifting",
      audience: "crew",
      message: args.weights
        ? `Each wall unit weighs about ${Math.round(args.weights.wallUnitLb)} lb${args.weights.capBlankLb !== null ? ` and each cap blank about ${Math.round(args.weights.capBlankLb)} lb` : ""} (at about ${args.weights.lbPerFt3} lb/ft³ of concrete; check the supplier's figure). Lift anything over about 50 lb with two people, bend the knees and keep the back straight.`
        : "Caps and large wall units are heavy: lift them with two people.",
    },
  );
  return cautions;
}
