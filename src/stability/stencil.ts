/**
 * Finite-difference approximations of ∂u/∂x on a uniform grid (Δx = 1) and their Fourier symbols.
 * A stencil is a set of integer offsets; its weights are the unique ones of highest order, derived
 * here from Lagrange interpolation, so the table below holds only offsets.
 */

export interface Stencil {
  offsets: number[];
  weights: number[];
}

/** Offsets of the built-in stencils for u_t + a u_x = 0 with a > 0 (upwind side = negative offsets). */
export const STENCIL_OFFSETS: Record<string, number[]> = {
  upwind1: [-1, 0],
  central2: [-1, 1],
  upwind2: [-2, -1, 0],
  upwind3: [-2, -1, 0, 1],
  central4: [-2, -1, 1, 2],
  upwind5: [-3, -2, -1, 0, 1, 2],
  central6: [-3, -2, -1, 1, 2, 3],
};

/** Weights w_j with Σ w_j u(x_j) = u'(0) exactly for polynomials of degree < offsets.length. */
export function derivativeWeights(offsets: number[]): number[] {
  const n = offsets.length;
  return offsets.map((xj, j) => {
    // L_j'(0) = Σ_{k≠j} Π_{l≠j,k} (0 − x_l) / Π_{l≠j} (x_j − x_l); integer products stay exact.
    let den = 1;
    for (let l = 0; l < n; l++) if (l !== j) den *= xj - offsets[l]!;
    let num = 0;
    for (let k = 0; k < n; k++) {
      if (k === j) continue;
      let p = 1;
      for (let l = 0; l < n; l++) if (l !== j && l !== k) p *= -offsets[l]!;
      num += p;
    }
    return num / den;
  });
}

export function stencil(name: string): Stencil | undefined {
  const offsets = STENCIL_OFFSETS[name];
  return offsets ? { offsets, weights: derivativeWeights(offsets) } : undefined;
}

/**
 * λ(θ) of du_j/dt = −Σ w_m u_{j+m} for the mode u_j = e^{ijθ}: λ = −Σ w_m e^{imθ}.
 * The real part is summed as Σ w_m (1 − cos mθ) = 2Σ w_m sin²(mθ/2), exact at θ = 0 and
 * free of cancellation for small θ.
 */
export function stencilSymbol(s: Stencil, theta: number): [number, number] {
  let re = 0;
  let im = 0;
  for (let j = 0; j < s.offsets.length; j++) {
    const m = s.offsets[j]!;
    const h = Math.sin(0.5 * m * theta);
    re += 2 * s.weights[j]! * h * h;
    im -= s.weights[j]! * Math.sin(m * theta);
  }
  return [re, im];
}

/**
 * Leading term of Re λ(θ) ≈ −D θ^{2n} as θ → 0, from the even moments μ_{2n} = Σ w_m m^{2n}
 * (Re λ = Σ_{n≥1} (−1)^{n+1} μ_{2n} θ^{2n}/(2n)!). D = 0 when every even moment vanishes (central stencils).
 */
export function stencilDissipation(s: Stencil): { power: number; dissipation: number } {
  let factorial = 1;
  for (let n = 1; n <= s.offsets.length + 2; n++) {
    factorial *= (2 * n - 1) * (2 * n);
    let mu = 0;
    let scale = 0;
    for (let j = 0; j < s.offsets.length; j++) {
      const t = s.weights[j]! * s.offsets[j]! ** (2 * n);
      mu += t;
      scale += Math.abs(t);
    }
    if (Math.abs(mu) > 1e-9 * scale) return { power: 2 * n, dissipation: ((n % 2 === 0 ? 1 : -1) * mu) / factorial };
  }
  return { power: Infinity, dissipation: 0 };
}
