import type { Profile } from '@keelson/profile/keys';

/** A drawing or profile that could not be computed: its entry in place of the profile. */
export interface FailedProfile {
  readonly name: string;
  readonly source: string;
  readonly error: { readonly code: string; readonly message: string };
}

/**
 * `{"profiles":[{"name","source","units","properties","accuracy","warnings"}]}`, properties in
 * declared order (J, Cw, xs, ys last, when computed); a drawing that failed is `{"name","source","error":{"code","message"}}` in its place.
 */
export function formatJson(entries: readonly (Profile | FailedProfile)[]): string {
  const out = entries.map((p) =>
    'error' in p
      ? { name: p.name, source: p.source, error: p.error }
      : {
          name: p.name,
          source: p.source,
          units: p.units,
          properties: p.properties,
          accuracy: p.accuracy,
          warnings: p.warnings,
        },
  );
  return JSON.stringify({ profiles: out }, null, 2) + '\n';
}
