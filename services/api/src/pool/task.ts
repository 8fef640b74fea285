import { computeProfiles, drawingFault, type FailedProfile, type Profile } from '@keelson/profile';
import type { Settings } from '../settings';

export interface TaskInput {
  readonly bytes: Uint8Array;
  readonly name: string;
  readonly source: string;
  readonly settings: Settings;
  readonly maxBytes: number;
}

/** The drawing's profiles, or its fault (code and one-line message); `internal` marks a bug, not the drawing. */
export type TaskOutput =
  | { readonly ok: true; readonly profiles: (Profile | FailedProfile)[] }
  | { readonly ok: false; readonly code: string; readonly message: string; readonly internal?: boolean };

const oneLine = (s: string) => s.replace(/\s*[\r\n]+\s*/g, ' ').trim();

/**
 * One drawing, in a pool thread. Errors cross the thread boundary as data: class identity does not
 * survive structured cloning, so the classification happens here.
 */
export async function runTask(t: TaskInput): Promise<TaskOutput> {
  const s = t.settings;
  try {
    const profiles = await computeProfiles(t.bytes, {
      name: t.name,
      source: t.source,
      units: s.units,
      drawingUnits: s.drawingUnits,
      split: s.split,
      layers: s.layers,
      excludeLayers: s.excludeLayers,
      hiddenLayers: s.hiddenLayers,
      joinTolerance: s.joinTolerance,
      torsion: s.torsion,
      maxBytes: t.maxBytes,
    });
    return { ok: true, profiles };
  } catch (e) {
    const f = drawingFault(e, t.source);
    if (f) return { ok: false, code: f.code, message: f.message };
    const err = e instanceof Error ? e : new Error(String(e));
    return { ok: false, code: 'INTERNAL', message: `${t.source}: internal error: ${oneLine(err.message)}`, internal: true };
  }
}
