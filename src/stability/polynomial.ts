/**
 * The stability polynomial R(z) of an explicit Runge–Kutta method and what follows from it:
 * intervals of the real and imaginary axes inside |R| ≤ 1, and the first exit of a ray from the
 * stability region.
 *
 * Tolerance: a point z counts as stable when |R(z)| ≤ 1 + STABILITY_TOLERANCE. Rounding makes
 * |R| = 1 points (the imaginary axis at RK4's 2√2, spectra touching the boundary) come out at
 * 1 ± 1e-16; 1e-12 judges them consistently as stable while moving the limits by no more than
 * ~1e-12 relative. The imaginary axis near z = 0 is decided exactly from the coefficients
 * (see imaginaryAxisGrowth), never with this tolerance.
 */
import type { Tableau } from './tableau.js';

export const STABILITY_TOLERANCE = 1e-12;
const LIMIT = 1 + STABILITY_TOLERANCE;

/** Coefficients r_0..r_s of R(z) = 1 + z bᵀ(I − zA)⁻¹e = Σ_k bᵀA^{k−1}e z^k (A strictly lower triangular). */
export function stabilityPolynomial(t: Tableau): Float64Array {
  const s = t.b.length;
  const r = new Float64Array(s + 1);
  r[0] = 1;
  let v = new Float64Array(s).fill(1);
  for (let k = 1; k <= s; k++) {
    let dot = 0;
    for (let i = 0; i < s; i++) dot += t.b[i]! * v[i]!;
    r[k] = dot;
    const next = new Float64Array(s);
    for (let i = 0; i < s; i++) {
      let acc = 0;
      for (let j = 0; j < i; j++) acc += t.A[i]![j]! * v[j]!;
      next[i] = acc;
    }
    v = next;
  }
  let deg = s;
  while (deg > 1 && Math.abs(r[deg]!) <= 1e-15) deg--;
  return r.slice(0, deg + 1);
}

/** |R(x + iy)|² by Horner's rule. */
export function abs2(r: Float64Array, x: number, y: number): number {
  let pr = r[r.length - 1]!;
  let pi = 0;
  for (let k = r.length - 2; k >= 0; k--) {
    const t = pr * x - pi * y + r[k]!;
    pi = pr * y + pi * x;
    pr = t;
  }
  return pr * pr + pi * pi;
}

export function isStable(r: Float64Array, x: number, y: number): boolean {
  return abs2(r, x, y) <= LIMIT * LIMIT;
}

/**
 * |R(iy)|² − 1 = γ y^{2m} + O(y^{2m+2}) near y = 0: the first non-zero coefficient of this even
 * polynomial, found exactly from the coefficients of R (entries below 1e-9 relative count as 0,
 * so that tableaux typed with ten digits behave like their exact versions).
 * γ < 0: the imaginary axis near 0 is inside the region; γ > 0: outside (forward Euler m = 1, Heun m = 2).
 */
export function imaginaryAxisGrowth(r: Float64Array): { m: number; gamma: number } {
  const s = r.length - 1;
  for (let m = 1; m <= s; m++) {
    // coefficient of y^{2m} in |Σ r_k (iy)^k|² = Σ_{a+b=2m} r_a r_b i^a (−i)^b
    let e = 0;
    let scale = 0;
    for (let a = Math.max(0, 2 * m - s); a <= Math.min(2 * m, s); a++) {
      const b = 2 * m - a;
      const term = r[a]! * r[b]! * ((a - b) / 2 % 2 === 0 ? 1 : -1);
      e += term;
      scale += Math.abs(term);
    }
    if (Math.abs(e) > 1e-9 * scale) return { m, gamma: e };
  }
  return { m: s, gamma: 0 };
}

/**
 * A radius containing the whole region: its outermost point lies on |R| = 1, i.e. is a root of
 * R(z) − e^{iω} for some ω, and Fujiwara's bound on the roots of Σ c_k z^k,
 * 2·max(|c_{s−1}/c_s|, …, |c_1/c_s|^{1/(s−1)}, |c_0/(2c_s)|^{1/s}) with |c_0| ≤ |r_0| + 1, holds for every ω.
 */
export function regionRadiusBound(r: Float64Array): number {
  const s = r.length - 1;
  const lead = Math.abs(r[s]!);
  let m = ((Math.abs(r[0]!) + 1) / (2 * lead)) ** (1 / s);
  for (let k = 1; k < s; k++) m = Math.max(m, (Math.abs(r[s - k]!) / lead) ** (1 / k));
  return 2.002 * m; // strictly beyond: scans that reach the bound must see |R| > 1 there
}

/** An outer radius of the stability region, from a polar scan inward from regionRadiusBound (one scan step of margin). */
export function regionRadius(r: Float64Array): number {
  const bound = regionRadiusBound(r);
  const angles = 360;
  const steps = 2000;
  let best = 0;
  for (let a = 0; a <= angles; a++) {
    const phi = (Math.PI * a) / angles;
    const cx = Math.cos(phi);
    const cy = Math.sin(phi);
    for (let k = steps; k >= 1; k--) {
      const t = (bound * k) / steps;
      if (t <= best) break;
      if (isStable(r, t * cx, t * cy)) {
        best = t;
        break;
      }
    }
  }
  return Math.min(bound, best + bound / steps);
}

/**
 * First exit of the ray t ↦ t·(dx, dy), t > 0, from the stability region: the largest T with
 * |R(t(dx+i dy))| ≤ 1 + tol for every t ∈ (0, T]. `tMax` must lie beyond the region (it is returned
 * when no exit is found before it); about 0 when the ray leaves at once.
 */
export function rayExit(r: Float64Array, dx: number, dy: number, tMax: number): number {
  // Geometric steps near the origin (exits there can be tiny), then uniform ones.
  const uniform = 256;
  const h = tMax / uniform;
  let lo = 0;
  let hi = -1;
  for (let t = h * 1e-6; t < h; t *= 1.5) {
    if (!isStable(r, t * dx, t * dy)) {
      hi = t;
      break;
    }
    lo = t;
  }
  if (hi < 0) {
    for (let k = 1; k <= uniform; k++) {
      const t = k * h;
      if (!isStable(r, t * dx, t * dy)) {
        hi = t;
        break;
      }
      lo = t;
    }
  }
  if (hi < 0) return tMax;
  return bisectExit(r, dx, dy, lo, hi);
}

function bisectExit(r: Float64Array, dx: number, dy: number, lo: number, hi: number): number {
  while (hi - lo > 1e-15 * hi) {
    const mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    if (isStable(r, mid * dx, mid * dy)) lo = mid;
    else hi = mid;
  }
  return lo;
}

/** Largest x with |R(−ξ)| ≤ 1 for every ξ ∈ [0, x]. */
export function realInterval(r: Float64Array, radius = regionRadius(r)): number {
  return fineAxisExit(r, -1, 0, radius);
}

/**
 * Largest y with |R(iη)| ≤ 1 for every η ∈ [0, y]; 0 when the imaginary axis leaves the region
 * at the origin (decided from the coefficients, so forward Euler and Heun give exactly 0).
 */
export function imagInterval(r: Float64Array, radius = regionRadius(r)): number {
  if (imaginaryAxisGrowth(r).gamma > 0) return 0;
  return fineAxisExit(r, 0, 1, radius);
}

function fineAxisExit(r: Float64Array, dx: number, dy: number, radius: number): number {
  const steps = 4096;
  const h = radius / steps;
  for (let k = 1; k <= steps; k++) {
    if (!isStable(r, k * h * dx, k * h * dy)) return bisectExit(r, dx, dy, (k - 1) * h, k * h);
  }
  return radius;
}
