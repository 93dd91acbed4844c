/**
 * Lengths (in) and angles (rad) closer than this count as equal: far below anything a tape, a saw
 * or a screen can show, and far above the rounding error of the geometry's floating-point sums.
 */
export const EPS = 1e-9;
