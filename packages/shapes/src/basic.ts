import { arc, makeRegion, type Loop, type Point, type Region } from '@keelson/geometry';
import { filletedPolygon, polygon } from './fillet';

/** Counter-clockwise rectangle loop with its lower-left corner at (x0, y0). */
export function rectangleLoop(w: number, h: number, x0 = 0, y0 = 0, r = 0): Loop {
  return filletedPolygon([
    { x: x0, y: y0, r },
    { x: x0 + w, y: y0, r },
    { x: x0 + w, y: y0 + h, r },
    { x: x0, y: y0 + h, r },
  ]);
}

export function circleLoop(radius: number, c: Point = { x: 0, y: 0 }): Loop {
  return [arc(c, radius, 0, 2 * Math.PI)];
}

export const rectangle = (w: number, h: number, x0 = 0, y0 = 0): Region =>
  makeRegion([{ outer: rectangleLoop(w, h, x0, y0), holes: [] }]);

export const circle = (radius: number, c: Point = { x: 0, y: 0 }): Region =>
  makeRegion([{ outer: circleLoop(radius, c), holes: [] }]);

/** Circular tube of outer diameter D and inner diameter d. */
export const tube = (D: number, d: number, c: Point = { x: 0, y: 0 }): Region =>
  makeRegion([{ outer: circleLoop(D / 2, c), holes: [circleLoop(d / 2, c)] }]);

export const polygonRegion = (points: readonly Point[]): Region => makeRegion([{ outer: polygon(points), holes: [] }]);
