import { readDrawing } from '@keelson/dxf';
import { lengthFactor } from '@keelson/geometry';
import { decodeDrawing } from '@keelson/profile';
import { SectionFault, outlineOf, type ComputeSection } from '@keelson/verify';
import type { ComputePool } from '../pool/pool';

/**
 * Verification's computation on the service's worker threads (background priority, each drawing
 * under the pool's time and memory limits), as jobs are computed. The outline for the report is
 * read alongside on this thread: reading is quick, the finite elements are not.
 */
export function poolCompute(pool: ComputePool, maxBytes: number): ComputeSection {
  return async (bytes, opts) => {
    const [out, drawing] = await Promise.all([
      pool.run({ bytes, name: opts.name, source: opts.source, settings: { units: opts.units, drawingUnits: opts.drawingUnits, torsion: 1e-3 }, maxBytes }, { priority: 'background' }),
      readDrawing(decodeDrawing(bytes), { file: opts.source, drawingUnits: opts.drawingUnits, maxBytes }).catch(() => null),
    ]);
    if (!out.ok) throw new SectionFault(out.code, out.message);
    const p = out.profiles[0]!;
    if ('error' in p) throw new SectionFault(p.error.code, p.error.message);
    const outline = drawing ? outlineOf(drawing.region, lengthFactor(drawing.unit, opts.units)) : { d: '', box: { xmin: 0, ymin: 0, xmax: 0, ymax: 0 } };
    return { profile: p, outline };
  };
}
