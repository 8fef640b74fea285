import { DxfError } from './errors';

/** Limits on reading one drawing; both are checked by the reader itself, which runs on the caller's thread. */
export interface ParseLimits {
  /** Wall-time limit of reading one drawing, ms (default 30 000), checked between entities and stages. */
  readonly timeoutMs?: number;
  /** Memory the reading may take, MiB (default 1024), estimated from the pairs and the expanded segments before they are built. */
  readonly maxMemoryMb?: number;
}

/** Bytes one pair costs (three 32-bit numbers) and one expanded segment at most (objects, its entity's record, loops). */
const PAIR_BYTES = 12;
const SEGMENT_BYTES = 600;

/** The limits of one reading, with the clock started. */
export class Limits {
  private readonly deadline: number;
  private readonly timeoutMs: number;
  private readonly maxMemoryMb: number;
  constructor(
    limits: ParseLimits,
    private readonly file: string,
  ) {
    this.timeoutMs = limits.timeoutMs ?? 30_000;
    this.maxMemoryMb = limits.maxMemoryMb ?? 1024;
    this.deadline = Date.now() + this.timeoutMs;
  }

  /** Throws PARSE_TIMEOUT once the time is up. */
  check(): void {
    if (Date.now() > this.deadline)
      throw new DxfError('PARSE_TIMEOUT', this.file, `reading did not finish within ${this.timeoutMs / 1000} s (limit); the drawing is too large or too complex`);
  }

  /** Throws PARSE_MEMORY when the text (UTF-16), its pairs and the segments it expands to would pass the memory limit. */
  reserve(textLength: number, pairs: number, segments: number): void {
    const mb = (2 * textLength + PAIR_BYTES * pairs + SEGMENT_BYTES * segments) / 2 ** 20;
    if (mb > this.maxMemoryMb)
      throw new DxfError('PARSE_MEMORY', this.file, `reading would take about ${Math.ceil(mb)} MiB, over the ${this.maxMemoryMb} MiB limit`);
  }
}
