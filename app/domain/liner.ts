/**
 * Bowl liners: a steel ring insert dropped into the bowl, or firebrick stood on edge inside the
 * wall. Lengths in inches; the bowl is the circle of diameter ID = 2a that just fits inside the
 * wall's polygon (edge-distance convention, see ring.ts).
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
};

export type FirebrickPlan = {
  kind: "firebrick";
  /** False when not even three bricks fit inside the bowl. */
  fits: boolean;
  bricksPerRow: number;
  rows: number;
  totalBricks: number;
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
  /** Between a brick's outer face (middle) and the bowl circle, filled with sand or mortar, in. */
  gapToWallIn: number;
  /** Height lined: the wall below the caps, in. */
  linedHeightIn: number;
};

export type LinerPlan = SteelRingPlan | FirebrickPlan;

/** Checks a steel ring insert against the bowl (in; unrounded). */
export function planSteelRing(args: { bowlDiameterIn: number; insert: SteelRingInsert; minGapIn: number }): SteelRingPlan {
  const { bowlDiameterIn, insert, minGapIn } = args;
  const requiredBowlDiameterIn = insert.outsideDiameterIn + 2 * minGapIn;
  return {
    kind: "steel-ring",
    outsideDiameterIn: insert.outsideDiameterIn,
    heightIn: insert.heightIn,
    // A hair of tolerance so a bowl sized exactly to the requirement counts as clearing it.
    fits: bowlDiameterIn >= requiredBowlDiameterIn - 1e-9,
    gapIn: (bowlDiameterIn - insert.outsideDiameterIn) / 2,
    requiredBowlDiameterIn,
    minGapIn,
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
 */
/** Lines the bowl with firebrick on edge (in; counts whole bricks, rows rounded up). */
export function planFirebrick(args: { bowlDiameterIn: number; linedHeightIn: number; brick: FirebrickSize }): FirebrickPlan {
  const { bowlDiameterIn, linedHeightIn, brick } = args;
  const bowlRadiusIn = bowlDiameterIn / 2;
  const t = brick.heightIn;
  const outerCornerRadius = (count: number) =>
    Math.hypot(firebrickInnerEdgeDistance(brick.lengthIn, count) + t, brick.lengthIn / 2);
  let count = 0;
  // The corner radius grows with the count, so the first count that fails ends the search.
  for (let m = 3; m <= 1000 && outerCornerRadius(m) <= bowlRadiusIn + 1e-9; m++) count = m;
  const rows = Math.max(1, Math.ceil(linedHeightIn / brick.widthIn - 1e-9));
  if (count === 0) {
    return {
      kind: "firebrick",
      fits: false,
      bricksPerRow: 0,
      rows,
      totalBricks: 0,
      rowHeightIn: brick.widthIn,
      thicknessIn: t,
      innerEdgeDistanceIn: 0,
      fireboxDiameterIn: 0,
      outerJointIn: 0,
      gapToWallIn: 0,
      linedHeightIn,
    };
  }
  const innerEdgeDistanceIn = firebrickInnerEdgeDistance(brick.lengthIn, count);
  return {
    kind: "firebrick",
    fits: true,
    bricksPerRow: count,
    rows,
    totalBricks: count * rows,
    rowHeightIn: brick.widthIn,
    thicknessIn: t,
    innerEdgeDistanceIn,
    fireboxDiameterIn: 2 * innerEdgeDistanceIn,
    outerJointIn: 2 * (innerEdgeDistanceIn + t) * Math.tan(Math.PI / count) - brick.lengthIn,
    gapToWallIn: bowlRadiusIn - innerEdgeDistanceIn - t,
    linedHeightIn,
  };
}
