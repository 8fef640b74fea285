import { PROPERTY_DIMENSION, lengthFactor, type OutputUnit } from '@keelson/geometry';
import { TORSION_DIMENSION, type ProfileKey } from '@keelson/profile';

/** Every value a verification computes: the JSON contract's properties, torsion, and mass per metre `m`. */
export type VerifyKey = ProfileKey | 'm';

/**
 * Power of length of each key in the result's unit; `m` (kg/m) is null: it does not scale with the
 * length unit, and theta (0) is an angle in degrees.
 */
export const KEY_DIMENSION: Readonly<Record<VerifyKey, number | null>> = { ...PROPERTY_DIMENSION, ...TORSION_DIMENSION, m: null };

/** All keys in a stable order: mass first (what a datasheet leads with), then the contract's order. */
export const VERIFY_KEYS = ['m', ...Object.keys(PROPERTY_DIMENSION), ...Object.keys(TORSION_DIMENSION)] as VerifyKey[];

/** What each key means, as a report's property table labels it. */
export const KEY_LABEL: Readonly<Record<VerifyKey, string>> = {
  m: 'Mass per metre',
  A: 'Area',
  P: 'Perimeter',
  cx: 'Centroid x',
  cy: 'Centroid y',
  xmin: 'Extreme fibre x min',
  xmax: 'Extreme fibre x max',
  ymin: 'Extreme fibre y min',
  ymax: 'Extreme fibre y max',
  Ix: 'Second moment about x',
  Iy: 'Second moment about y',
  Ixy: 'Product moment',
  I1: 'Principal second moment (major)',
  I2: 'Principal second moment (minor)',
  theta: 'Angle of the I1 axis from x',
  rx: 'Radius of gyration about x',
  ry: 'Radius of gyration about y',
  r1: 'Radius of gyration, major axis',
  r2: 'Radius of gyration, minor axis',
  Sx_top: 'Elastic modulus x, top fibre',
  Sx_bottom: 'Elastic modulus x, bottom fibre',
  Sx: 'Elastic modulus x (least)',
  Sy_right: 'Elastic modulus y, right fibre',
  Sy_left: 'Elastic modulus y, left fibre',
  Sy: 'Elastic modulus y (least)',
  S1: 'Elastic modulus, major axis',
  S2: 'Elastic modulus, minor axis',
  Zx: 'Plastic modulus x',
  Zy: 'Plastic modulus y',
  ypna: 'Plastic neutral axis y',
  xpna: 'Plastic neutral axis x',
  J: 'Torsion constant',
  Cw: 'Warping constant',
  xs: 'Shear centre x',
  ys: 'Shear centre y',
};

const POWER = ['', '', '²', '³', '⁴', '⁵', '⁶'];

/** Unit label of a key for results in `unit`: "mm⁴", "deg", "kg/m". */
export function keyUnit(key: VerifyKey, unit: OutputUnit): string {
  const d = KEY_DIMENSION[key];
  if (d === null) return 'kg/m';
  if (d === 0) return 'deg';
  return unit + POWER[d];
}

/** Factor that turns a value of `key` in `from` units into `to` units. */
export function keyFactor(key: VerifyKey, from: OutputUnit, to: OutputUnit): number {
  const d = KEY_DIMENSION[key];
  return d ? lengthFactor(from, to) ** d : 1;
}

