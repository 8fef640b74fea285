import type { LengthUnit } from '@keelson/geometry';
import { drawingFault } from '@keelson/profile';
import { checkRow } from './check';
import { SectionFault, computeSection, type ComputeSection, type Section } from './compute';
import { sha256 } from './hash';
import type { VerifyKey } from './keys';
import type { Manifest, ManifestRow } from './manifest';
import { massPerMetre } from './mass';
import type { Material } from './materials';
import { cataloguePath } from './paths';
import { newRunId, summarise, type Fault, type ProfileResult, type RunRecord } from './run';

/** A drawing of a catalogue by its `/`-separated path, or why it could not be taken out (ZIP entries). */
export type CatalogueDrawing = { readonly path: string; readonly bytes: Uint8Array } | { readonly path: string; readonly error: string };

export interface Catalogue {
  /** Short name shown in reports (a folder's or archive's base name). */
  readonly name: string;
  /** Where it was read from. */
  readonly source: string;
  readonly drawings: readonly CatalogueDrawing[];
}

export interface VerifyOptions {
  readonly catalogue: Catalogue;
  readonly manifest: Manifest;
  /** The manifest's folder inside the catalogue ('' for the root): drawing paths are relative to it. */
  readonly manifestDir?: string;
  /** Version of the computing code, stored with the run (reuse requires it unchanged). */
  readonly codeVersion: string;
  /**
   * The catalogue's previous run: a drawing whose bytes, units and code version are unchanged takes
   * its values from there instead of being computed again; the checks always run afresh.
   */
  readonly previous?: RunRecord | null;
  readonly compute?: ComputeSection;
  readonly now?: () => Date;
  readonly runId?: string;
  /** Unit of drawings whose `$INSUNITS` is missing. */
  readonly drawingUnits?: LengthUnit;
  readonly onProgress?: (p: { readonly done: number; readonly total: number; readonly id: string }) => void;
}

type Computed = { section: Section; reused: false } | { values: Partial<Record<VerifyKey, number>>; accuracy: Partial<Record<VerifyKey, number>>; result: ProfileResult; reused: true };

function faultOf(e: unknown, file: string): Fault {
  if (e instanceof SectionFault) return { code: e.code, message: e.message };
  const f = drawingFault(e, file);
  if (f) return f;
  // A bug must not sink a nightly run of hundreds of drawings: recorded against this profile alone.
  return { code: 'INTERNAL', message: `${file}: internal error: ${e instanceof Error ? e.message : String(e)}` };
}

/** A near match for a missing drawing: the same path in another letter case. */
function nearMatch(path: string, available: ReadonlyMap<string, unknown>): string {
  const lower = path.toLowerCase();
  for (const p of available.keys()) if (p.toLowerCase() === lower) return `; the catalogue has "${p}" (letter case differs)`;
  return '';
}

function resultOf(row: ManifestRow, material: Material, drawing: string, hash: string, c: Computed): ProfileResult {
  const base = { id: row.id, drawing, revision: row.revision, material: row.material, units: row.units, description: row.description };
  let values: Partial<Record<VerifyKey, number>>;
  let accuracy: Partial<Record<VerifyKey, number>>;
  let warnings: string[];
  let outline;
  if (c.reused) {
    ({ values, accuracy } = c);
    ({ warnings, outline } = c.result);
  } else {
    values = { ...c.section.profile.properties };
    accuracy = { ...c.section.profile.accuracy };
    warnings = c.section.profile.warnings;
    outline = c.section.outline;
  }
  // Mass per metre follows the row's material, which may have changed while the drawing did not.
  values = { ...values, m: massPerMetre(values.A!, row.units, material.density) };
  accuracy = { ...accuracy, m: accuracy.A };
  const checks = checkRow(row, values, accuracy);
  const status = checks.every((k) => k.pass) ? 'pass' : 'fail';
  return { ...base, status, drawingHash: hash, values, accuracy, checks, warnings, fault: null, outline, reused: c.reused };
}

/**
 * Verifies a catalogue against its manifest: every row's drawing computed in the row's units
 * (or reused from the previous run when unchanged), mass per metre from its material, every
 * published value checked. Rows whose drawing is absent are `missing`; drawings no row names are
 * listed as unlisted. A drawing at fault fails its own row, never the run. Throws VerifyError only
 * for a manifest that points outside the catalogue.
 */
export async function runVerification(opts: VerifyOptions): Promise<RunRecord> {
  const now = opts.now ?? (() => new Date());
  const startedAt = now();
  const compute = opts.compute ?? computeSection;
  const { manifest, catalogue } = opts;
  const byPath = new Map(catalogue.drawings.map((d) => [d.path, d]));
  const paths = manifest.rows.map((r) => cataloguePath(opts.manifestDir ?? '', r.drawing));
  const previous = new Map((opts.previous?.codeVersion === opts.codeVersion ? opts.previous.profiles : []).map((p) => [`${p.drawingHash}\0${p.units}`, p]));
  // Rows sharing a drawing and units (one extrusion in two alloys) compute it once.
  const sections = new Map<string, Promise<Computed>>();
  const profiles: ProfileResult[] = [];

  for (const [i, row] of manifest.rows.entries()) {
    const path = paths[i]!;
    const material = manifest.materials[row.material]!;
    const d = byPath.get(path);
    const none = { revision: row.revision, material: row.material, units: row.units, description: row.description, values: {}, accuracy: {}, checks: [], warnings: [], outline: null, reused: false };
    if (!d) {
      const fault = { code: 'MISSING_DRAWING', message: `${path}: no such drawing in the catalogue${nearMatch(path, byPath)}` };
      profiles.push({ id: row.id, drawing: path, ...none, status: 'missing', drawingHash: null, fault });
    } else if ('error' in d) {
      profiles.push({ id: row.id, drawing: path, ...none, status: 'error', drawingHash: null, fault: { code: 'ARCHIVE_ENTRY', message: `${path}: ${d.error}` } });
    } else {
      const hash = sha256(d.bytes);
      const key = `${hash}\0${row.units}`;
      let job = sections.get(key);
      if (!job) {
        const prev = previous.get(key);
        job = prev?.status === 'pass' || prev?.status === 'fail'
          ? Promise.resolve({ values: prev.values, accuracy: prev.accuracy, result: prev, reused: true })
          : compute(d.bytes, { name: row.id, source: path, units: row.units, drawingUnits: opts.drawingUnits }).then((section) => ({ section, reused: false }));
        sections.set(key, job);
      }
      try {
        profiles.push(resultOf(row, material, path, hash, await job));
      } catch (e) {
        profiles.push({ id: row.id, drawing: path, ...none, status: 'error', drawingHash: hash, fault: faultOf(e, path) });
      }
    }
    opts.onProgress?.({ done: i + 1, total: manifest.rows.length, id: row.id });
  }

  const named = new Set(paths);
  const unlisted = catalogue.drawings
    .filter((d) => !named.has(d.path))
    .map((d) => ({ drawing: d.path, hash: 'bytes' in d ? sha256(d.bytes) : null }));
  const used = new Set(manifest.rows.map((r) => r.material));
  return {
    schema: 'keelson.verification-run/1',
    id: opts.runId ?? newRunId(startedAt),
    catalogue: { name: catalogue.name, source: catalogue.source },
    startedAt: startedAt.toISOString(),
    finishedAt: now().toISOString(),
    codeVersion: opts.codeVersion,
    manifest: { source: manifest.source, hash: manifest.hash },
    materials: Object.fromEntries(Object.entries(manifest.materials).filter(([id]) => used.has(id))),
    summary: summarise(profiles, unlisted.length),
    profiles,
    unlisted,
  };
}
