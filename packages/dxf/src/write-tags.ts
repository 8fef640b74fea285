import { GeometryError, type Point } from '@keelson/geometry';

/** Shortest decimal that reads back as the same double (ECMAScript Number::toString). */
function num(x: number): string {
  if (!Number.isFinite(x)) throw new GeometryError('NON_FINITE', `cannot write ${x} to DXF`);
  return String(x === 0 ? 0 : x); // no "-0"
}

/** Group code / value pairs, one per line each, as ASCII DXF wants them. */
export class TagWriter {
  private readonly out: string[] = [];

  constructor(private handle = 0x20) {}

  tag(code: number, value: string | number): this {
    this.out.push(String(code), typeof value === 'number' ? num(value) : value);
    return this;
  }

  /** Group 5: a fresh hexadecimal handle. */
  nextHandle(): this {
    return this.tag(5, (this.handle++).toString(16).toUpperCase());
  }

  /** Next free handle, for `$HANDSEED`. */
  get handseed(): string {
    return this.handle.toString(16).toUpperCase();
  }

  /** x, y (and z = 0) under groups code, code + 10, code + 20. */
  point(code: number, p: Point): this {
    return this.tag(code, p.x)
      .tag(code + 10, p.y)
      .tag(code + 20, 0);
  }

  /** x, y only (HATCH boundary data is 2D). */
  point2(code: number, p: Point): this {
    return this.tag(code, p.x).tag(code + 10, p.y);
  }

  get empty(): boolean {
    return this.out.length === 0;
  }

  text(): string {
    return this.out.join('\n') + '\n';
  }
}
