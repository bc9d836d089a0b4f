/**
 * The largest stable Courant number of a pairing (Runge–Kutta method × spatial operator) by von
 * Neumann analysis: the largest σ with |R(σλ)| ≤ 1 + tol for every wave number θ and eigenvalue λ(θ).
 *
 * How it is found: the spectrum is sampled at 1025 wave numbers in [0, π] (λ(−θ) is the conjugate
 * and R has real coefficients, so |R| is the same there); for each eigenvalue the ray σ ↦ σλ is
 * followed out of the stability region (scan, then bisection to 1e-15 relative); the smallest exit
 * is refined by a golden-section search between the neighbouring samples. The tolerance is
 * STABILITY_TOLERANCE (1e-12 on |R|), so spectra that touch the boundary, such as central
 * stencils reaching RK4's 2√2 on the imaginary axis, are judged stable at the touching σ.
 *
 * Small wave numbers are decided from series, not samples. With |R(iy)|² = 1 + γy^{2m} + … and
 * Re λ(θ) ≈ −Dθ^{2n} (|λ| ≈ θ), log|R(σλ)|² ≈ −2σDθ^{2n} + γσ^{2m}θ^{2m}. When γ > 0 (forward
 * Euler m = 1, two-stage second-order methods m = 2):
 *   - n < m: no constraint from small θ;
 *   - n = m: σ ≤ (2D/γ)^{1/(2m−1)}, the θ → 0 limit, taken into account;
 *   - n > m or D = 0 (purely imaginary spectra of central stencils): for every σ > 0 some small θ
 *     grows. The growth per step is only O(σ^p), p ≥ 2, so it vanishes per unit time as σ → 0:
 *     status 'weakly-unstable', courant 0 (e.g. Euler or Heun with central2, SSP-RK2 with DG P2).
 * 'unstable' is kept for spectra reaching into Re λ > 0 (growth that no step size removes).
 */
import { UsageError } from '../mesh/errors.js';
import { spaceOperator, type SpaceOperator } from './operators.js';
import { imagInterval, imaginaryAxisGrowth, rayExit, realInterval, regionRadius, stabilityPolynomial } from './polynomial.js';
import { builtInTableau, TIME_INTEGRATORS, validateTableau, type Tableau } from './tableau.js';

export interface SchemeResult {
  /** Integrator name (lower case), or 'custom' for a tableau object. */
  time: string;
  space: string;
  /** Largest stable C = |a|·dt/Δx; 0 unless status is 'stable'. */
  courant: number;
  status: 'stable' | 'unstable' | 'weakly-unstable';
  /** Of the integrator alone: |R(−x)| ≤ 1 on [0, realInterval], |R(iy)| ≤ 1 on [0, imagInterval]. */
  realInterval: number;
  imagInterval: number;
  /** Largest ν·dt/Δx² with the 3-point diffusion stencil (symbol −4 sin²(θ/2)): realInterval / 4. */
  diffusion: number;
  /** Wave number θ ∈ [0, π] (radians per cell) that sets the limit. */
  worstTheta?: number;
}

export const THETA_SAMPLES = 1024;
const GOLDEN_STEPS = 48;

export function resolveTime(time: string | Tableau): { name: string; tableau: Tableau } {
  if (typeof time !== 'string') return { name: 'custom', tableau: validateTableau(time) };
  const tableau = builtInTableau(time);
  if (!tableau) throw new UsageError(`unknown time integrator "${time}"; known: ${TIME_INTEGRATORS.join(', ')} (or a tableau .json file)`);
  return { name: time.trim().toLowerCase(), tableau };
}

/** Stability data of one pairing. Names are case-insensitive; unknown names throw UsageError. */
export function analyseScheme(time: string | Tableau, space: string): SchemeResult {
  const { name, tableau } = resolveTime(time);
  const op = spaceOperator(space);
  const r = stabilityPolynomial(tableau);
  const radius = regionRadius(r);
  const real = realInterval(r, radius);
  const limit = courantLimit(r, op, radius);
  const result: SchemeResult = {
    time: name,
    space: op.name,
    courant: limit.courant,
    status: limit.status,
    realInterval: real,
    imagInterval: imagInterval(r, radius),
    diffusion: real / 4,
  };
  if (limit.worstTheta !== undefined) result.worstTheta = limit.worstTheta;
  return result;
}

interface Limit {
  courant: number;
  status: SchemeResult['status'];
  worstTheta?: number;
}

/** Largest stable σ for the polynomial r and the operator's spectrum (see the module comment). */
export function courantLimit(r: Float64Array, op: SpaceOperator, radius = regionRadius(r)): Limit {
  const n = THETA_SAMPLES;
  const size = op.size;
  const re = new Float64Array((n + 1) * size);
  const im = new Float64Array((n + 1) * size);
  for (let i = 0; i <= n; i++) op.spectrum((Math.PI * i) / n, re, im, i * size);

  let maxAbs = 0;
  let maxRe = -Infinity;
  let maxReAt = 0;
  for (let q = 0; q < re.length; q++) {
    maxAbs = Math.max(maxAbs, Math.hypot(re[q]!, im[q]!));
    if (re[q]! > maxRe) {
      maxRe = re[q]!;
      maxReAt = Math.floor(q / size);
    }
  }
  if (maxRe > 1e-10 * maxAbs || op.smallTheta.dissipation < 0) {
    return { courant: 0, status: 'unstable', worstTheta: op.smallTheta.dissipation < 0 ? 0 : (Math.PI * maxReAt) / n };
  }

  let best = Infinity;
  let bestTheta = 0;
  let bestIndex = -1;
  const { m, gamma } = imaginaryAxisGrowth(r);
  if (gamma > 0) {
    const { power, dissipation } = op.smallTheta;
    if (dissipation === 0 || power > 2 * m) return { courant: 0, status: 'weakly-unstable', worstTheta: 0 };
    if (power === 2 * m) best = (2 * dissipation / gamma) ** (1 / (2 * m - 1));
  }

  const tiny = 1e-14 * maxAbs;
  for (let i = 0; i <= n; i++) {
    const s = minExit(r, re, im, i * size, size, radius, tiny);
    if (s < best) {
      best = s;
      bestIndex = i;
    }
  }
  if (bestIndex >= 0) {
    const refined = refine(r, op, radius, tiny, bestIndex, n);
    bestTheta = refined.theta;
    best = Math.min(best, refined.sigma);
  }
  if (!(best > 0) || !Number.isFinite(best)) return { courant: 0, status: 'weakly-unstable', worstTheta: bestTheta };
  return { courant: best, status: 'stable', worstTheta: bestTheta };
}

function minExit(r: Float64Array, re: Float64Array, im: Float64Array, offset: number, size: number, radius: number, tiny: number): number {
  let best = Infinity;
  for (let j = offset; j < offset + size; j++) {
    const a = Math.hypot(re[j]!, im[j]!);
    if (a <= tiny) continue;
    const s = rayExit(r, re[j]! / a, im[j]! / a, radius) / a;
    if (s < best) best = s;
  }
  return best;
}

/** Golden-section search for the smallest exit between the samples around index i. */
function refine(r: Float64Array, op: SpaceOperator, radius: number, tiny: number, i: number, n: number): { theta: number; sigma: number } {
  const re = new Float64Array(op.size);
  const im = new Float64Array(op.size);
  const at = (theta: number): number => {
    op.spectrum(theta, re, im, 0);
    return minExit(r, re, im, 0, op.size, radius, tiny);
  };
  let a = (Math.PI * Math.max(0, i - 1)) / n;
  let b = (Math.PI * Math.min(n, i + 1)) / n;
  const g = (Math.sqrt(5) - 1) / 2;
  let x1 = b - g * (b - a);
  let x2 = a + g * (b - a);
  let f1 = at(x1);
  let f2 = at(x2);
  let bestTheta = (Math.PI * i) / n;
  let best = at(bestTheta);
  for (let k = 0; k < GOLDEN_STEPS; k++) {
    if (f1 <= f2) {
      b = x2; x2 = x1; f2 = f1;
      x1 = b - g * (b - a);
      f1 = at(x1);
    } else {
      a = x1; x1 = x2; f1 = f2;
      x2 = a + g * (b - a);
      f2 = at(x2);
    }
    if (f1 < best) { best = f1; bestTheta = x1; }
    if (f2 < best) { best = f2; bestTheta = x2; }
  }
  return { theta: bestTheta, sigma: best };
}
