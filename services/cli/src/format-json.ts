import { PROPERTY_KEYS, type Profile } from './profile';

/** `{"profiles":[{"name","source","units","properties","accuracy","warnings"}]}`, properties in declared order. */
export function formatJson(profiles: readonly Profile[]): string {
  const out = profiles.map((p) => ({
    name: p.name,
    source: p.source,
    units: p.units,
    properties: Object.fromEntries(PROPERTY_KEYS.map((k) => [k, p.properties[k]])),
    accuracy: p.accuracy,
    warnings: p.warnings,
  }));
  return JSON.stringify({ profiles: out }, null, 2) + '\n';
}
