import type { Region } from '@keelson/geometry';
import { TorsionError } from './errors';
import { curvesOf, frameOf, type Frame } from './frame';
import { quadratic, refine, type Level, type QuadMesh } from './levels';
import { EnvelopeCholesky, Multigrid, interpolate, linearStiffness, linearTransfer, quadraticTransfer } from './multigrid';
import { generateMesh, type MeshParams, type TriMesh } from './mesh';
import { assemble, finish, solveAssembled, type LevelResult } from './warping';

/**
 * Relative residual at which conjugate gradients stop. J comes from the energy functional, whose
 * error is quadratic in the solver's; Cw and the shear centre are linear in ω, and at a residual of
 * 1e-2·target their solver errors measure about 1e-5·target (heat sink, IPE 200, thin channel;
 * each CG iteration divides the residual by about ten), far below the discretisation error stated.
 */
const solverTolerance = (target: number) => Math.min(1e-5, 1e-2 * target);

export interface TorsionOptions {
  /** Relative error wanted on J (default 1e-3). Smaller values mesh finer. */
  readonly target?: number;
  /** Refinement stops before a level would exceed this many nodes (default 400 000). */
  readonly maxNodes?: number;
  /** Return the finest mesh, in drawing coordinates, as `finestMesh` (for `meshSvg`). */
  readonly keepMesh?: boolean;
}

/**
 * Torsion and warping properties, lengths in the region's unit.
 * - J: Saint-Venant torsion constant (L⁴); Cw: warping constant about the shear centre (L⁶);
 *   xs, ys: shear centre in drawing coordinates (Trefftz's definition, see `solveWarping`).
 * - accuracy: estimated errors of the values returned, by Richardson's rule on the last two mesh
 *   levels: J relative to J; Cw relative to Cw (or to 10⁻⁴·Ip²/A when Cw is smaller, for sections
 *   that barely warp); xs, ys relative to the section's size (the larger side of its bounding box).
 * - mesh: nodes and elements of the finest level; levels: the same per level, coarsest first.
 * - iterations: conjugate-gradient iterations per level.
 */
export interface TorsionProperties {
  J: number;
  Cw: number;
  xs: number;
  ys: number;
  accuracy: { J: number; Cw: number; xs: number; ys: number };
  /** Convergence rate assumed (or observed on three levels) for the Richardson estimate. */
  order: number;
  converged: boolean;
  mesh: { nodes: number; elements: number };
  levels: { nodes: number; elements: number; J: number }[];
  iterations: number[];
  finestMesh?: QuadMesh;
}

/**
 * Mesh settings for a target relative error on J. Quadratic elements converge in J as h⁴ on
 * smooth sections, so every size scales as k = (target/1e-3)^¼, and with it the slope of the size
 * field (its grading). The sizes were calibrated so that the second level usually meets the target:
 * at 1e-3 the heat sink of the benchmark states 1.6e-4 from two levels (true error 1.8e-4).
 */
export function meshParams(target: number): MeshParams {
  const k = Math.pow(target / 1e-3, 0.25);
  return {
    hmax: Math.min(0.35, 0.25 * k),
    across: Math.max(1, Math.min(6, 1 / Math.sqrt(k))),
    sagitta: 2.5e-5 * k ** 4,
    grading: 0.8 * k,
    minAngle: 20,
    cornerFactor: 0.25,
  };
}

/** The coarsest (level-0) mesh of a region in the normalised frame. */
export function baseMesh(region: Region, target = 1e-3): { mesh: TriMesh; frame: Frame } {
  const frame = frameOf(region);
  const { curves, loops } = curvesOf(region, frame);
  return { mesh: generateMesh(curves, loops, meshParams(target)), frame };
}

/** The quadratic level-0 mesh of a region in drawing coordinates (what `torsionProperties` starts from). */
export function meshRegion(region: Region, opts: { target?: number } = {}): QuadMesh {
  const { mesh, frame } = baseMesh(region, opts.target ?? 1e-3);
  return toDrawing(quadratic(mesh).quad, frame);
}

function toDrawing(q: QuadMesh, f: Frame): QuadMesh {
  return {
    ...q,
    x: q.x.map((v) => f.ox + f.s * v),
    y: q.y.map((v) => f.oy + f.s * v),
  };
}

/**
 * Saint-Venant torsion constant, shear centre and warping constant of a region by quadratic
 * finite elements, with an error estimate: the region is meshed once (`generateMesh`), refined
 * uniformly level by level (each element into four, boundary nodes on the exact arcs), and solved
 * on each level until Richardson's estimate of the error in J meets the target,
 *   e ≈ |Q_h − Q_{h/2}| / (2^p − 1),
 * with p = 4 (quadratic elements, energy-type quantities) or 2π/α at a re-entrant corner of
 * interior angle α (the warping function is singular there, ω ~ r^{π/α}); from three levels on,
 * the observed order. The values returned are Richardson-extrapolated; `accuracy` states the
 * estimated error of the finest level, which bounds that of the extrapolated value in the
 * asymptotic range (Richardson 1911; Roache, "Verification and Validation in Computational
 * Science and Engineering", 1998, ch. 5).
 */
export function torsionProperties(region: Region, opts: TorsionOptions = {}): TorsionProperties {
  const target = opts.target ?? 1e-3;
  const maxNodes = opts.maxNodes ?? 400_000;
  if (!(target > 0 && target < 1)) throw new TorsionError('INVALID_OPTION', `target ${target} is not in (0, 1)`);
  const { mesh, frame } = baseMesh(region, target);
  const pTheory = mesh.reentrant > Math.PI ? Math.min(4, (2 * Math.PI) / mesh.reentrant) : 4;

  const levels: Level[] = [quadratic(mesh)];
  // Multigrid hierarchy: linear elements on the coarsest triangulation, then each quadratic level.
  const asm0 = assemble(levels[0]!.quad);
  const nv = levels[0]!.quad.corners;
  const heldP1 = asm0.held.slice(0, nv);
  const mg = new Multigrid(new EnvelopeCholesky(linearStiffness(levels[0]!, heldP1)), heldP1, nv);
  mg.push(asm0.K, asm0.held, linearTransfer(levels[0]!));
  const precondition = (r: Float64Array, z: Float64Array) => mg.apply(r, z);
  const solve = (L: Level, asm: ReturnType<typeof assemble>, guess: Float64Array | null, tol: number): LevelResult => {
    const { u, iterations } = solveAssembled(asm, precondition, guess, tol);
    return finish(L.quad, asm, u, iterations);
  };
  // Level 0 is never the finest level: its values enter the result only through Richardson's
  // correction, (Q_h − Q_{h/2})/(2^p − 1), so its solver error may be that many times larger
  // (at most ten times) for the same effect as the finest level's.
  const tol = solverTolerance(target);
  const results: LevelResult[] = [solve(levels[0]!, asm0, null, tol * Math.min(10, Math.max(1, 2 ** pTheory - 1)))];
  let est = estimate(results, pTheory, frame);
  while (est.accuracy.J > target) {
    const last = levels[levels.length - 1]!;
    if (4 * last.quad.x.length > maxNodes) break;
    const fine = quadratic(refine(last));
    // The transfer of the multigrid cycle also carries the coarse solution up as the first guess.
    const P = quadraticTransfer(last, fine);
    const guess = interpolate(P, results[results.length - 1]!.omega);
    const asm = assemble(fine.quad);
    mg.push(asm.K, asm.held, P);
    levels.push(fine);
    results.push(solve(fine, asm, guess, tol));
    est = estimate(results, pTheory, frame);
  }
  const finest = levels[levels.length - 1]!.quad;
  const out: TorsionProperties = {
    ...est.values,
    accuracy: est.accuracy,
    order: est.order,
    converged: est.accuracy.J <= target,
    mesh: { nodes: finest.x.length, elements: finest.el.length / 6 },
    levels: levels.map((L, i) => ({ nodes: L.quad.x.length, elements: L.quad.el.length / 6, J: results[i]!.J * frame.s ** 4 })),
    iterations: results.map((r) => r.iterations),
  };
  if (opts.keepMesh) out.finestMesh = toDrawing(finest, frame);
  return out;
}

interface Estimate {
  values: { J: number; Cw: number; xs: number; ys: number };
  accuracy: { J: number; Cw: number; xs: number; ys: number };
  order: number;
}

function estimate(results: readonly LevelResult[], pTheory: number, f: Frame): Estimate {
  const n = results.length;
  const fine = results[n - 1]!;
  const draw = (r: LevelResult) => ({ J: r.J * f.s ** 4, Cw: r.Cw * f.s ** 6, xs: f.ox + f.s * r.xs, ys: f.oy + f.s * r.ys });
  if (n === 1) return { values: draw(fine), accuracy: { J: Infinity, Cw: Infinity, xs: Infinity, ys: Infinity }, order: pTheory };
  const coarse = results[n - 2]!;
  let p = pTheory;
  if (n >= 3) {
    // Observed order from three levels, when the differences shrink monotonically.
    const d1 = results[n - 3]!.J - coarse.J;
    const d2 = coarse.J - fine.J;
    if (d1 * d2 > 0 && Math.abs(d2) < Math.abs(d1)) p = Math.min(4, Math.max(1, Math.log2(d1 / d2)));
  }
  const k = 1 / (2 ** p - 1);
  const ex = (a: number, b: number) => b + (b - a) * k;
  const Ip = fine.Ix + fine.Iy;
  const cwScale = Math.max(Math.abs(fine.Cw), (1e-4 * Ip * Ip) / fine.A);
  const values = {
    J: ex(coarse.J, fine.J),
    Cw: ex(coarse.Cw, fine.Cw),
    xs: ex(coarse.xs, fine.xs),
    ys: ex(coarse.ys, fine.ys),
  };
  return {
    values: draw({ ...fine, ...values }),
    accuracy: {
      J: (Math.abs(fine.J - coarse.J) * k) / Math.abs(fine.J),
      Cw: (Math.abs(fine.Cw - coarse.Cw) * k) / cwScale,
      xs: Math.abs(fine.xs - coarse.xs) * k,
      ys: Math.abs(fine.ys - coarse.ys) * k,
    },
    order: p,
  };
}
