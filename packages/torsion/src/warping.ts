import { ElementAt, RULE3, RULE6 } from './element';
import { TorsionError } from './errors';
import type { QuadMesh } from './levels';
import { holdRows } from './multigrid';
import {
  applyFactor,
  conjugateGradient,
  incompleteCholesky,
  patternOf,
  type Csr,
  type Preconditioner,
} from './sparse';

/** Torsion and warping quantities of one mesh, in the normalised frame. */
export interface LevelResult {
  readonly J: number;
  readonly Cw: number;
  /** Shear centre. */
  readonly xs: number;
  readonly ys: number;
  /** Centroid and second moments of the meshed area (Ix = ∫(y−cy)², Iy = ∫(x−cx)²). */
  readonly A: number;
  readonly cx: number;
  readonly cy: number;
  readonly Ix: number;
  readonly Iy: number;
  readonly Ixy: number;
  /** Warping function about the centroid at every node (mean zero over each connected piece). */
  readonly omega: Float64Array;
  readonly iterations: number;
  readonly shift: number;
}

/**
 * Saint-Venant torsion of the meshed section by the warping function ω (Timoshenko & Goodier,
 * "Theory of Elasticity", 3rd ed., §104–105; Pilkey, "Analysis and Design of Elastic Beams",
 * Wiley 2002, ch. 6). With x, y measured from the centroid, ω solves the Neumann problem
 *   ∇²ω = 0 in A,   ∂ω/∂n = y·nx − x·ny on the boundary,
 * whose weak form ∫∇v·∇ω dA = ∫(y·∂v/∂x − x·∂v/∂y) dA needs no boundary integral; holes and
 * several cells need nothing special. ω is fixed up to a constant per connected piece: one node
 * of each is held at zero (the load is compatible, Σᵢ fᵢ = 0 exactly) and the constant is chosen
 * afterwards.
 *   J = Ip − ∫(y·∂ω/∂x − x·∂ω/∂y) dA = Ip − ωᵀKω.
 * Shear centre (Trefftz, ZAMM 15, 1935; Pilkey §6.4): the centre of twist (x₀, y₀) whose warping
 * function ω₀ = ω − y₀·x + x₀·y + c is orthogonal to x and y,
 *   x₀ = (Ixy·Iωx − Iy·Iωy)/(Ix·Iy − Ixy²),  y₀ = (Ix·Iωx − Ixy·Iωy)/(Ix·Iy − Ixy²),
 * with Iωx = ∫ω·x dA, Iωy = ∫ω·y dA (Iy = ∫x², Ix = ∫y²); independent of Poisson's ratio.
 * Warping constant about it: Cw = ∫ω₀² dA with c making ∫ω₀ dA = 0 (Vlasov's normalised
 * sectorial coordinate).
 */
export function solveWarping(mesh: QuadMesh, guess: Float64Array | null, tol: number): LevelResult {
  const asm = assemble(mesh);
  const M = incompleteCholesky(asm.K);
  const { u, iterations } = solveAssembled(asm, (r, z) => applyFactor(M, r, z), guess, tol);
  return finish(mesh, asm, u, iterations, M.shift);
}

/** The assembled system of one level: stiffness with held rows, load, area moments. */
export interface Assembly {
  readonly K: Csr;
  readonly f: Float64Array;
  readonly held: Uint8Array;
  readonly component: Int32Array;
  readonly components: number;
  readonly A: number;
  readonly cx: number;
  readonly cy: number;
  readonly Ix: number;
  readonly Iy: number;
  readonly Ixy: number;
}

/** Connected pieces of the node graph, each rooted at (and numbered from) its smallest node. */
function piecesOf(K: Csr): { component: Int32Array; components: number } {
  const n = K.n;
  const component = new Int32Array(n).fill(-1);
  const queue = new Int32Array(n);
  let components = 0;
  for (let s = 0; s < n; s++) {
    if (component[s] !== -1) continue;
    let head = 0;
    let tail = 0;
    queue[tail++] = s;
    component[s] = components;
    while (head < tail) {
      const i = queue[head++]!;
      for (let k = K.rowPtr[i]!; k < K.rowPtr[i + 1]!; k++) {
        const j = K.col[k]!;
        if (component[j] === -1) {
          component[j] = components;
          queue[tail++] = j;
        }
      }
    }
    components++;
  }
  return { component, components };
}

export function assemble(mesh: QuadMesh): Assembly {
  const { x, y, el, curved } = mesh;
  const nn = x.length;
  const ne = el.length / 6;
  const E = new ElementAt();
  const ex = new Float64Array(6);
  const ey = new Float64Array(6);
  const load = (e: number, dx: number, dy: number) => {
    for (let k = 0; k < 6; k++) {
      const n = el[6 * e + k]!;
      ex[k] = x[n]! - dx;
      ey[k] = y[n]! - dy;
    }
  };

  // Area moments of the mesh (exact for its straight and quadratic sides), about the frame origin.
  let A = 0;
  let Sx = 0;
  let Sy = 0;
  for (let e = 0; e < ne; e++) {
    load(e, 0, 0);
    if (!(curved[e] ? E.evaluate(ex, ey, RULE6) : E.evaluateStraight(ex, ey, RULE3)))
      throw new TorsionError('MESH_FAILED', `element ${e} is inverted`);
    for (let q = 0; q < E.rule.points; q++) {
      A += E.wd[q]!;
      Sx += E.wd[q]! * E.px[q]!;
      Sy += E.wd[q]! * E.py[q]!;
    }
  }
  const cx = Sx / A;
  const cy = Sy / A;

  // Mesh levels number nodes coarse-first and the coarsest mesh is spatially ordered: keep that order.
  const K: Csr = patternOf(el, 6, nn);
  const { component, components } = piecesOf(K);
  const f = new Float64Array(nn);
  let Ix = 0;
  let Iy = 0;
  let Ixy = 0;
  const ke = new Float64Array(36);
  const fe = new Float64Array(6);
  const pos = new Int32Array(36);
  for (let e = 0; e < ne; e++) {
    load(e, cx, cy);
    if (curved[e]) E.evaluate(ex, ey, RULE6);
    else E.evaluateStraight(ex, ey, RULE3);
    ke.fill(0);
    fe.fill(0);
    for (let q = 0; q < E.rule.points; q++) {
      const w = E.wd[q]!;
      const px = E.px[q]!;
      const py = E.py[q]!;
      Ix += w * py * py;
      Iy += w * px * px;
      Ixy += w * px * py;
      const o = 6 * q;
      for (let i = 0; i < 6; i++) {
        const gxi = E.gx[o + i]!;
        const gyi = E.gy[o + i]!;
        fe[i]! += w * (gxi * py - gyi * px);
        for (let j = i; j < 6; j++) ke[6 * i + j]! += w * (gxi * E.gx[o + j]! + gyi * E.gy[o + j]!);
      }
    }
    // Scatter: positions of the element's 36 couplings in the sorted rows.
    for (let i = 0; i < 6; i++) {
      const r = el[6 * e + i]!;
      const r0 = K.rowPtr[r]!;
      const r1 = K.rowPtr[r + 1]!;
      for (let j = 0; j < 6; j++) {
        const c = el[6 * e + j]!;
        let p = r0;
        while (p < r1 && K.col[p] !== c) p++;
        pos[6 * i + j] = p;
      }
      f[r]! += fe[i]!;
    }
    for (let i = 0; i < 6; i++)
      for (let j = 0; j < 6; j++) K.val[pos[6 * i + j]!]! += i <= j ? ke[6 * i + j]! : ke[6 * j + i]!;
  }

  // One node per connected piece held at zero: its smallest node, a corner of the coarsest mesh,
  // so every level holds the same point.
  const held = new Uint8Array(nn);
  const seen = new Uint8Array(components);
  for (let i = 0; i < nn; i++)
    if (!seen[component[i]!]) {
      seen[component[i]!] = 1;
      held[i] = 1;
      f[i] = 0;
    }
  holdRows(K, held);
  return { K, f, held, component, components, A, cx, cy, Ix, Iy, Ixy };
}

/** Solves the assembled system from a starting guess (shifted so held nodes start at zero). */
export function solveAssembled(
  asm: Assembly,
  M: Preconditioner,
  guess: Float64Array | null,
  tol: number,
): { u: Float64Array; iterations: number } {
  const { K, f, held, component, components } = asm;
  const nn = K.n;
  const u = new Float64Array(nn);
  if (guess) {
    const at = new Float64Array(components);
    for (let i = 0; i < nn; i++) if (held[i]) at[component[i]!] = guess[i]!;
    for (let i = 0; i < nn; i++) u[i] = held[i] ? 0 : guess[i]! - at[component[i]!]!;
  }
  const rep = conjugateGradient(K, M, f, u, tol);
  return { u, iterations: rep.iterations };
}

/** J, shear centre and Cw from the solved warping function of one level. */
export function finish(mesh: QuadMesh, asm: Assembly, u: Float64Array, iterations: number, shift = 0): LevelResult {
  const { x, y, el, curved } = mesh;
  const nn = x.length;
  const ne = el.length / 6;
  const { K, f, component, components, A, cx, cy, Ix, Iy, Ixy } = asm;
  const E = new ElementAt();
  const ex = new Float64Array(6);
  const ey = new Float64Array(6);
  const load = (e: number, dx: number, dy: number) => {
    for (let k = 0; k < 6; k++) {
      const n = el[6 * e + k]!;
      ex[k] = x[n]! - dx;
      ey[k] = y[n]! - dy;
    }
  };
  // J from the energy functional (stationary: solver error enters squared). Held nodes are zero,
  // so the held rows change neither fᵀu nor uᵀKu.
  let fu = 0;
  let uKu = 0;
  for (let i = 0; i < nn; i++) {
    fu += f[i]! * u[i]!;
    let s = 0;
    for (let k = K.rowPtr[i]!; k < K.rowPtr[i + 1]!; k++) s += K.val[k]! * u[K.col[k]!]!;
    uKu += u[i]! * s;
  }
  const J = Ix + Iy - (2 * fu - uKu);

  const omega = u.slice();

  // Mean zero over each connected piece.
  const pieceA = new Float64Array(components);
  const pieceW = new Float64Array(components);
  const ue = new Float64Array(6);
  const gather = (e: number, v: Float64Array) => {
    for (let k = 0; k < 6; k++) ue[k] = v[el[6 * e + k]!]!;
  };
  for (let e = 0; e < ne; e++) {
    load(e, cx, cy);
    if (curved[e]) E.evaluate(ex, ey, RULE6);
    else E.evaluateStraight(ex, ey, RULE6);
    gather(e, omega);
    const c = component[el[6 * e]!]!;
    for (let q = 0; q < 6; q++) {
      pieceA[c]! += E.wd[q]!;
      pieceW[c]! += E.wd[q]! * E.value(ue, q);
    }
  }
  for (let i = 0; i < nn; i++) omega[i]! -= pieceW[component[i]!]! / pieceA[component[i]!]!;

  let Iwx = 0;
  let Iwy = 0;
  for (let e = 0; e < ne; e++) {
    load(e, cx, cy);
    if (curved[e]) E.evaluate(ex, ey, RULE6);
    else E.evaluateStraight(ex, ey, RULE6);
    gather(e, omega);
    for (let q = 0; q < 6; q++) {
      const w = E.value(ue, q) * E.wd[q]!;
      Iwx += w * E.px[q]!;
      Iwy += w * E.py[q]!;
    }
  }
  const det = Ix * Iy - Ixy * Ixy;
  const x0 = (Ixy * Iwx - Iy * Iwy) / det;
  const y0 = (Ix * Iwx - Ixy * Iwy) / det;

  // Warping about the shear centre, mean removed, then its square integrated.
  const w0 = new Float64Array(nn);
  for (let i = 0; i < nn; i++) w0[i] = omega[i]! - y0 * (x[i]! - cx) + x0 * (y[i]! - cy);
  let Q = 0;
  let W2 = 0;
  for (let e = 0; e < ne; e++) {
    load(e, cx, cy);
    if (curved[e]) E.evaluate(ex, ey, RULE6);
    else E.evaluateStraight(ex, ey, RULE6);
    gather(e, w0);
    for (let q = 0; q < 6; q++) {
      const v = E.value(ue, q);
      Q += E.wd[q]! * v;
      W2 += E.wd[q]! * v * v;
    }
  }
  const Cw = W2 - (Q * Q) / A;
  return {
    J,
    Cw,
    xs: cx + x0,
    ys: cy + y0,
    A,
    cx,
    cy,
    Ix,
    Iy,
    Ixy,
    omega,
    iterations,
    shift,
  };
}
