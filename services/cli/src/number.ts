const SUPERSCRIPT: Record<string, string> = { '-': '⁻', 0: '⁰', 1: '¹', 2: '²', 3: '³', 4: '⁴', 5: '⁵', 6: '⁶', 7: '⁷', 8: '⁸', 9: '⁹' };

/**
 * Four significant figures as a table shows them: plain from 0.01 to 9999, otherwise engineering
 * notation (exponent a multiple of 3), e.g. 19.43×10⁶.
 */
export function sig4(v: number): string {
  if (v === 0) return '0';
  if (!Number.isFinite(v)) return String(v);
  const r = Number(v.toPrecision(4));
  const a = Math.abs(r);
  if (a >= 0.01 && a < 10_000) return r.toPrecision(4);
  const e = 3 * Math.floor(Math.floor(Math.log10(a)) / 3);
  const m = Number((r / 10 ** e).toPrecision(4));
  const exp = [...String(e)].map((c) => SUPERSCRIPT[c]).join('');
  return `${m.toPrecision(4)}×10${exp}`;
}
