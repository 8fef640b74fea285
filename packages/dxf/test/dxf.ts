/** Tiny ASCII DXF builder for tests: a HEADER with $INSUNITS and an ENTITIES section. */
export type Tag = readonly [code: number, value: string | number];

export interface DxfOptions {
  /** `$INSUNITS` (default 4, millimetres); null leaves it out. */
  insunits?: number | null;
  /** Extra sections written before ENTITIES, as tags. */
  before?: readonly Tag[];
}

let handle = 0x100;
const h = (): Tag => [5, (handle++).toString(16).toUpperCase()];

export function dxf(entities: readonly (readonly Tag[])[], opts: DxfOptions = {}): string {
  const insunits = opts.insunits === undefined ? 4 : opts.insunits;
  const tags: Tag[] = [[0, 'SECTION'], [2, 'HEADER'], [9, '$ACADVER'], [1, 'AC1015']];
  if (insunits !== null) tags.push([9, '$INSUNITS'], [70, insunits]);
  tags.push([0, 'ENDSEC'], ...(opts.before ?? []), [0, 'SECTION'], [2, 'ENTITIES']);
  for (const e of entities) tags.push(...e);
  tags.push([0, 'ENDSEC'], [0, 'EOF']);
  return tags.map(([c, v]) => `${String(c).padStart(3)}\n${v}`).join('\n') + '\n';
}

type XY = readonly [number, number];
const normal = (z: number | undefined): Tag[] => (z === undefined ? [] : [[210, 0], [220, 0], [230, z]]);

export const LINE = (a: XY, b: XY, layer = '0'): Tag[] => [
  [0, 'LINE'], h(), [8, layer], [10, a[0]], [20, a[1]], [30, 0], [11, b[0]], [21, b[1]], [31, 0],
];

/** ARC with angles in degrees, counter-clockwise about the extrusion direction (0, 0, z). */
export const ARC = (c: XY, r: number, startDeg: number, endDeg: number, z?: number): Tag[] => [
  [0, 'ARC'], h(), [8, '0'], [10, c[0]], [20, c[1]], [30, 0], [40, r], ...normal(z), [50, startDeg], [51, endDeg],
];

export const CIRCLE = (c: XY, r: number, z?: number): Tag[] => [
  [0, 'CIRCLE'], h(), [8, '0'], [10, c[0]], [20, c[1]], [30, 0], [40, r], ...normal(z),
];

/** LWPOLYLINE through [x, y, bulge?] vertices. */
export const LWPOLYLINE = (pts: readonly (readonly [number, number, number?])[], closed = true, z?: number): Tag[] => [
  [0, 'LWPOLYLINE'], h(), [8, '0'], [90, pts.length], [70, closed ? 1 : 0], ...normal(z),
  ...pts.flatMap(([x, y, b]): Tag[] => [[10, x], [20, y], ...(b ? ([[42, b]] as Tag[]) : [])]),
];

export const rectLines = (x0: number, y0: number, w: number, h: number): Tag[][] => [
  LINE([x0, y0], [x0 + w, y0]),
  LINE([x0 + w, y0], [x0 + w, y0 + h]),
  LINE([x0 + w, y0 + h], [x0, y0 + h]),
  LINE([x0, y0 + h], [x0, y0]),
];
