/**
 * Bowl liners: a steel ring insert dropped into the bowl, or firebrick stood on edge inside the
 * wall. Lengths in inches; the bowl is the circle of diameter ID = 2a that just fits inside the
 * wall's polygon (edge-distance convention, see ring.ts).
 *
 * Both stop at or below the underside of the caps, so the caps bear on the block and never on the
 * liner (common practice, no source). The space between liner and wall is filled with sand or
 * gravel, and that fill is ordered: the wall's inside is a polygon of N flats at distance a, with
 * area N·a²·tan(π/N) (regular-polygon area, derived from the chord c = 2a·tan(π/N), Machinery's
 * Handbook, "Segments of a Circle").
 */
export type SteelRingInsert = { outsideDiameterIn: number; heightIn: number };

export type FirebrickSize = {
  /** Along the ring (a "9 in straight" is 9 × 4½ × 2½ in, supplier literature). */
  lengthIn: number;
  /** Stands up when the brick is on edge: one row's height. */
  widthIn: number;
  /** Radial thickness when on edge. */
  heightIn: number;
};

export type SteelRingPlan = {
  kind: "steel-ring";
  outsideDiameterIn: number;
  heightIn: number;
  /** True when the bowl clears the insert plus the minimum gap all round. */
  fits: boolean;
  /** (ID − insert OD)/2: gravel-filled space each side; negative when the insert is too big, in. */
  gapIn: number;
  /** Smallest bowl that clears this insert: OD + 2 × minimum gap, in. */
  requiredBowlDiameterIn: number;
  minGapIn: number;
  /** Height the liner may reach: the top of the block, less the clearance under the caps, in. */
  linedHeightIn: number;
  /** Gravel bed to set the ring on so its top comes up under the caps (0 when not needed), in. */
  bedDepthIn: number;
  /** True when the ring stands above the top of the block (the caps could not sit flat). */
  tooTall: boolean;
  /** Loose fill for the gap round the ring and the bed under it, ft³. */
  fillFt3: number;
};

export type FirebrickPlan = {
  kind: "firebrick";
  /** False when not even three bricks fit inside the bowl. */
  fits: boolean;
  bricksPerRow: number;
  /** Rows of whole bricks on edge. */
  fullRows: number;
  /** Rows ripped to height at the top (0 or 1). */
  rippedRows: number;
  /** Height each brick of the ripped row is ripped to, in (null when no row is ripped). */
  ripHeightIn: number | null;
  /** All rows, whole and ripped. */
  rows: number;
  totalBricks: number;
  /** Rip cuts: one per brick of the ripped row. */
  ripCuts: number;
  /** Row height: the brick's width, since it stands on edge, in. */
  rowHeightIn: number;
  /** Radial thickness of the lining, in. */
  thicknessIn: number;
  /** Centre to the middle of the bricks' fire-side faces, in. */
  innerEdgeDistanceIn: number;
  /** Clear opening inside the firebrick: twice the inner edge distance, in. */
  fireboxDiameterIn: number;
  /** Open V-joint between neighbouring bricks at their outer faces, in. */
  outerJointIn: number;
  /** Between a brick's outer face (middle) and the bowl circle, filled with sand, in. */
  gapToWallIn: number;
  /** Height the lining may reach: the top of the block, less the clearance under the caps, in. */
  linedHeightIn: number;
  /** Height the lining actually reaches: rows and their joints, in. */
  builtHeightIn: number;
  /** Refractory mortar joint, in. */
  jointIn: number;
  /** Mortar in the bed and head joints, in³ (before waste). */
  mortarIn3: number;
  /** Loose sand between the lining and the wall, ft³. */
  fillFt3: number;
};

export type LinerPlan = SteelRingPlan | FirebrickPlan;

/** Cubic inches in a cubic foot: 12³ (NIST SP 811). */
export const IN3_PER_FT3 = 1728;

/** Inside area of the wall, a polygon of `sides` flats at edge distance a: sides·a²·tan(π/sides), in². */
export function wallInsideArea(edgeDistanceIn: number, sides: number): number {
  return sides * edgeDistanceIn ** 2 * Math.tan(Math.PI / sides);
}

/** Checks a steel ring insert against the bowl and sets its height (in; fill in ft³; unrounded). */
export function planSteelRing(args: {
  bowlDiameterIn: number;
  insert: SteelRingInsert;
  minGapIn: number;
  /** Top of the block, less the clearance under the caps, in. */
  linedHeightIn?: number;
  /** Sides of the wall's inside polygon (pieces a course). */
  wallSides?: number;
  /** Raise the ring when its top sits more than this below the lined height, in. */
  raiseOverIn?: number;
}): SteelRingPlan {
  const { bowlDiameterIn, insert, minGapIn } = args;
  const linedHeightIn = args.linedHeightIn ?? insert.heightIn;
  const requiredBowlDiameterIn = insert.outsideDiameterIn + 2 * minGapIn;
  const below = linedHeightIn - insert.heightIn;
  const bedDepthIn = below > (args.raiseOverIn ?? Infinity) + 1e-9 ? below : 0;
  const sides = args.wallSides ?? 0;
  const a = bowlDiameterIn / 2;
  const insideIn2 = sides >= 3 ? wallInsideArea(a, sides) : Math.PI * a * a;
  const ringIn2 = Math.PI * (insert.outsideDiameterIn / 2) ** 2;
  // The bed covers the whole bowl floor; the gap round the ring is filled to the ring's top.
  const fillIn3 = Math.max(0, insideIn2 - ringIn2) * insert.heightIn + insideIn2 * bedDepthIn;
  return {
    kind: "steel-ring",
    outsideDiameterIn: insert.outsideDiameterIn,
    heightIn: insert.heightIn,
    // A hair of tolerance so a bowl sized exactly to the requirement counts as clearing it.
    fits: bowlDiameterIn >= requiredBowlDiameterIn - 1e-9,
    gapIn: (bowlDiameterIn - insert.outsideDiameterIn) / 2,
    requiredBowlDiameterIn,
    minGapIn,
    linedHeightIn,
    bedDepthIn,
    tooTall: insert.heightIn > linedHeightIn + 1e-9,
    fillFt3: fillIn3 / IN3_PER_FT3,
  };
}

/** Inner edge distance (in) of a ring of `count` rectangular bricks whose fire-side corners touch. */
export function firebrickInnerEdgeDistance(brickLengthIn: number, count: number): number {
  // Regular-polygon chord formula a = c / (2·tan(π/N)) (Machinery's Handbook, "Segments of a Circle").
  return brickLengthIn / (2 * Math.tan(Math.PI / count));
}

/*
 * Firebrick model (derived here from the formulas): the bricks stand on edge in a ring of their own
 * against the inside of the wall. A rectangular brick meets its neighbours first at its fire-side
 * corners, so a ring of M bricks has its inner faces at a_in = L / (2·tan(π/M)), its outer faces at
 * a_in + t, and open V-joints at the outer face. Its farthest points are the outer corners, at
 * √((a_in + t)² + (L/2)²); they must stay inside the bowl circle (radius a), which fits inside the
 * wall's polygon whatever its unit count. The largest such M hugs the wall best.
 *
 * Rows: each row is the brick's width plus one mortar bed joint j. Whole rows fill the lined height
 * h: floor(h / (w + j)); what is left, less its own joint, becomes one ripped row when it is at
 * least the smallest sensible rip, so the lining never stands above the block (common practice,
 * no source). Mortar: a bed joint (L × t) and a head joint under every brick, the head joint
 * j wide at the fire face and j + the open V at the back.
 */
/** Lines the bowl with firebrick on edge (in, in³, ft³; whole bricks; rows never above the lined height). */
export function planFirebrick(args: {
  bowlDiameterIn: number;
  /** Top of the block, less the clearance under the caps, in. */
  linedHeightIn: number;
  brick: FirebrickSize;
  jointIn?: number;
  /** A ripped top row narrower than this is left out, in. */
  minRipIn?: number;
  /** Sides of the wall's inside polygon (pieces a course). */
  wallSides?: number;
}): FirebrickPlan {
  const { bowlDiameterIn, linedHeightIn, brick } = args;
  const j = args.jointIn ?? 0;
  const minRipIn = args.minRipIn ?? 1;
  const bowlRadiusIn = bowlDiameterIn / 2;
  const t = brick.heightIn;
  const w = brick.widthIn;
  const outerCornerRadius = (count: number) =>
    Math.hypot(firebrickInnerEdgeDistance(brick.lengthIn, count) + t, brick.lengthIn / 2);
  let count = 0;
  // The corner radius grows with the count, so the first count that fails ends the search.
  for (let m = 3; m <= 1000 && outerCornerRadius(m) <= bowlRadiusIn + 1e-9; m++) count = m;
  const pitch = w + j;
  const fullRows = Math.max(0, Math.floor(linedHeightIn / pitch + 1e-9));
  const leftIn = linedHeightIn - fullRows * pitch - j;
  const ripHeightIn = leftIn >= minRipIn - 1e-9 && leftIn < w - 1e-9 ? leftIn : null;
  const rippedRows = ripHeightIn === null ? 0 : 1;
  const rows = fullRows + rippedRows;
  const builtHeightIn = fullRows * pitch + (ripHeightIn === null ? 0 : ripHeightIn + j);
  const empty = {
    kind: "firebrick" as const,
    rowHeightIn: w,
    thicknessIn: t,
    linedHeightIn,
    jointIn: j,
  };
  if (count === 0 || rows === 0) {
    return {
      ...empty,
      fits: false,
      bricksPerRow: count,
      fullRows,
      rippedRows,
      ripHeightIn,
      rows,
      totalBricks: 0,
      ripCuts: 0,
      innerEdgeDistanceIn: 0,
      fireboxDiameterIn: 0,
      outerJointIn: 0,
      gapToWallIn: 0,
      builtHeightIn: 0,
      mortarIn3: 0,
      fillFt3: 0,
    };
  }
  const innerEdgeDistanceIn = firebrickInnerEdgeDistance(brick.lengthIn, count);
  const outerJointIn = 2 * (innerEdgeDistanceIn + t) * Math.tan(Math.PI / count) - brick.lengthIn;
  const totalBricks = count * rows;
  const brickHeights = fullRows * w + (ripHeightIn ?? 0);
  // Bed joints: one under every brick. Head joints: between neighbours, j + half the V on average.
  const mortarIn3 = count * (rows * brick.lengthIn * t * j + brickHeights * t * (j + outerJointIn / 2));
  // Fill: the wall's inside less the brick ring's outer polygon (its V-joints take mortar), to the lining's height.
  const sides = args.wallSides ?? 0;
  const insideIn2 = sides >= 3 ? wallInsideArea(bowlRadiusIn, sides) : Math.PI * bowlRadiusIn ** 2;
  const liningIn2 = wallInsideArea(innerEdgeDistanceIn + t, count);
  const fillIn3 = Math.max(0, insideIn2 - liningIn2) * builtHeightIn;
  return {
    ...empty,
    fits: true,
    bricksPerRow: count,
    fullRows,
    rippedRows,
    ripHeightIn,
    rows,
    totalBricks,
    ripCuts: rippedRows * count,
    innerEdgeDistanceIn,
    fireboxDiameterIn: 2 * innerEdgeDistanceIn,
    outerJointIn,
    gapToWallIn: bowlRadiusIn - innerEdgeDistanceIn - t,
    builtHeightIn,
    mortarIn3,
    fillFt3: fillIn3 / IN3_PER_FT3,
  };
}
