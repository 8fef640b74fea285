import { describe, expect, it } from 'vitest';
import { sectionProperties, type SectionProperties } from '@keelson/geometry';
import { iSection } from '@keelson/shapes';

/**
 * Hot-rolled sections drawn with their root fillets as exact arcs, checked against published
 * tables. European tables (EN 10365 dimensions; properties "calculated taking into account all
 * tapers, radii and fillets") name the strong axis y-y: their Iy, Wel,y, Wpl,y are our Ix, Sx, Zx
 * for a section drawn web-vertical, and their z-z values our y values. Units: cm (cm², cm⁴, cm³).
 * A check passes when the computed value, rounded to the digits printed in the table, equals it:
 * within 0.1 % where the table prints four figures, within half its last digit where it prints fewer.
 */
function expectTable(actual: number, printed: string): void {
  const value = Number(printed);
  const decimals = printed.includes('.') ? printed.split('.')[1]!.length : 0;
  const significant = printed.replace('.', '').replace(/^0+/, '').length;
  // Integers with trailing zeros (e.g. 3480) carry the table's significant figures, not all digits.
  const rounded = decimals > 0 ? Number(actual.toFixed(decimals)) : Number(actual.toPrecision(Math.min(significant, 4)));
  expect(rounded, `computed ${actual} vs table ${printed}`).toBe(value);
  const halfDigit = decimals > 0 ? 0.5 * 10 ** -decimals : 0.5 * 10 ** (String(value).length - Math.min(significant, 4));
  expect(Math.abs(actual / value - 1)).toBeLessThanOrEqual(Math.max(1e-3, halfDigit / value));
}

function cm(p: SectionProperties) {
  return { A: p.A / 1e2, Ix: p.Ix / 1e4, Iy: p.Iy / 1e4, Sx: p.Sx / 1e3, Sy: p.Sy / 1e3, Zx: p.Zx / 1e3, Zy: p.Zy / 1e3, rx: p.rx / 10 };
}

describe('published section tables', () => {
  it('IPE 200 (h 200, b 100, tw 5.6, tf 8.5, r 12 mm)', () => {
    const p = cm(sectionProperties(iSection({ h: 200, b: 100, tw: 5.6, tf: 8.5, r: 12 })));
    // European section tables for IPE 200 (dimensions EN 10365).
    expectTable(p.A, '28.48'); // A cm²
    expectTable(p.Ix, '1943'); // Iy cm⁴
    expectTable(p.Sx, '194.3'); // Wel,y cm³
    expectTable(p.Zx, '220.6'); // Wpl,y cm³
    expectTable(p.rx, '8.26'); // iy cm
    expectTable(p.Iy, '142.4'); // Iz cm⁴
    expectTable(p.Sy, '28.47'); // Wel,z cm³
    expectTable(p.Zy, '44.61'); // Wpl,z cm³
  });

  it('HE 200 A (h 190, b 200, tw 6.5, tf 10, r 18 mm)', () => {
    const p = cm(sectionProperties(iSection({ h: 190, b: 200, tw: 6.5, tf: 10, r: 18 })));
    // European section tables for HE 200 A (dimensions EN 10365).
    expectTable(p.A, '53.83'); // A cm²
    expectTable(p.Ix, '3692'); // Iy cm⁴
    expectTable(p.Sx, '388.6'); // Wel,y cm³
    expectTable(p.Zx, '429.5'); // Wpl,y cm³
    expectTable(p.Iy, '1336'); // Iz cm⁴
    expectTable(p.Zy, '203.8'); // Wpl,z cm³
  });

  it('IPE 80 (h 80, b 46, tw 3.8, tf 5.2, r 5 mm)', () => {
    const p = cm(sectionProperties(iSection({ h: 80, b: 46, tw: 3.8, tf: 5.2, r: 5 })));
    // European section tables for IPE 80 (dimensions EN 10365).
    expectTable(p.A, '7.64'); // A cm²
    expectTable(p.Ix, '80.1'); // Iy cm⁴
    expectTable(p.Sx, '20.0'); // Wel,y cm³
    expectTable(p.Zx, '23.2'); // Wpl,y cm³
    expectTable(p.Iy, '8.49'); // Iz cm⁴
    expectTable(p.Zy, '5.8'); // Wpl,z cm³
  });

  it('HP18X204 in inches (d 18.3, bf 18.1, tw = tf 1.13, kdes 2.31 in)', () => {
    // AISC Shapes Database v16: fillet radius taken as kdes − tf.
    const p = sectionProperties(iSection({ h: 18.3, b: 18.1, tw: 1.13, tf: 1.13, r: 2.31 - 1.13 }));
    expectTable(p.A, '60.2'); // A in²
    expectTable(p.Ix, '3480'); // Ix in⁴
    expectTable(p.Sx, '380'); // Sx in³
    expectTable(p.Zx, '433'); // Zx in³
    expectTable(p.Iy, '1120'); // Iy in⁴
    expectTable(p.Sy, '124'); // Sy in³
    expectTable(p.Zy, '191'); // Zy in³
  });
});
