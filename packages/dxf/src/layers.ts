import type { LayerRecord } from './structure';

/** Which layers to read. Patterns match whole layer names, case-insensitively; `*` any run of characters, `?` one. */
export interface LayerSelection {
  /** Read only layers matching one of these (default: every layer). */
  readonly layers?: readonly string[];
  /** Leave out layers matching one of these. */
  readonly excludeLayers?: readonly string[];
  /** Read frozen and switched-off layers too (default: leave them out, as CAD programs do not show them). */
  readonly hiddenLayers?: boolean;
}

export type LeftOutBecause = 'frozen' | 'off' | 'not selected' | 'excluded';

function globToRegExp(pattern: string): RegExp {
  const body = [...pattern].map((ch) => (ch === '*' ? '.*' : ch === '?' ? '.' : ch.replace(/[\\^$.|+()[\]{}]/g, '\\$&'))).join('');
  return new RegExp(`^${body}$`, 'is');
}

/**
 * Decides, layer by layer, whether entities are read, and keeps count for the report. Layer names
 * compare case-insensitively (CAD programs treat "Profile" and "PROFILE" as one layer).
 */
export class LayerFilter {
  private readonly include: RegExp[] | null;
  private readonly exclude: RegExp[];
  private readonly verdicts = new Map<string, LeftOutBecause | null>();
  private readonly read = new Map<string, string>();
  private readonly leftOut = new Map<string, { name: string; why: LeftOutBecause; count: number }>();

  constructor(
    private readonly table: ReadonlyMap<string, LayerRecord>,
    private readonly sel: LayerSelection = {},
  ) {
    this.include = sel.layers?.length ? sel.layers.map(globToRegExp) : null;
    this.exclude = (sel.excludeLayers ?? []).map(globToRegExp);
  }

  /** Why entities on `layer` are left out, or null when they are read. */
  verdict(layer: string): LeftOutBecause | null {
    const key = layer.toUpperCase();
    let v = this.verdicts.get(key);
    if (v !== undefined) return v;
    const rec = this.table.get(key);
    v = null;
    if (this.include && !this.include.some((r) => r.test(layer))) v = 'not selected';
    else if (this.exclude.some((r) => r.test(layer))) v = 'excluded';
    else if (!this.sel.hiddenLayers && rec?.frozen) v = 'frozen';
    else if (!this.sel.hiddenLayers && rec?.off) v = 'off';
    this.verdicts.set(key, v);
    return v;
  }

  /** Whether to read an entity on `layer`; counts it either way. */
  admit(layer: string): boolean {
    const why = this.verdict(layer);
    const key = layer.toUpperCase();
    if (why === null) {
      if (!this.read.has(key)) this.read.set(key, layer);
      return true;
    }
    const entry = this.leftOut.get(key);
    if (entry) entry.count++;
    else this.leftOut.set(key, { name: layer, why, count: 1 });
    return false;
  }

  /** One sentence on the layers read and those left out, or null when every entity was read and nothing was asked. */
  report(): string | null {
    if (!this.leftOut.size && !this.include && !this.exclude.length && !this.sel.hiddenLayers) return null;
    const read = [...this.read.values()].sort();
    const out = [...this.leftOut.values()].sort((a, b) => (a.name < b.name ? -1 : 1));
    const readPart = `read layer${read.length === 1 ? '' : 's'} ${read.join(', ') || '(none)'}`;
    if (!out.length) return readPart;
    const outPart = out.map((o) => `${o.name} (${o.why}, ${o.count} entit${o.count === 1 ? 'y' : 'ies'})`).join(', ');
    return `${readPart}; left out ${outPart}`;
  }
}
