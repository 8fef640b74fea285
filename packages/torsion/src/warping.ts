import { ElementAt, FIRST, LOAD, MASS, RULE6, STIFF } from './element';
import { TorsionError } from './errors';
import type { QuadMesh } from './levels';
import { holdRows } from './multigrid';
import {
  applyFactor,
  assembleRows,
  conjugateGradient,
  incompleteCholesky,
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

/**
 * Element matrices and loads, then the assembled system. Straight-sided elements (nearly all) use
 * the closed forms of `STIFF` and `LOAD`; elements with a curved side, the six-point rule.
 */
export function assemble(mesh: QuadMesh): Assembly {
  const { x, y, el, curved } = mesh;
  const nn = x.length;
  const ne = el.length / 6;
  const E = new ElementAt();
  const ex = new Float64Array(6);
  const ey = new Float64Array(6);

  // Area and centroid of the mesh (exact for its straight and quadratic sides).
  let A = 0;
  let Sx = 0;
  let Sy = 0;
  for (let e = 0; e < ne; e++) {
    if (curved[e]) {
      gather(mesh, e, 0, 0, ex, ey);
      if (!E.evaluate(ex, ey, RULE6)) throw new TorsionError('MESH_FAILED', `element ${e} is inverted`);
      for (let q = 0; q < 6; q++) {
        A += E.wd[q]!;
        Sx += E.wd[q]! * E.px[q]!;
        Sy += E.wd[q]! * E.py[q]!;
      }
      continue;
    }
    const a = el[6 * e]!;
    const b = el[6 * e + 1]!;
    const c = el[6 * e + 2]!;
    const d = (x[b]! - x[a]!) * (y[c]! - y[a]!) - (x[c]! - x[a]!) * (y[b]! - y[a]!);
    if (!(d > 0)) throw new TorsionError('MESH_FAILED', `element ${e} is inverted`);
    A += d / 2;
    Sx += (d / 6) * (x[a]! + x[b]! + x[c]!);
    Sy += (d / 6) * (y[a]! + y[b]! + y[c]!);
  }
  const cx = Sx / A;
  const cy = Sy / A;

  // Stiffness (the three cotangent weights of a straight element; the 36 values of a curved one),
  // load and second moments, coordinates about the centroid.
  const g = new Float64Array(3 * ne);
  const own = new Int32Array(ne).fill(-1);
  let curvedCount = 0;
  for (let e = 0; e < ne; e++) if (curved[e]) own[e] = curvedCount++;
  const ke = new Float64Array(36 * curvedCount);
  const f = new Float64Array(nn);
  let Ix = 0;
  let Iy = 0;
  let Ixy = 0;
  // Module bindings read once: in the loops they would be live-binding lookups.
  const Lo = LOAD;
  for (let e = 0; e < ne; e++) {
    const n = 6 * e;
    if (curved[e]) {
      const o = 36 * own[e]!;
      gather(mesh, e, cx, cy, ex, ey);
      E.evaluate(ex, ey, RULE6);
      for (let q = 0; q < 6; q++) {
        const w = E.wd[q]!;
        const px = E.px[q]!;
        const py = E.py[q]!;
        Ix += w * py * py;
        Iy += w * px * px;
        Ixy += w * px * py;
        for (let i = 0; i < 6; i++) {
          const gxi = E.gx[6 * q + i]!;
          const gyi = E.gy[6 * q + i]!;
          f[el[n + i]!]! += w * (gxi * py - gyi * px);
          for (let j = 0; j < 6; j++) ke[o + 6 * i + j]! += w * (gxi * E.gx[6 * q + j]! + gyi * E.gy[6 * q + j]!);
        }
      }
      continue;
    }
    const X0 = x[el[n]!]! - cx;
    const X1 = x[el[n + 1]!]! - cx;
    const X2 = x[el[n + 2]!]! - cx;
    const Y0 = y[el[n]!]! - cy;
    const Y1 = y[el[n + 1]!]! - cy;
    const Y2 = y[el[n + 2]!]! - cy;
    const b0 = Y1 - Y2;
    const b1 = Y2 - Y0;
    const b2 = Y0 - Y1;
    const c0 = X2 - X1;
    const c1 = X0 - X2;
    const c2 = X1 - X0;
    const d = b0 * c1 - b1 * c0; // twice the area
    g[3 * e] = (b0 * b1 + c0 * c1) / (2 * d);
    g[3 * e + 1] = (b1 * b2 + c1 * c2) / (2 * d);
    g[3 * e + 2] = (b2 * b0 + c2 * c0) / (2 * d);
    // f_i = ∫(y·∂Ni/∂x − x·∂Ni/∂y) dA = ½ Σ_ac (b_a·y_c − c_a·x_c)·LOAD[i][a][c] (the nine
    // products written out: array literals here would allocate per element).
    const w00 = b0 * Y0 - c0 * X0;
    const w01 = b0 * Y1 - c0 * X1;
    const w02 = b0 * Y2 - c0 * X2;
    const w10 = b1 * Y0 - c1 * X0;
    const w11 = b1 * Y1 - c1 * X1;
    const w12 = b1 * Y2 - c1 * X2;
    const w20 = b2 * Y0 - c2 * X0;
    const w21 = b2 * Y1 - c2 * X1;
    const w22 = b2 * Y2 - c2 * X2;
    for (let i = 0; i < 6; i++) {
      const o = 9 * i;
      const s =
        w00 * Lo[o]! + w01 * Lo[o + 1]! + w02 * Lo[o + 2]! +
        w10 * Lo[o + 3]! + w11 * Lo[o + 4]! + w12 * Lo[o + 5]! +
        w20 * Lo[o + 6]! + w21 * Lo[o + 7]! + w22 * Lo[o + 8]!;
      f[el[n + i]!]! += s / 2;
    }
    // ∫x² = (A/6)(Σ x_a² + Σ_{a<b} x_a·x_b), ∫xy = (A/12)(Σ x_a·y_a + Σx_a·Σy_a).
    Iy += (d / 12) * (X0 * X0 + X1 * X1 + X2 * X2 + X0 * X1 + X1 * X2 + X2 * X0);
    Ix += (d / 12) * (Y0 * Y0 + Y1 * Y1 + Y2 * Y2 + Y0 * Y1 + Y1 * Y2 + Y2 * Y0);
    Ixy += (d / 24) * (X0 * Y0 + X1 * Y1 + X2 * Y2 + (X0 + X1 + X2) * (Y0 + Y1 + Y2));
  }

  // Mesh levels number nodes coarse-first and the coarsest mesh is spatially ordered: keep that order.
  const K = assembleRows(el, 6, nn, STIFF, g, own, ke);
  const { component, components } = piecesOf(K);

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

/** Node coordinates of element e, less (dx, dy). */
function gather(mesh: QuadMesh, e: number, dx: number, dy: number, ex: Float64Array, ey: Float64Array): void {
  for (let k = 0; k < 6; k++) {
    const n = mesh.el[6 * e + k]!;
    ex[k] = mesh.x[n]! - dx;
    ey[k] = mesh.y[n]! - dy;
  }
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

/**
 * J, shear centre and Cw from the solved warping function of one level. The integrals of ω·x,
 * ω·y and ω² use the closed forms `FIRST`, `MASS` on straight-sided elements; Cw then
 * follows from them without a second field: with ω₀ = ω − y₀·x + x₀·y,
 *   ∫ω₀² = ∫ω² − 2y₀·Iωx + 2x₀·Iωy + y₀²·Iy − 2x₀y₀·Ixy + x₀²·Ix.
 */
export function finish(mesh: QuadMesh, asm: Assembly, u: Float64Array, iterations: number, shift = 0): LevelResult {
  const { x, y, el, curved } = mesh;
  const nn = x.length;
  const ne = el.length / 6;
  const { K, f, component, components, A, cx, cy, Ix, Iy, Ixy } = asm;
  const E = new ElementAt();
  const ex = new Float64Array(6);
  const ey = new Float64Array(6);
  // Module bindings read once: in the loops they would be live-binding lookups.
  const Fi = FIRST;
  const Ma = MASS;
  const N6 = RULE6.N;
  // J from the energy functional (stationary: solver error enters squared). Held nodes are zero,
  // so the held rows change neither fᵀu nor uᵀKu.
  let fu = 0;
  let uKu = 0;
  for (let i = 0; i < nn; i++) {
    fu += f[i]! * u[i]!;
    let s = 0;
    const e = K.rowPtr[i + 1]!;
    for (let k = K.rowPtr[i]!; k < e; k++) s += K.val[k]! * u[K.col[k]!]!;
    uKu += u[i]! * s;
  }
  const J = Ix + Iy - (2 * fu - uKu);

  // One pass over the elements: per connected piece its area, ∫x, ∫y and ∫u (u's mean is taken
  // off each piece), and over the section ∫u·x, ∫u·y, ∫u². With ω = u − m on each piece:
  // ∫ω·x = ∫u·x − Σ m·∫x, and ∫ω² = ∫u² − Σ m·∫u (as m·A = ∫u).
  const pieceA = new Float64Array(components);
  const pieceX = new Float64Array(components);
  const pieceY = new Float64Array(components);
  const pieceU = new Float64Array(components);
  let Iux = 0;
  let Iuy = 0;
  let U2 = 0;
  const w = new Float64Array(6);
  for (let e = 0; e < ne; e++) {
    const n = 6 * e;
    const c = component[el[n]!]!;
    for (let k = 0; k < 6; k++) w[k] = u[el[n + k]!]!;
    if (curved[e]) {
      gather(mesh, e, cx, cy, ex, ey);
      E.evaluate(ex, ey, RULE6);
      for (let q = 0; q < 6; q++) {
        let v = 0;
        for (let k = 0; k < 6; k++) v += N6[6 * q + k]! * w[k]!;
        const wd = E.wd[q]!;
        pieceA[c]! += wd;
        pieceX[c]! += wd * E.px[q]!;
        pieceY[c]! += wd * E.py[q]!;
        pieceU[c]! += wd * v;
        Iux += wd * v * E.px[q]!;
        Iuy += wd * v * E.py[q]!;
        U2 += wd * v * v;
      }
      continue;
    }
    const X0 = x[el[n]!]! - cx;
    const X1 = x[el[n + 1]!]! - cx;
    const X2 = x[el[n + 2]!]! - cx;
    const Y0 = y[el[n]!]! - cy;
    const Y1 = y[el[n + 1]!]! - cy;
    const Y2 = y[el[n + 2]!]! - cy;
    const area = ((X1 - X0) * (Y2 - Y0) - (X2 - X0) * (Y1 - Y0)) / 2;
    pieceA[c]! += area;
    pieceX[c]! += (area * (X0 + X1 + X2)) / 3;
    pieceY[c]! += (area * (Y0 + Y1 + Y2)) / 3;
    // ∫Ni dA is A/3 for the edge functions, 0 for the corner ones.
    pieceU[c]! += (area * (w[3]! + w[4]! + w[5]!)) / 3;
    let sx = 0;
    let sy = 0;
    let s2 = 0;
    for (let i = 0; i < 6; i++) {
      const wi = w[i]!;
      sx += wi * (Fi[3 * i]! * X0 + Fi[3 * i + 1]! * X1 + Fi[3 * i + 2]! * X2);
      sy += wi * (Fi[3 * i]! * Y0 + Fi[3 * i + 1]! * Y1 + Fi[3 * i + 2]! * Y2);
      let m = 0;
      for (let j = 0; j < 6; j++) m += Ma[6 * i + j]! * w[j]!;
      s2 += wi * m;
    }
    Iux += area * sx;
    Iuy += area * sy;
    U2 += area * s2;
  }
  let Iwx = Iux;
  let Iwy = Iuy;
  let W2 = U2;
  const mean = new Float64Array(components);
  for (let c = 0; c < components; c++) {
    const m = pieceU[c]! / pieceA[c]!;
    mean[c] = m;
    Iwx -= m * pieceX[c]!;
    Iwy -= m * pieceY[c]!;
    W2 -= m * pieceU[c]!;
  }
  const omega = new Float64Array(nn);
  for (let i = 0; i < nn; i++) omega[i] = u[i]! - mean[component[i]!]!;
  const det = Ix * Iy - Ixy * Ixy;
  const x0 = (Ixy * Iwx - Iy * Iwy) / det;
  const y0 = (Ix * Iwx - Ixy * Iwy) / det;
  // Warping about the shear centre has zero mean already (each piece's ω does, and ∫x = ∫y = 0).
  const Cw = W2 - 2 * y0 * Iwx + 2 * x0 * Iwy + y0 * y0 * Iy - 2 * x0 * y0 * Ixy + x0 * x0 * Ix;
  return { J, Cw, xs: cx + x0, ys: cy + y0, A, cx, cy, Ix, Iy, Ixy, omega, iterations, shift };
}
