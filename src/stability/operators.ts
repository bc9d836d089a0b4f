/**
 * The spatial operators known by name: finite-difference stencils and DG of degree 0..6, each as
 * its Fourier spectrum λ(θ) for u_t + a u_x = 0 (a = 1, Δx = 1) plus the leading dissipation
 * near θ = 0 that decides stability for small wave numbers.
 */
import { UsageError } from '../mesh/errors.js';
import { dgDissipation, dgSpectrum, MAX_DG_DEGREE } from './dg.js';
import { STENCIL_OFFSETS, stencil, stencilDissipation, stencilSymbol } from './stencil.js';

export interface SpaceOperator {
  name: string;
  /** Eigenvalues per wave number: 1 for a stencil, k + 1 for DG of degree k. */
  size: number;
  /** Writes the `size` eigenvalues at θ into re/im starting at offset. */
  spectrum(theta: number, re: Float64Array, im: Float64Array, offset: number): void;
  /** Re λ ≈ −dissipation·θ^power on the branch through λ(0) = 0; dissipation 0 when Re λ ≡ 0. */
  smallTheta: { power: number; dissipation: number };
}

const DG_NAMES = Array.from({ length: MAX_DG_DEGREE + 1 }, (_, k) => `dg${k}`);

export const SPACE_OPERATORS: string[] = [...Object.keys(STENCIL_OFFSETS), ...DG_NAMES];

export function spaceOperator(name: string): SpaceOperator {
  const key = name.trim().toLowerCase();
  const st = stencil(key);
  if (st) {
    return {
      name: key,
      size: 1,
      spectrum: (theta, re, im, offset) => {
        const [a, b] = stencilSymbol(st, theta);
        re[offset] = a;
        im[offset] = b;
      },
      smallTheta: stencilDissipation(st),
    };
  }
  const dg = /^dg([0-9]+)$/.exec(key);
  if (dg && Number(dg[1]) <= MAX_DG_DEGREE) {
    const k = Number(dg[1]);
    return {
      name: key,
      size: k + 1,
      spectrum: (theta, re, im, offset) => dgSpectrum(k, theta, re, im, offset),
      smallTheta: dgDissipation(k),
    };
  }
  throw new UsageError(`unknown space operator "${name}"; known: ${SPACE_OPERATORS.join(', ')}`);
}
