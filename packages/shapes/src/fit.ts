import { GeometryError } from '@keelson/geometry';
import type { Corner } from './fillet';

/**
 * Throws unless the fillets at both ends of every side fit on it together. (`filletedPolygon`
 * checks each fillet against its sides alone; two fillets sharing a short side could overlap.)
 */
export function assertFilletsFit(corners: readonly Corner[], label: string): void {
  const n = corners.length;
  const tangent = corners.map((v, i) => {
    const p = corners[(i + n - 1) % n]!;
    const q = corners[(i + 1) % n]!;
    const a1 = Math.atan2(v.y - p.y, v.x - p.x);
    const a2 = Math.atan2(q.y - v.y, q.x - v.x);
    const turn = Math.atan2(Math.sin(a2 - a1), Math.cos(a2 - a1));
    return (v.r ?? 0) * Math.tan(Math.abs(turn) / 2);
  });
  for (let i = 0; i < n; i++) {
    const v = corners[i]!;
    const q = corners[(i + 1) % n]!;
    const side = Math.hypot(q.x - v.x, q.y - v.y);
    if (tangent[i]! + tangent[(i + 1) % n]! > side * (1 + 1e-12))
      throw new GeometryError(
        'DEGENERATE_LOOP',
        `${label}: fillets at (${v.x}, ${v.y}) and (${q.x}, ${q.y}) overlap on a side of length ${side}`,
      );
  }
}
