/**
 * A value to `digits` significant figures the way a datasheet prints it: plain from 0.01 to 99 999,
 * otherwise a mantissa and a power of ten with an exponent that is a multiple of 3, returned apart
 * so each renderer sets the power its own way (HTML superscript, plain text ×10^n).
 */
export function significant(v: number, digits = 4): { mantissa: string; exponent: number } {
  if (v === 0 || !Number.isFinite(v)) return { mantissa: String(v), exponent: 0 };
  const r = Number(v.toPrecision(digits));
  const a = Math.abs(r);
  if (a >= 0.01 && a < 100_000) return { mantissa: plain(r, digits), exponent: 0 };
  const e = 3 * Math.floor(Math.floor(Math.log10(a)) / 3);
  return { mantissa: Number((r / 10 ** e).toPrecision(digits)).toPrecision(digits), exponent: e };
}

/** toPrecision without its exponent form for values ≥ 10^digits (12 345 to 4 figures reads 12350). */
function plain(r: number, digits: number): string {
  const p = r.toPrecision(digits);
  return p.includes('e') ? String(r) : p;
}

/** "1.943e6"-free text: "1.943×10^6" or "19.43". */
export function significantText(v: number, digits = 4): string {
  const { mantissa, exponent } = significant(v, digits);
  return exponent ? `${mantissa}×10^${exponent}` : mantissa;
}

/** A relative difference as a signed percentage, "+0.42 %". */
export const percent = (r: number): string => `${r >= 0 ? '+' : '−'}${Math.abs(r * 100).toPrecision(2)} %`;
