/**
 * Warnings (the pit can be built, but not well) and cautions (safety and code notes shown with
 * every plan). Codes are stable kebab-case keys for the UI; messages are plain words. Codes and
 * fire-safety rules vary by place, so every caution defers to the local fire authority and codes.
 */
import type { CapPlan } from "~/domain/caps";
import type { LinerPlan } from "~/domain/liner";
import type { RingNeighbour, RingPlan } from "~/domain/ring";
import { formatInches } from "~/domain/units";

export type WarningCode =
  | "open-face-joints"
  | "closure-units"
  | "back-trims"
  | "cap-overhang-outside-large"
  | "cap-overhang-outside-negative"
  | "cap-inner-overhang-large"
  | "liner-does-not-fit"
  | "bowl-small"
  | "bowl-large"
  | "seat-height";

export type Warning = { code: WarningCode; message: string };

export type CautionCode =
  | "setback"
  | "setback-too-close"
  | "line-the-bowl"
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
}): Warning[] {
  const { ring, caps, liner } = args;
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
  if (ring.backTrimPerSideIn > 0) {
    warnings.push({
      code: "back-trims",
      message: `So the face joints close at this bowl size, every unit needs ${formatInches(ring.backTrimPerSideIn)} trimmed off each back corner (${2 * ring.unitCount * ring.courses} extra cuts).`,
    });
  }

  if (caps) {
    if (caps.outerOverhangIn > ADVICE_LIMITS.outerOverhangLargeIn) {
      warnings.push({
        code: "cap-overhang-outside-large",
        message: `The caps overhang the outside of the wall by ${formatInches(caps.outerOverhangIn)}; 1 to 2 in is usual. Rip the blanks narrower to bring it in.`,
      });
    }
    if (caps.outerOverhangIn < 0) {
      warnings.push({
        code: "cap-overhang-outside-negative",
        message: `The caps stop ${formatInches(-caps.outerOverhangIn)} short of the wall's outside face, leaving the top of the wall showing. Use deeper caps or a smaller inner overhang.`,
      });
    }
    if (caps.innerOverhangIn > ADVICE_LIMITS.innerOverhangLargeIn) {
      warnings.push({
        code: "cap-inner-overhang-large",
        message: `The caps reach ${formatInches(caps.innerOverhangIn)} over the fire. Cap edges in the flame crack and spall; keep the inner overhang to 2 in or less.`,
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

  if (ring.bowlDiameterIn < ADVICE_LIMITS.bowlSmallIn) {
    warnings.push({
      code: "bowl-small",
      message: `A ${formatInches(ring.bowlDiameterIn)} bowl is small for a wood fire: 36 to 44 in is usual, and small bowls push flames onto the walls.`,
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

const LOCAL_RULES = "Check with your local fire authority and codes.";

/** Lists the safety and code notes to show with the plan (setback compared in ft). */
export function listCautions(args: {
  linerKind: "none" | "steel-ring" | "firebrick";
  requiredSetbackFt: number;
  siteSetbackFt?: number;
}): Caution[] {
  const { linerKind, requiredSetbackFt, siteSetbackFt } = args;
  const cautions: Caution[] = [
    {
      code: "setback",
      audience: "both",
      message: `Keep the fire at least ${requiredSetbackFt} ft from buildings, fences, decks and anything that burns. The International Fire Code (§307.4.2) sets 25 ft for recreational fires, and some local editions allow permanent fire pits closer; local rules range from 10 to 50 ft. ${LOCAL_RULES}`,
    },
  ];
  if (siteSetbackFt !== undefined && siteSetbackFt < requiredSetbackFt) {
    cautions.push({
      code: "setback-too-close",
      audience: "both",
      message: `The spot chosen is ${siteSetbackFt} ft from the nearest building or combustible, closer than the ${requiredSetbackFt} ft required. Move the pit, or confirm with your local fire authority before building.`,
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
      message:
        "Cut block, caps and pavers wet, on a stationary masonry saw with its water feed running, to keep silica dust down (OSHA 29 CFR 1926.1153, Table 1). Keep the blade guard on (29 CFR 1926.702(i)) and wear eye and hearing protection.",
    },
    {
      code: "heavy-lifting",
      audience: "crew",
      message: "Caps and large wall units are heavy: lift them with two people.",
    },
  );
  return cautions;
}
