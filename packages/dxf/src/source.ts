/** Where an entity comes from, for messages: type, handle (group 5), layer (group 8), line of its "0" group. */
export interface EntitySource {
  readonly type: string;
  readonly handle?: string;
  readonly layer?: string;
  readonly line?: number;
  /** Names of the blocks it was inserted through, outermost first. */
  readonly blocks?: readonly string[];
}

/** "LINE (handle 1F, layer 0, line 42)", or "… in block FLANGE" for an entity inserted from a block. */
export function entityLabel(s: EntitySource): string {
  const bits = [
    s.handle !== undefined ? `handle ${s.handle}` : '',
    s.layer !== undefined ? `layer ${s.layer}` : '',
    s.line !== undefined ? `line ${s.line}` : '',
  ].filter(Boolean);
  const inBlock = s.blocks?.length ? ` in block ${s.blocks.join(' → ')}` : '';
  return (bits.length ? `${s.type} (${bits.join(', ')})` : s.type) + inBlock;
}
