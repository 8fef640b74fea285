import { GeometryError, arc, makeRegion, type Loop, type Point, type Region, type Segment } from '@keelson/geometry';
import { circleLoop } from './basic';

/** Dimensions of a round tube with internal screw ports (all lengths in one unit). */
export interface ScrewPortTubeDims {
  /** Outside diameter. */
  D: number;
  /** Wall thickness. */
  t: number;
  /** Number of screw ports, equally spaced. */
  n: number;
  /** Distance from the tube's centre to each port's centre. */
  e: number;
  /** Outside radius of each port's boss. */
  rb: number;
  /** Diameter of the screw hole through each boss (0: solid boss). */
  dh: number;
  /** Radius of the fillets joining each boss to the wall. */
  rf: number;
  /** Angle of the first port from +x, radians (default π/4). */
  phase?: number;
}

const mod2pi = (a: number) => ((a % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI);
const angleOf = (p: Point, c: Point) => Math.atan2(p.y - c.y, p.x - c.x);

/**
 * Round tube centred on the origin with n screw-port bosses standing on the inside of the wall:
 * each boss is a circle of radius rb about a point at distance e from the centre, crossing the
 * bore circle (radius D/2 − t), joined to it by two fillets of radius rf and pierced by a screw
 * hole of diameter dh. One part: the outside circle, the cavity (bore arcs, fillets and boss arcs
 * in one loop) and the n screw holes.
 * Each fillet circle touches the bore from inside (centre at D/2 − t − rf from the origin) and the
 * boss from outside (centre at rb + rf from the boss centre): the intersection of those two circles.
 */
export function screwPortTube(dims: ScrewPortTubeDims): Region {
  const { D, t, n, e, rb, dh, rf } = dims;
  const phase = dims.phase ?? Math.PI / 4;
  const R = D / 2;
  const ri = R - t;
  if (!(Number.isInteger(n) && n >= 1 && t > 0 && ri > 0 && rb > 0 && rf > 0 && dh >= 0))
    throw new GeometryError('DEGENERATE_LOOP', 'screw-port tube: needs n ≥ 1 ports and positive sizes');
  if (!(e - rb < ri && ri < e + rb && e > rb))
    throw new GeometryError('DEGENERATE_LOOP', `screw-port tube: boss of radius ${rb} at ${e} does not cross the bore`);
  if (!(dh / 2 < rb && e + dh / 2 < R))
    throw new GeometryError('DEGENERATE_LOOP', `screw-port tube: hole ${dh} does not fit the boss or the wall`);

  // Fillet centre in the frame of a boss on the +x axis at (e, 0): (fx, ±fy).
  const a = ri - rf;
  const fx = (e * e + a * a - (rb + rf) ** 2) / (2 * e);
  const fy = Math.sqrt(a * a - fx * fx);
  if (!(fy > 0)) throw new GeometryError('DEGENERATE_LOOP', 'screw-port tube: fillet radius too large for the boss');
  const halfSpan = Math.atan2(fy, fx); // angular half-width of a boss with its fillets, seen from the centre
  // Neighbouring bosses must leave room for both fillets between them (conservative), and meet the bore apart.
  if (!(n === 1 || (halfSpan < Math.PI / n && 2 * e * Math.sin(Math.PI / n) > 2 * (rb + rf))))
    throw new GeometryError('DEGENERATE_LOOP', `screw-port tube: ${n} bosses with fillets overlap each other`);

  const O = { x: 0, y: 0 };
  const cavity: Segment[] = [];
  const holes: Loop[] = [];
  let prevEnd: number | null = null; // angle on the bore where the last boss's fillet left it
  let firstStart = 0;
  for (let i = 0; i < n; i++) {
    const phi = phase + (2 * Math.PI * i) / n;
    const cs = Math.cos(phi);
    const sn = Math.sin(phi);
    const at = (x: number, y: number): Point => ({ x: x * cs - y * sn, y: x * sn + y * cs });
    const B = at(e, 0);
    const F1 = at(fx, -fy); // fillet before the boss (counter-clockwise order)
    const F2 = at(fx, fy);
    const onBore = (F: Point) => ({ x: (F.x * ri) / a, y: (F.y * ri) / a });
    const onBoss = (F: Point) => ({ x: B.x + ((F.x - B.x) * rb) / (rb + rf), y: B.y + ((F.y - B.y) * rb) / (rb + rf) });
    const t1 = onBore(F1);
    const t2 = onBoss(F1);
    const t3 = onBoss(F2);
    const t4 = onBore(F2);
    // Cavity on the left: bore arcs and fillets counter-clockwise, boss arcs clockwise.
    if (prevEnd === null) firstStart = angleOf(t1, O);
    else cavity.push(arc(O, ri, prevEnd, mod2pi(angleOf(t1, O) - prevEnd)));
    cavity.push(arc(F1, rf, angleOf(t1, F1), mod2pi(angleOf(t2, F1) - angleOf(t1, F1))));
    cavity.push(arc(B, rb, angleOf(t2, B), -mod2pi(angleOf(t2, B) - angleOf(t3, B))));
    cavity.push(arc(F2, rf, angleOf(t3, F2), mod2pi(angleOf(t4, F2) - angleOf(t3, F2))));
    prevEnd = angleOf(t4, O);
    if (dh > 0) holes.push(circleLoop(dh / 2, B));
  }
  cavity.push(arc(O, ri, prevEnd!, mod2pi(firstStart - prevEnd!)));
  return makeRegion([{ outer: circleLoop(R), holes: [cavity, ...holes] }]);
}
