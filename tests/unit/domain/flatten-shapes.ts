/*
 * Independent reference geometry built with @flatten-js/core: the engine's numbers are turned into
 * real polygons laid around the centre, and overlap, touching and distance are measured by the
 * library, not by the engine's own formulas.
 */
import { BooleanOperations, Polygon, point } from "@flatten-js/core";

export type FlatPolygon = Polygon;

/** Rotates local (radial x, tangential y) points by `angle` radians about the origin. */
function placeAt(points: [number, number][], angle: number): FlatPolygon {
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  return new Polygon(points.map(([x, y]) => point(x * c - y * s, x * s + y * c)));
}

/** A tapered wall unit: back face at edge distance a, face at a + T, centred on `angle`. */
export function wallUnitPolygon(a: number, unit: { faceIn: number; backIn: number; depthIn: number }, angle: number) {
  const { faceIn: f, backIn: b, depthIn: t } = unit;
  return placeAt(
    [
      [a, -b / 2],
      [a + t, -f / 2],
      [a + t, f / 2],
      [a, b / 2],
    ],
    angle,
  );
}

/** A wedge of half-angle `halfAngle` centred on `angle`, out to edge distance `reach`. */
export function sectorPolygon(halfAngle: number, reach: number, angle: number) {
  const halfWidth = reach * Math.tan(halfAngle);
  return placeAt(
    [
      [0, 0],
      [reach, -halfWidth],
      [reach, halfWidth],
    ],
    angle,
  );
}

/** A cap: a trapezoid between edge distances a1 and a2, widths c1 and c2, centred on `angle`. */
export function capPolygon(a1: number, a2: number, c1: number, c2: number, angle: number) {
  return placeAt(
    [
      [a1, -c1 / 2],
      [a2, -c2 / 2],
      [a2, c2 / 2],
      [a1, c1 / 2],
    ],
    angle,
  );
}

/** A rectangle (border unit) with its inner edge at edge distance r, centred on `angle`. */
export function rectanglePolygon(r: number, depth: number, length: number, angle: number) {
  return placeAt(
    [
      [r, -length / 2],
      [r + depth, -length / 2],
      [r + depth, length / 2],
      [r, length / 2],
    ],
    angle,
  );
}

export function overlapArea(p: FlatPolygon, q: FlatPolygon): number {
  return BooleanOperations.intersect(p, q).area();
}

export function clip(p: FlatPolygon, q: FlatPolygon): FlatPolygon {
  return BooleanOperations.intersect(p, q);
}

export function gapBetween(p: FlatPolygon, q: FlatPolygon): number {
  return p.distanceTo(q)[0];
}

export function vertexDistance(p: FlatPolygon, x: number, y: number): number {
  return Math.min(...p.vertices.map((v) => Math.hypot(v.x - x, v.y - y)));
}

export { point };
