import type { Collected, Leaf } from './collect';

/**
 * How one drawing becomes profiles: `none` one profile of everything; `blocks` one per INSERT of
 * model space, named after its block (loose entities make one more, named after the file);
 * `layers` one per layer; `islands` one per separate solid part, named after the file and numbered.
 */
export const SPLIT_MODES = ['none', 'blocks', 'layers', 'islands'] as const;
export type SplitMode = (typeof SPLIT_MODES)[number];

export interface Group {
  readonly name: string;
  readonly leaves: Leaf[];
}

/** Names made unique in order of appearance: "A", "A-2", "A-3". */
function uniqueNames(names: readonly string[]): string[] {
  const seen = new Map<string, number>();
  return names.map((n) => {
    const k = (seen.get(n) ?? 0) + 1;
    seen.set(n, k);
    return k === 1 ? n : `${n}-${k}`;
  });
}

/** The collected entities grouped into profiles, in order of first appearance in the file. */
export function groupLeaves(c: Collected, mode: SplitMode, name: string): Group[] {
  if (mode === 'none' || mode === 'islands') return [{ name, leaves: c.leaves }];
  const groups = new Map<string | number, Leaf[]>();
  for (const leaf of c.leaves) {
    const key = mode === 'layers' ? leaf.layer.toUpperCase() : leaf.top;
    const list = groups.get(key);
    if (list) list.push(leaf);
    else groups.set(key, [leaf]);
  }
  const keys = [...groups.keys()];
  const names = uniqueNames(
    keys.map((k) => (mode === 'layers' ? groups.get(k)![0]!.layer : k === -1 ? name : c.inserts[k as number]!)),
  );
  return keys.map((k, i) => ({ name: names[i]!, leaves: groups.get(k)! }));
}
