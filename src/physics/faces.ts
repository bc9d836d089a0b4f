/**
 * Face-based limits for cell-centred finite volume.
 *
 * Face-flux (advective) limit, direction-aware:
 *   advection            dt_i = C·A_i / Σ_f max(u_f·n_f, 0)·|f|
 *   with a wave term c   dt_i = C·2A_i / Σ_f (|u_f·n_f| + c_f)·|f|   (first-order Rusanov-type flux:
 *                        the coefficient of q_i stays non-negative)
 * For a constant u the two agree (Σ|u·n||f| = 2Σ max(u·n, 0)|f|), and both are ≥ the inscribed
 * bound C·h/λ because Σ max(u·n, 0)|f| ≤ |u|·P/2.
 * u_f is the mean of the face's two node velocities (point data) or the cell's velocity.
 *
 * Diffusive limit in two-point face form:
 *   dt_i = D · A_i / Σ_f (ν_i·|f| / d_f)
 * d_f: distance between the centroids of the two cells of face f; on a boundary face twice the
 * distance from the centroid to the face. D = 1 reproduces FTCS: Δx²/(2ν) in 1-D, Δx²/(4ν) on a
 * square grid (Press et al., Numerical Recipes, 2nd ed., §19.2); schemes with a larger real
 * stability interval scale it by D = 2·d_max.
 */
import type { CellGeometry } from '../geometry/cells.js';
import { FLAG_DEGENERATE } from '../geometry/cells.js';
import type { EdgeTopology } from '../geometry/edges.js';
import type { Mesh } from '../mesh/model.js';
import type { VelocityField, WaveTerm } from './speed.js';
import { greatCircle, orthographic, projected, DEG } from '../geometry/geographic.js';

/** `geographic`: points are longitude/latitude; edges are projected at the cell's centroid latitude. */
export function fluxLimit(mesh: Mesh, geom: CellGeometry, vel: VelocityField | null, wave: WaveTerm | null, C: number, geographic = false): Float64Array {
  const n = mesh.nCells;
  const off = mesh.cellOffsets, nodes = mesh.cellNodes, pts = mesh.points;
  const out = new Float64Array(n);
  const vx = vel?.vx, vy = vel?.vy;
  const velOnPoints = vel?.onPoints ?? false;
  const wConst = wave && typeof wave.term === 'number' ? wave.term : 0;
  const wArr = wave && typeof wave.term !== 'number' ? wave.term : null;
  const wOnPoints = wave?.onPoints ?? false;
  const system = wave !== null;
  for (let i = 0; i < n; i++) {
    if (geom.flags[i]! & FLAG_DEGENERATE) { out[i] = 0; continue; }
    // outward normal × length of edge a→b is s·(ey, −ex), s = orientation of the cell
    const s = geom.signedArea[i]! < 0 ? -1 : 1;
    const b0 = off[i]!, e0 = off[i + 1]!;
    const lon0 = geom.centroidX[i]!, lat0 = geom.centroidY[i]!, s0 = Math.sin(lat0 * DEG);
    let sum = 0;
    for (let k = b0; k < e0; k++) {
      const a = nodes[k]!, b = nodes[k + 1 < e0 ? k + 1 : b0]!;
      let ex = pts[2 * b]! - pts[2 * a]!, ey = pts[2 * b + 1]! - pts[2 * a + 1]!;
      if (geographic) {
        orthographic(pts[2 * a]!, pts[2 * a + 1]!, lon0, lat0, s0);
        const px = projected.x, py = projected.y;
        orthographic(pts[2 * b]!, pts[2 * b + 1]!, lon0, lat0, s0);
        ex = projected.x - px;
        ey = projected.y - py;
      }
      const nx = s * ey, ny = -s * ex;
      let ux = 0, uy = 0;
      if (vx && vy) {
        if (velOnPoints) { ux = 0.5 * (vx[a]! + vx[b]!); uy = 0.5 * (vy[a]! + vy[b]!); } else { ux = vx[i]!; uy = vy[i]!; }
      }
      const un = ux * nx + uy * ny;
      if (system) {
        const len = Math.hypot(ex, ey);
        const c = wArr ? (wOnPoints ? 0.5 * (wArr[a]! + wArr[b]!) : wArr[i]!) : wConst;
        sum += Math.abs(un) + c * len;
      } else if (un > 0) sum += un;
    }
    const num = (system ? 2 : 1) * C * geom.area[i]!;
    out[i] = sum > 0 ? num / sum : Infinity;
  }
  return out;
}

/** Per-cell diffusivity ν ≥ 0 (already reduced to cells). */
export function diffusionLimit(mesh: Mesh, geom: CellGeometry, edges: EdgeTopology, nu: Float64Array, D: number, geographic = false): Float64Array {
  const n = mesh.nCells;
  const pts = mesh.points;
  const sum = new Float64Array(n);
  const bad = new Uint8Array(n);
  const { edgeNodes, edgeCells, nEdges } = edges;
  const cx = geom.centroidX, cy = geom.centroidY;
  for (let e = 0; e < nEdges; e++) {
    const p = edgeNodes[2 * e]!, q = edgeNodes[2 * e + 1]!;
    let ax = pts[2 * p]!, ay = pts[2 * p + 1]!;
    let fx = pts[2 * q]! - ax, fy = pts[2 * q + 1]! - ay;
    const c0 = edgeCells[2 * e]!, c1 = edgeCells[2 * e + 1]!;
    let px = cx[c0]!, py = cy[c0]!;
    if (geographic) {
      // every vector on the plane tangent at the centroid of c0 (second-order accurate)
      const s0 = Math.sin(py * DEG);
      orthographic(pts[2 * p]!, pts[2 * p + 1]!, px, py, s0);
      const x0 = projected.x, y0 = projected.y;
      orthographic(pts[2 * q]!, pts[2 * q + 1]!, px, py, s0);
      fx = projected.x - x0; fy = projected.y - y0;
      ax = x0; ay = y0; px = 0; py = 0;
    }
    const len = Math.hypot(fx, fy);
    if (c1 >= 0) {
      const d = geographic ? greatCircle(cx[c0]!, cy[c0]!, cx[c1]!, cy[c1]!) : Math.hypot(cx[c1]! - cx[c0]!, cy[c1]! - cy[c0]!);
      if (d > 0) { sum[c0]! += (nu[c0]! * len) / d; sum[c1]! += (nu[c1]! * len) / d; } else { bad[c0] = 1; bad[c1] = 1; }
    } else {
      // twice the distance from the centroid to the line of the face
      const d = len > 0 ? (2 * Math.abs((px - ax) * fy - (py - ay) * fx)) / len : 0;
      if (d > 0) sum[c0]! += (nu[c0]! * len) / d; else bad[c0] = 1;
    }
  }
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (bad[i] || geom.flags[i]! & FLAG_DEGENERATE) { out[i] = 0; continue; }
    out[i] = sum[i]! > 0 ? (D * geom.area[i]!) / sum[i]! : Infinity;
  }
  return out;
}
