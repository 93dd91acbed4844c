/*
 * Looking after a new masonry pit, as hardscapers commonly tell their customers (common practice,
 * no source unless named): the adhesive cures before the first fire; small first fires drive the
 * moisture out of new block; cold ash goes into a metal can with a lid (fire services' home-safety
 * guidance); a spark screen for wood fires; water left standing in the bowl cracks stone in
 * freeze-thaw; and the local fire authority's rules come first (the International Fire Code §307
 * sets the usual recreational-fire limits, which towns adopt and change).
 */
export const CARE_NOTES = [
  "Let the adhesive cure before the first fire: about a week is usual, longer in cold or damp weather. Ask your contractor if you are not sure.",
  "Keep the first few fires small. New block and stone hold moisture, and a slow start lets it dry out instead of cracking the faces.",
  "Burn only dry, untreated firewood, keep the fire inside the bowl, and never leave it unattended. Keep a hose, a bucket of sand or an extinguisher nearby.",
  "Use a spark screen whenever you burn wood, and keep children and pets back: the caps get hot.",
  "Let the ash go cold, then shovel it into a metal can with a lid, never a plastic bin or a paper bag.",
  "In winter, keep water from standing in the bowl: trapped water freezes, expands and cracks stone. Clear the drain, and cover the pit between uses.",
  "Your town's fire rules come first: burn bans, permits and distances from buildings differ from place to place. Check with your local fire authority before you light up.",
];
