/**
 * Discontinuous Galerkin of degree k for u_t + u_x = 0 on a uniform periodic grid (Δx = 1),
 * Legendre basis on each cell, upwind flux. For the Bloch mode c_{j} = e^{ijθ} c_0 the
 * semi-discrete system is dc/dt = M(θ) c with the (k+1)×(k+1) matrix below; its eigenvalues are
 * the spectrum at θ.
 */
import { eigenvalues } from './eigen.js';

export const MAX_DG_DEGREE = 6;

/**
 * M(θ)[m][l] = (2m+1)·(S_ml − P_l(1)P_m(1) + P_l(1)P_m(−1) e^{−iθ}), with the cell mass matrix
 * diag(1/(2m+1)) (for x = j + (ξ+1)/2), stiffness S_ml = ∫ P_l P_m' dξ = 2 when l < m and m − l
 * is odd, P(1) = 1 and P_m(−1) = (−1)^m; the inflow value comes from the upwind (left) cell.
 */
export function dgMatrix(k: number, theta: number): { re: Float64Array; im: Float64Array } {
  const n = k + 1;
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  const cr = Math.cos(theta);
  const ci = -Math.sin(theta);
  for (let m = 0; m < n; m++) {
    const sign = m % 2 === 0 ? 1 : -1;
    for (let l = 0; l < n; l++) {
      const stiff = l < m && (m - l) % 2 === 1 ? 2 : 0;
      re[m * n + l] = (2 * m + 1) * (stiff - 1 + sign * cr);
      im[m * n + l] = (2 * m + 1) * sign * ci;
    }
  }
  return { re, im };
}

export function dgSpectrum(k: number, theta: number, re: Float64Array, im: Float64Array, offset: number): void {
  const M = dgMatrix(k, theta);
  const ev = eigenvalues(k + 1, M.re, M.im);
  re.set(ev.re, offset);
  im.set(ev.im, offset);
}

/**
 * Re λ ≈ −D θ^{2k+2} on the branch through λ(0) = 0. The cell update is DG time stepping of
 * U' = −λU across the cell, whose outflow/inflow ratio is the (k, k+1) Padé approximant of e^{−λ};
 * hence R(−λ) = e^{iθ} and D is that approximant's error constant k!(k+1)!/((2k+1)!(2k+2)!)
 * (from memory; the tests check it against the computed spectrum).
 */
export function dgDissipation(k: number): { power: number; dissipation: number } {
  const f = (n: number): number => (n <= 1 ? 1 : n * f(n - 1));
  return { power: 2 * k + 2, dissipation: (f(k) * f(k + 1)) / (f(2 * k + 1) * f(2 * k + 2)) };
}
