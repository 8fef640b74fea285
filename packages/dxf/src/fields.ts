import type { Point } from '@keelson/geometry';
import { DxfError } from './errors';
import { entityLabel, type EntitySource } from './source';
import type { Tags } from './tags';

export interface Vec3 {
  readonly x: number;
  readonly y: number;
  readonly z: number;
}

/** A number as DXF writes it; '' and trailing garbage are not numbers (Number('') would be 0). */
export function parseNumber(s: string): number {
  return s === '' ? NaN : Number(s);
}

/**
 * Reads the pairs of one record (entity, block header) by group code, failing with the entity
 * named: a missing value is INVALID_ENTITY, a value that is not a finite number NON_FINITE, each
 * with the line of the value in the file.
 */
export class Fields {
  constructor(
    readonly tags: Tags,
    /** Pairs at + 1 … end − 1 belong to the record. */
    readonly at: number,
    readonly end: number,
    readonly src: EntitySource,
    readonly file: string,
  ) {}

  fail(code: 'NON_FINITE' | 'INVALID_ENTITY' | 'UNSUPPORTED_ENTITY' | 'MALFORMED', why: string): never {
    throw new DxfError(code, this.file, `${entityLabel(this.src)}: ${why}`);
  }

  /** Index of the first pair with this code at or after `from`, or −1. */
  find(code: number, from = this.at + 1): number {
    const codes = this.tags.codes;
    for (let k = from; k < this.end; k++) if (codes[k] === code) return k;
    return -1;
  }

  has(code: number): boolean {
    return this.find(code) >= 0;
  }

  /** The number at pair k. */
  numAt(k: number): number {
    const s = this.tags.value(k);
    const v = parseNumber(s);
    if (!Number.isFinite(v)) {
      const shown = JSON.stringify(s.length > 24 ? s.slice(0, 24) + '…' : s);
      this.fail('NON_FINITE', `group ${this.tags.codes[k]} at line ${this.tags.line(k) + 1} is ${shown}, not a finite number`);
    }
    return v;
  }

  /** The first value of `code`; `fallback` when absent (DXF defaults), else INVALID_ENTITY naming `what`. */
  num(code: number, what: string, fallback?: number): number {
    const k = this.find(code);
    if (k < 0) {
      if (fallback === undefined) this.fail('INVALID_ENTITY', `${what} (group ${code}) is missing`);
      return fallback;
    }
    return this.numAt(k);
  }

  /** An integer flag or count (groups 60–99, 170–179…); `fallback` when absent. */
  int(code: number, fallback: number): number {
    const k = this.find(code);
    if (k < 0) return fallback;
    const v = this.numAt(k);
    if (!Number.isInteger(v)) this.fail('INVALID_ENTITY', `group ${code} at line ${this.tags.line(k) + 1} is ${v}, not an integer`);
    return v;
  }

  /** The point of groups code, code + 10 (x, y). */
  point(code: number, what: string, fallback?: Point): Point {
    if (fallback && !this.has(code)) return fallback;
    return { x: this.num(code, `${what} x`), y: this.num(code + 10, `${what} y`, fallback?.y) };
  }

  /** Extrusion direction (210/220/230), default (0, 0, 1). */
  extrusion(): Vec3 {
    return { x: this.num(210, 'extrusion x', 0), y: this.num(220, 'extrusion y', 0), z: this.num(230, 'extrusion z', 1) };
  }
}
