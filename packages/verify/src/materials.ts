import { z } from 'zod';
import { VerifyError } from './errors';

/** A material of the manifest's `material` column: what mass per metre and stiffness follow from. */
export interface Material {
  /** Display name. */
  readonly name: string;
  /** Density, kg/m³. */
  readonly density: number;
  /** Young's modulus, N/mm². */
  readonly E: number;
  /** Shear modulus, N/mm². */
  readonly G: number;
  /** Where the values come from, as a report cites them. */
  readonly source: string;
}

/**
 * Built-in materials. Steel: E 210 000 N/mm², ν 0.3 so G = E/2(1+ν) ≈ 81 000 N/mm² (EN 1993-1-1
 * §3.2.6), density 7850 kg/m³ (EN 1991-1-1 Table A.4). Aluminium alloys: E 70 000, G 27 000 N/mm²,
 * density 2700 kg/m³ (EN 1999-1-1 §3.2.5).
 */
export const MATERIALS: Readonly<Record<string, Material>> = {
  steel: {
    name: 'Structural steel',
    density: 7850,
    E: 210_000,
    G: 81_000,
    source: 'EN 1993-1-1 §3.2.6; density EN 1991-1-1 Table A.4',
  },
  aluminium: {
    name: 'Aluminium alloy',
    density: 2700,
    E: 70_000,
    G: 27_000,
    source: 'EN 1999-1-1 §3.2.5',
  },
};

/** A custom material as a JSON manifest or materials file declares it. */
export const materialSchema = z.strictObject({
  name: z.string().min(1).optional(),
  density: z.number().positive(),
  E: z.number().positive(),
  G: z.number().positive(),
  source: z.string().optional(),
});

export type MaterialInput = z.infer<typeof materialSchema>;

/** The built-in table with custom materials added (a custom one may redefine a built-in id). */
export function materialTable(custom: Readonly<Record<string, MaterialInput>> = {}): Record<string, Material> {
  const out: Record<string, Material> = { ...MATERIALS };
  for (const [id, m] of Object.entries(custom)) out[id] = { name: m.name ?? id, density: m.density, E: m.E, G: m.G, source: m.source ?? 'custom' };
  return out;
}

/** A materials file, `{ "<id>": { "density": …, "E": …, "G": … }, … }`, checked against the schema. */
export function parseMaterials(text: string, source: string): Record<string, MaterialInput> {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new VerifyError('MANIFEST_SYNTAX', `${source}: not valid JSON (${(e as Error).message})`);
  }
  const parsed = z.record(z.string(), materialSchema).safeParse(json);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    throw new VerifyError('MANIFEST_INVALID', `${source}: ${issue.path.join('.') || 'file'}: ${issue.message}`);
  }
  return parsed.data;
}
