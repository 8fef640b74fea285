import { DxfError } from '@keelson/dxf';
import { PROPERTY_KEYS, type Profile } from '@keelson/profile';
import type { ComputeSection, SectionOptions } from '../src';

export const enc = (s: string): Uint8Array => new TextEncoder().encode(s);

/**
 * A stand-in computation: every drawing is a 10 × 10 mm square (A 100 mm², Ix 833.3 mm⁴, J 1406 mm⁴),
 * every other property 1; a drawing reading "broken" is not a DXF. Calls are counted.
 */
export function stub(): { compute: ComputeSection; calls: SectionOptions[] } {
  const calls: SectionOptions[] = [];
  const compute: ComputeSection = async (bytes, opts) => {
    calls.push(opts);
    if (new TextDecoder().decode(bytes) === 'broken') throw new DxfError('NOT_DXF', opts.source, 'not a DXF file');
    const properties = Object.fromEntries(PROPERTY_KEYS.map((k) => [k, 1])) as unknown as Profile['properties'];
    const f = opts.units === 'cm' ? 0.1 : 1;
    Object.assign(properties, { A: 100 * f ** 2, Ix: (10_000 / 12) * f ** 4, J: 1406 * f ** 4 });
    const profile: Profile = { name: opts.name, source: opts.source, units: opts.units, properties, accuracy: { A: 1e-10 }, warnings: [] };
    return { profile, outline: { d: 'M0 0L10 0L10 10L0 10Z', box: { xmin: 0, ymin: 0, xmax: 10, ymax: 10 } } };
  };
  return { compute, calls };
}
