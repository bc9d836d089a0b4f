/**
 * Measured stability: the largest forward-Euler / Runge–Kutta step of the actual discrete operator
 * on this mesh and velocity, estimated by power iteration on the amplification operator with a
 * bisection on dt.
 *
 * Operator: first-order upwind finite volume in advective form,
 *   dq_i/dt = (1/A_i) · Σ_{inflow faces f of i} |u_f·n_f|·|f|·(q_j − q_i),
 * u_f the mean of the face's two node velocities (point data) or of its two cells' velocities
 * (cell data). Boundary faces contribute nothing: an inflow boundary is zero-gradient (q_j = q_i),
 * an outflow face never enters the advective form. Every row sums to zero, so constants are kept.
 *
 * Amplification: R(dt·L) with R the stability polynomial of the integrator, applied by Horner's
 * rule as deg R sparse mat-vecs. Criterion: from a seeded random start, the mean growth per step
 * of the max-norm over steps burnIn+1..iterations is ≤ 1 + tolerance. As the iteration count grows
 * this tends to the spectral radius of R(dt·L) (asymptotic growth). It is an estimate, and it does
 * not bound the transient growth of a non-normal operator from a worst-case start.
 *
 * The max-norm makes the test exact on one side: for dt·max_i Σ_f coef ≤ 1, I + dt·L is
 * non-negative with unit row sums, and the Taylor polynomials of degree ≤ 4 are combinations of
 * powers of I + dt·L with non-negative weights (e.g. 1 + z + z²/2 = ½ + ½(1 + z)²), so no start
 * grows: the measured step is at least the face-flux limit of this operator.
 */
import { FLAG_DEGENERATE, type CellGeometry } from '../geometry/cells.js';
import type { EdgeTopology } from '../geometry/edges.js';
import { DEG, orthographic, projected } from '../geometry/geographic.js';
import type { Mesh } from '../mesh/model.js';
import { UsageError } from '../mesh/errors.js';
import type { VelocityField } from '../physics/speed.js';
import { builtInTableau, stabilityPolynomial, TIME_INTEGRATORS } from '../stability/index.js';
import { Rng } from '../demo/random.js';

export interface UpwindOperator {
  nCells: number;
  /** Faces that carry flow between two cells: the receiving (downstream) cell, the upstream cell, |u_f·n_f|·|f| / A_dst. */
  dst: Int32Array;
  src: Int32Array;
  coef: Float64Array;
  /** Length of dst, src and coef. */
  nFaces: number;
  /** Σ coef over each cell's inflow faces: I + dt·L stays non-negative while dt·diag ≤ 1. */
  diag: Float64Array;
  /** Degenerate cells (zero area) that receive flow: left out of the operator. */
  degenerate: number;
}

/** The advective-form upwind operator L (see the module note). Geographic points: each face on the tangent plane at the centroid of the cell its normal comes from. */
export function upwindOperator(mesh: Mesh, geom: CellGeometry, edges: EdgeTopology, vel: VelocityField, geographic = false): UpwindOperator {
  const n = mesh.nCells;
  const { nEdges, edgeCells, edgeLocal } = edges;
  const off = mesh.cellOffsets, nodes = mesh.cellNodes, pts = mesh.points;
  const { vx, vy, onPoints } = vel;
  const dst = new Int32Array(nEdges), src = new Int32Array(nEdges);
  const coef = new Float64Array(nEdges);
  const diag = new Float64Array(n);
  const skipped = new Uint8Array(n);
  let m = 0, degenerate = 0;
  for (let e = 0; e < nEdges; e++) {
    const c0 = edgeCells[2 * e]!, c1 = edgeCells[2 * e + 1]!;
    if (c1 < 0) continue;
    // the normal comes from a cell with a reliable orientation: c0, or c1 when c0 is degenerate
    const side = geom.flags[c0]! & FLAG_DEGENERATE && !(geom.flags[c1]! & FLAG_DEGENERATE) ? 1 : 0;
    const own = side ? c1 : c0, other = side ? c0 : c1;
    const s0 = off[own]!, nk = off[own + 1]! - s0, k = edgeLocal[2 * e + side]!;
    const a = nodes[s0 + k]!, b = nodes[s0 + (k + 1 < nk ? k + 1 : 0)]!;
    let ex = pts[2 * b]! - pts[2 * a]!, ey = pts[2 * b + 1]! - pts[2 * a + 1]!;
    if (geographic) {
      const lon0 = geom.centroidX[own]!, lat0 = geom.centroidY[own]!, sl = Math.sin(lat0 * DEG);
      orthographic(pts[2 * a]!, pts[2 * a + 1]!, lon0, lat0, sl);
      const px = projected.x, py = projected.y;
      orthographic(pts[2 * b]!, pts[2 * b + 1]!, lon0, lat0, sl);
      ex = projected.x - px;
      ey = projected.y - py;
    }
    // outward normal × length of `own`: s·(ey, −ex), s = its orientation
    const s = geom.signedArea[own]! < 0 ? -1 : 1;
    const ux = onPoints ? 0.5 * (vx[a]! + vx[b]!) : 0.5 * (vx[c0]! + vx[c1]!);
    const uy = onPoints ? 0.5 * (vy[a]! + vy[b]!) : 0.5 * (vy[c0]! + vy[c1]!);
    const flux = s * (ux * ey - uy * ex);
    if (flux === 0) continue;
    const to = flux < 0 ? own : other, from = flux < 0 ? other : own;
    if (geom.flags[to]! & FLAG_DEGENERATE || !(geom.area[to]! > 0)) {
      if (!skipped[to]) { skipped[to] = 1; degenerate++; }
      continue;
    }
    const c = Math.abs(flux) / geom.area[to]!;
    dst[m] = to;
    src[m] = from;
    coef[m] = c;
    diag[to]! += c;
    m++;
  }
  return { nCells: n, dst: dst.subarray(0, m), src: src.subarray(0, m), coef: coef.subarray(0, m), nFaces: m, diag, degenerate };
}

/** y = L·x (face order: buildEdges groups faces by node, which keeps the accesses close). */
export function applyOperator(op: UpwindOperator, x: Float64Array, y: Float64Array): void {
  y.fill(0);
  const { dst, src, coef, nFaces } = op;
  for (let f = 0; f < nFaces; f++) {
    const i = dst[f]!;
    y[i]! += coef[f]! * (x[src[f]!]! - x[i]!);
  }
}

export interface Integrator {
  name: string;
  /** Coefficients r_0..r_s of the stability polynomial R(z). */
  r: Float64Array;
}

/** Short names for the Taylor polynomials Σ_{k≤s} z^k/k!: every s-stage Runge–Kutta method of order s ≤ 4. */
const TAYLOR: Record<string, number> = { euler: 1, rk2: 2, rk3: 3, rk4: 4 };

export const PROBE_INTEGRATORS = Object.keys(TAYLOR);

export function integrator(name: string): Integrator {
  const key = name.trim().toLowerCase();
  const s = TAYLOR[key];
  if (s !== undefined) {
    const r = new Float64Array(s + 1);
    r[0] = 1;
    for (let k = 1; k <= s; k++) r[k] = r[k - 1]! / k;
    return { name: key, r };
  }
  const t = builtInTableau(key);
  if (!t) throw new UsageError(`unknown integrator "${name}"; use ${PROBE_INTEGRATORS.join(', ')} or one of ${TIME_INTEGRATORS.join(', ')}`);
  return { name: key, r: stabilityPolynomial(t) };
}

/** Scratch vectors for `amplify`; the result is left in `y`. */
export interface Work { y: Float64Array; t: Float64Array }

export function workspace(n: number): Work {
  return { y: new Float64Array(n), t: new Float64Array(n) };
}

/**
 * w.y = R(dt·L)·x by Horner's rule: y ← r_s x; y ← r_k x + dt·L y for k = s−1 … 0, each step one
 * pass over the cells and one over the faces (x and w.y must be different arrays).
 */
export function amplify(op: UpwindOperator, r: Float64Array, dt: number, x: Float64Array, w: Work): void {
  const { dst, src, coef, diag, nFaces } = op;
  const s = r.length - 1;
  const n = x.length;
  let y = w.y, t = w.t;
  const rs = r[s]!;
  for (let i = 0; i < n; i++) y[i] = rs * x[i]!;
  for (let k = s - 1; k >= 0; k--) {
    const rk = r[k]!;
    for (let i = 0; i < n; i++) t[i] = rk * x[i]! - dt * diag[i]! * y[i]!;
    for (let f = 0; f < nFaces; f++) t[dst[f]!]! += dt * coef[f]! * y[src[f]!]!;
    const u = y; y = t; t = u;
  }
  w.y = y;
  w.t = t;
}

/** max |x_i|; Infinity when any entry is not finite. */
function maxAbs(x: Float64Array): number {
  let m = 0;
  for (let i = 0; i < x.length; i++) {
    const a = Math.abs(x[i]!);
    if (a > m) m = a;
    else if (a !== a) return Infinity;
  }
  return m === Infinity ? Infinity : m;
}

/** Uniform start in [−1, 1) from our seeded generator. */
export function randomStart(n: number, seed: number): Float64Array {
  const rng = new Rng(seed);
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = 2 * rng.next() - 1;
  return x;
}

const RESCALE_ABOVE = 1e100;
const RESCALE_BELOW = 1e-100;

/**
 * Mean growth per step of ‖x‖_∞ over steps burnIn+1 … iterations of x ← R(dt·L)·x from `start`:
 * (‖x_K‖ / ‖x_burnIn‖)^(1/(K − burnIn)); 0 when everything decays to zero, Infinity on overflow.
 * The iterate is rescaled only when its norm leaves [1e-100, 1e100].
 */
export function growthPerStep(op: UpwindOperator, r: Float64Array, dt: number, start: Float64Array, iterations: number, burnIn: number, w: Work = workspace(op.nCells)): number {
  let x: Float64Array = Float64Array.from(start);
  let logScale = 0;
  let logAtBurnIn = burnIn === 0 ? Math.log(maxAbs(x)) : 0;
  for (let k = 1; k <= iterations; k++) {
    amplify(op, r, dt, x, w);
    const next = w.y;
    w.y = x;
    x = next;
    const norm = maxAbs(x);
    if (norm === 0) return 0;
    if (norm === Infinity) return Infinity;
    const logNow = logScale + Math.log(norm);
    if (k === burnIn) logAtBurnIn = logNow;
    if (k === iterations) return Math.exp((logNow - logAtBurnIn) / (iterations - burnIn));
    if (norm > RESCALE_ABOVE || norm < RESCALE_BELOW) {
      const inv = 1 / norm;
      for (let i = 0; i < x.length; i++) x[i] = x[i]! * inv;
      logScale = logNow;
    }
  }
  return 1;
}

export interface ProbeOptions {
  /** Steps per trial (default PROBE_ITERATIONS). */
  iterations?: number;
  /** Steps left out of the growth average (default a quarter of the iterations). */
  burnIn?: number;
  /** A trial is stable when the mean growth per step is ≤ 1 + tolerance (default 1e-6). */
  tolerance?: number;
  /** The bisection stops when (hi − lo) ≤ precision·lo (default 1e-3). */
  precision?: number;
  seed?: number;
  /** Called after each trial. */
  onTrial?: (trial: ProbeTrial, index: number) => void;
}

export interface ProbeTrial { dt: number; growth: number; stable: boolean }

export interface ProbeResult {
  /** The largest step found stable; null when no face carries flow. */
  dt: number | null;
  /** 1 / max_i Σ coef: the face-flux (positivity) limit of this operator, where the search starts. */
  start: number | null;
  /** Stable and unstable ends of the final bracket (hi null when no unstable step was found). */
  bracket: [number, number | null] | null;
  trials: ProbeTrial[];
  iterations: number;
  burnIn: number;
  tolerance: number;
  precision: number;
  seed: number;
}

export const PROBE_ITERATIONS = 400;
export const PROBE_TOLERANCE = 1e-6;
export const PROBE_PRECISION = 1e-3;
export const PROBE_SEED = 20240917;
/** Doublings (or halvings) tried to bracket the limit. */
const MAX_EXPANSIONS = 12;

/** The largest stable step of R(dt·L) by bisection on dt (see the module note). */
export function probeLimit(op: UpwindOperator, r: Float64Array, options: ProbeOptions = {}): ProbeResult {
  const iterations = options.iterations ?? PROBE_ITERATIONS;
  if (!Number.isInteger(iterations) || iterations < 2) throw new UsageError(`the number of iterations must be an integer ≥ 2, got ${iterations}`);
  const burnIn = options.burnIn ?? Math.floor(iterations / 4);
  if (!Number.isInteger(burnIn) || burnIn < 0 || burnIn >= iterations) throw new UsageError(`the burn-in must be an integer in [0, ${iterations}), got ${burnIn}`);
  const tolerance = options.tolerance ?? PROBE_TOLERANCE;
  const precision = options.precision ?? PROBE_PRECISION;
  const seed = options.seed ?? PROBE_SEED;
  const base = { iterations, burnIn, tolerance, precision, seed };
  let maxDiag = 0;
  for (let i = 0; i < op.nCells; i++) if (op.diag[i]! > maxDiag) maxDiag = op.diag[i]!;
  const trials: ProbeTrial[] = [];
  if (!(maxDiag > 0)) return { dt: null, start: null, bracket: null, trials, ...base };
  const start = randomStart(op.nCells, seed);
  const w = workspace(op.nCells);
  const stable = (dt: number): boolean => {
    const growth = growthPerStep(op, r, dt, start, iterations, burnIn, w);
    const t = { dt, growth, stable: growth <= 1 + tolerance };
    trials.push(t);
    options.onTrial?.(t, trials.length - 1);
    return t.stable;
  };
  const dt0 = 1 / maxDiag;
  let lo: number, hi: number | null;
  if (stable(dt0)) {
    lo = dt0;
    hi = null;
    for (let k = 0; k < MAX_EXPANSIONS; k++) {
      if (!stable(2 * lo)) { hi = 2 * lo; break; }
      lo *= 2;
    }
  } else {
    hi = dt0;
    lo = 0;
    for (let k = 0; k < MAX_EXPANSIONS; k++) {
      if (stable(hi / 2)) { lo = hi / 2; break; }
      hi /= 2;
    }
    if (lo === 0) return { dt: 0, start: dt0, bracket: [0, hi], trials, ...base };
  }
  if (hi === null) return { dt: lo, start: dt0, bracket: [lo, null], trials, ...base };
  let up: number = hi;
  while (up - lo > precision * lo) {
    const mid: number = 0.5 * (lo + up);
    if (stable(mid)) lo = mid; else up = mid;
  }
  return { dt: lo, start: dt0, bracket: [lo, up], trials, ...base };
}
