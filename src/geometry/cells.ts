/**
 * Per-cell geometry and quality, float64, one pass over the cells.
 *
 * Every cell is computed with coordinates relative to its first node, so meshes in projected
 * map coordinates keep their precision. Quality measures follow the definitions of
 * Stimpson, Ernst, Knupp, Pébay, Thompson, "The Verdict Library Reference Manual",
 * Sandia SAND2007-2853P (2007); the quad radius ratio uses the corrected form
 * √(ΣLᵢ²)·h_max / (4√2·min Aᵢ) (Aᵢ: the four corner-triangle areas) as the library does.
 */
import { QUAD, type Mesh } from '../mesh/model.js';
import { angleDegrees } from './angle.js';
import { DEG, inverseOrthographic, orthographic, projected, wrapLongitude, type CoordinateSystem } from './geographic.js';

export const FLAG_DEGENERATE = 1;
export const FLAG_INVERTED = 2;
export const FLAG_NONCONVEX = 4;
export const FLAG_REPEATED_NODE = 8;

/** Degenerate when area ≤ DEGENERATE_AREA · (longest edge)². */
export const DEGENERATE_AREA = 1e-12;

export interface CellGeometry {
  /** Signed area (positive for counter-clockwise node order). */
  signedArea: Float64Array;
  area: Float64Array;
  perimeter: Float64Array;
  /** Inscribed length h = 2A/P: the inradius of a triangle, Δx/… for a strip of thin quads. */
  inradius: Float64Array;
  /** Circumradius of triangles; 0 for quads (not defined). */
  circumradius: Float64Array;
  /** 2A / longest edge. */
  minAltitude: Float64Array;
  minEdge: Float64Array;
  maxEdge: Float64Array;
  /** Degrees. */
  minAngle: Float64Array;
  maxAngle: Float64Array;
  radiusRatio: Float64Array;
  aspectRatio: Float64Array;
  scaledJacobian: Float64Array;
  condition: Float64Array;
  edgeRatio: Float64Array;
  centroidX: Float64Array;
  centroidY: Float64Array;
  flags: Uint8Array;
  /** Orientation of the majority of non-degenerate cells: 1 (counter-clockwise) or -1. */
  orientation: number;
}

const RAD2DEG = 180 / Math.PI;
const SQRT3 = Math.sqrt(3);
const SQRT2 = Math.SQRT2;

export function allocGeometry(n: number): CellGeometry {
  const f = () => new Float64Array(n);
  return {
    signedArea: f(), area: f(), perimeter: f(), inradius: f(), circumradius: f(), minAltitude: f(),
    minEdge: f(), maxEdge: f(), minAngle: f(), maxAngle: f(), radiusRatio: f(), aspectRatio: f(),
    scaledJacobian: f(), condition: f(), edgeRatio: f(), centroidX: f(), centroidY: f(),
    flags: new Uint8Array(n), orientation: 1,
  };
}

/**
 * |(x, y)|. The plain square root is many times faster than Math.hypot; hypot is kept for the
 * rare lengths whose squares would overflow or lose precision to underflow.
 */
function len(x: number, y: number): number {
  const s = x * x + y * y;
  return s < 1e300 && s > 1e-300 ? Math.sqrt(s) : Math.hypot(x, y);
}

/** Angle in degrees between two vectors given their cross and dot products. */
function angleDeg(cross: number, dot: number): number {
  return angleDegrees(Math.abs(cross), dot);
}

/** Interior angle (degrees) at a quad corner between −e_{k−1} = −(ax,ay) and e_k = (bx,by); reflex when α < 0. */
function cornerAngle(ax: number, ay: number, bx: number, by: number, alpha: number): number {
  const t = angleDegrees(Math.abs(alpha), -(ax * bx + ay * by));
  return alpha < 0 ? 360 - t : t;
}

/** Verdict's scaled corner Jacobian α_k / (|L_k|·|L_{k−1}|); 0 where a side has zero length (two corners coincide). */
function cornerJacobian(alpha: number, la: number, lb: number): number {
  return la > 0 && lb > 0 ? alpha / (la * lb) : 0;
}

/** Verdict's corner condition number (|L_k|² + |L_{k−1}|²) / α_k (halved by the caller). */
function cornerCondition(alpha: number, la: number, lb: number): number {
  return alpha > 0 ? (la * la + lb * lb) / alpha : Infinity;
}

/** Values of a degenerate cell: shape measures at their worst, never NaN. */
function setDegenerate(g: CellGeometry, i: number, repeated: boolean, altitude: number, amin: number, amax: number, lmin: number, lmax: number): void {
  g.flags[i] |= FLAG_DEGENERATE | (repeated ? FLAG_REPEATED_NODE : 0);
  g.minAltitude[i] = altitude;
  g.minAngle[i] = amin;
  g.maxAngle[i] = amax;
  g.radiusRatio[i] = Infinity;
  g.aspectRatio[i] = Infinity;
  g.scaledJacobian[i] = 0;
  g.condition[i] = Infinity;
  g.edgeRatio[i] = lmin > 0 ? lmax / lmin : Infinity;
}

/** Triangle kernel. Vertices relative to the first node: (0,0), (bx,by), (cx,cy). */
function triangle(g: CellGeometry, i: number, ox: number, oy: number, bx: number, by: number, cx: number, cy: number, repeated: boolean): void {
  // edges: e0 = b - a, e1 = c - b, e2 = a - c
  const e1x = cx - bx, e1y = cy - by;
  const l0 = len(bx, by);
  const l1 = len(e1x, e1y);
  const l2 = len(cx, cy);
  const cross = bx * cy - by * cx; // 2 × signed area
  const sa = 0.5 * cross;
  const A = Math.abs(sa);
  const P = l0 + l1 + l2;
  let lmin = l0, lmax = l0;
  if (l1 < lmin) lmin = l1; if (l1 > lmax) lmax = l1;
  if (l2 < lmin) lmin = l2; if (l2 > lmax) lmax = l2;
  g.signedArea[i] = sa;
  g.area[i] = A;
  g.perimeter[i] = P;
  g.minEdge[i] = lmin;
  g.maxEdge[i] = lmax;
  g.centroidX[i] = ox + (bx + cx) / 3;
  g.centroidY[i] = oy + (by + cy) / 3;
  // corner dot products: at a: e0·(−e2) = b·c; at b: (−e0)·e1; at c: (−e1)·e2... written out
  const da = bx * cx + by * cy;
  const db = -(bx * e1x + by * e1y);
  const dc = e1x * cx + e1y * cy; // (a - c)·(b - c) = (−c)·(−e1) = c·e1
  const twoA = 2 * A;
  // every corner angle is atan2(2A, its dot product), decreasing in the dot product: the
  // largest dot gives the smallest angle and the smallest dot the largest (two atan2, not three)
  const amin = angleDeg(twoA, Math.max(da, db, dc));
  const amax = angleDeg(twoA, Math.min(da, db, dc));
  const degenerate = repeated || !(A > DEGENERATE_AREA * lmax * lmax);
  if (degenerate) {
    g.inradius[i] = P > 0 ? twoA / P : 0;
    g.circumradius[i] = Infinity;
    setDegenerate(g, i, repeated, lmax > 0 ? twoA / lmax : 0, A > 0 ? amin : 0, A > 0 ? amax : 180, lmin, lmax);
    return;
  }
  const r = twoA / P;
  const R = (l0 * l1 * l2) / (4 * A);
  g.inradius[i] = r;
  g.circumradius[i] = R;
  g.minAltitude[i] = twoA / lmax;
  g.minAngle[i] = amin;
  g.maxAngle[i] = amax;
  g.radiusRatio[i] = R / (2 * r);
  g.aspectRatio[i] = (lmax * P) / (4 * SQRT3 * A);
  // scaled Jacobian: (2/√3) · min over corners of 2A / (product of the two adjacent edges)
  const pmax = Math.max(l0 * l2, l0 * l1, l1 * l2);
  g.scaledJacobian[i] = (2 / SQRT3) * (twoA / pmax);
  // condition: (|v1|² + |v2|² − v1·v2) / (2A·√3) with v1 = b − a, v2 = c − a
  g.condition[i] = (l0 * l0 + l2 * l2 - da) / (twoA * SQRT3);
  g.edgeRatio[i] = lmax / lmin;
}

/** Quad kernel. Vertices relative to the first node: (0,0), b, c, d. */
function quad(g: CellGeometry, i: number, ox: number, oy: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number, repeated: boolean): void {
  // edges e0 = b − a, e1 = c − b, e2 = d − c, e3 = a − d
  const e0x = bx, e0y = by;
  const e1x = cx - bx, e1y = cy - by;
  const e2x = dx - cx, e2y = dy - cy;
  const e3x = -dx, e3y = -dy;
  const l0 = len(e0x, e0y), l1 = len(e1x, e1y), l2 = len(e2x, e2y), l3 = len(e3x, e3y);
  // shoelace with a at the origin: 2A = b×c + c×d
  const sa = 0.5 * ((bx * cy - by * cx) + (cx * dy - cy * dx));
  const A = Math.abs(sa);
  const P = l0 + l1 + l2 + l3;
  const lmin = Math.min(l0, l1, l2, l3);
  const lmax = Math.max(l0, l1, l2, l3);
  g.signedArea[i] = sa;
  g.area[i] = A;
  g.perimeter[i] = P;
  g.minEdge[i] = lmin;
  g.maxEdge[i] = lmax;
  // area centroid (vertex mean when the area vanishes)
  if (A > 0) {
    const c1 = bx * cy - by * cx, c2 = cx * dy - cy * dx;
    g.centroidX[i] = ox + ((bx + cx) * c1 + (cx + dx) * c2) / (6 * sa);
    g.centroidY[i] = oy + ((by + cy) * c1 + (cy + dy) * c2) / (6 * sa);
  } else {
    g.centroidX[i] = ox + (bx + cx + dx) / 4;
    g.centroidY[i] = oy + (by + cy + dy) / 4;
  }
  // corner cross products in the quad's own orientation: α_k = e_{k−1} × e_k
  const s = sa < 0 ? -1 : 1;
  const a0 = s * (e3x * e0y - e3y * e0x);
  const a1 = s * (e0x * e1y - e0y * e1x);
  const a2 = s * (e1x * e2y - e1y * e2x);
  const a3 = s * (e2x * e3y - e2y * e3x);
  if (a0 < 0 || a1 < 0 || a2 < 0 || a3 < 0) g.flags[i] |= FLAG_NONCONVEX;
  // interior angles: at corner k between −e_{k−1} and e_k; reflex where α_k < 0
  const q0 = cornerAngle(e3x, e3y, e0x, e0y, a0), q1 = cornerAngle(e0x, e0y, e1x, e1y, a1);
  const q2 = cornerAngle(e1x, e1y, e2x, e2y, a2), q3 = cornerAngle(e2x, e2y, e3x, e3y, a3);
  const amin = Math.min(q0, q1, q2, q3), amax = Math.max(q0, q1, q2, q3);
  const degenerate = repeated || !(A > DEGENERATE_AREA * lmax * lmax);
  const twoA = 2 * A;
  g.inradius[i] = P > 0 ? twoA / P : 0;
  g.circumradius[i] = 0;
  if (degenerate) {
    setDegenerate(g, i, repeated, 0, lmin > 0 ? amin : 0, lmin > 0 ? amax : 180, lmin, lmax);
    return;
  }
  g.minAltitude[i] = twoA / lmax;
  g.minAngle[i] = amin;
  g.maxAngle[i] = amax;
  const m2 = cx * cx + cy * cy; // diagonal a–c
  const n2x = dx - bx, n2y = dy - by;
  const n2 = n2x * n2x + n2y * n2y; // diagonal b–d
  const h2 = Math.max(lmax * lmax, m2, n2);
  const amn = Math.min(Math.abs(a0), Math.abs(a1), Math.abs(a2), Math.abs(a3));
  const sumL2 = l0 * l0 + l1 * l1 + l2 * l2 + l3 * l3;
  g.radiusRatio[i] = amn > 0 ? Math.sqrt(sumL2 * h2) / (2 * SQRT2 * amn) : Infinity;
  g.aspectRatio[i] = (0.5 * lmax * P) / (Math.abs(a1) + Math.abs(a3));
  g.scaledJacobian[i] = Math.min(cornerJacobian(a0, l0, l3), cornerJacobian(a1, l1, l0), cornerJacobian(a2, l2, l1), cornerJacobian(a3, l3, l2));
  const cond = Math.max(
    cornerCondition(a0, l0, l3), cornerCondition(a1, l1, l0), cornerCondition(a2, l2, l1), cornerCondition(a3, l3, l2));
  g.condition[i] = cond / 2;
  g.edgeRatio[i] = lmax / lmin;
}

/** True when a cell uses one node twice; `d` is the fourth node of a quad, -1 for a triangle. */
function repeatsNode(a: number, b: number, c: number, d: number): boolean {
  return a === b || a === c || b === c || (d >= 0 && (a === d || b === d || c === d));
}

/** Compute geometry for every cell of the mesh, then mark inverted cells. */
export function computeGeometry(mesh: Mesh, g: CellGeometry = allocGeometry(mesh.nCells), coords: CoordinateSystem = 'planar'): CellGeometry {
  if (coords === 'geographic') computeGeographicRange(mesh, g, 0, mesh.nCells);
  else computeCellRange(mesh, g, 0, mesh.nCells);
  markInverted(g);
  return g;
}

/**
 * The per-cell kernels for cells [from, to): independent per cell, so ranges may run in
 * parallel; `markInverted` must follow once every range is done.
 */
export function computeCellRange(mesh: Mesh, g: CellGeometry, from: number, to: number): void {
  const pts = mesh.points;
  const off = mesh.cellOffsets;
  const nodes = mesh.cellNodes;
  const types = mesh.cellTypes;
  for (let i = from; i < to; i++) {
    const s = off[i]!;
    const na = nodes[s]!, nb = nodes[s + 1]!, nc = nodes[s + 2]!;
    const ox = pts[2 * na]!, oy = pts[2 * na + 1]!;
    const bx = pts[2 * nb]! - ox, by = pts[2 * nb + 1]! - oy;
    const cx = pts[2 * nc]! - ox, cy = pts[2 * nc + 1]! - oy;
    g.flags[i] = 0;
    if (types[i] === QUAD) {
      const nd = nodes[s + 3]!;
      const dx = pts[2 * nd]! - ox, dy = pts[2 * nd + 1]! - oy;
      quad(g, i, ox, oy, bx, by, cx, cy, dx, dy, repeatsNode(na, nb, nc, nd));
    } else {
      triangle(g, i, ox, oy, bx, by, cx, cy, repeatsNode(na, nb, nc, -1));
    }
  }
}

/**
 * Longitude/latitude cells: each projected onto the plane tangent at its vertex mean
 * (src/geometry/geographic.ts); lengths in metres, areas in m², centroids back in degrees.
 */
export function computeGeographicRange(mesh: Mesh, g: CellGeometry, from: number, to: number): void {
  const pts = mesh.points;
  const off = mesh.cellOffsets;
  const nodes = mesh.cellNodes;
  const types = mesh.cellTypes;
  for (let i = from; i < to; i++) {
    const s = off[i]!;
    const quadCell = types[i] === QUAD;
    const na = nodes[s]!, nb = nodes[s + 1]!, nc = nodes[s + 2]!, nd = quadCell ? nodes[s + 3]! : na;
    const lonA = pts[2 * na]!;
    const k = quadCell ? 4 : 3;
    const lon0 = lonA + (wrapLongitude(pts[2 * nb]! - lonA) + wrapLongitude(pts[2 * nc]! - lonA) + (quadCell ? wrapLongitude(pts[2 * nd]! - lonA) : 0)) / k;
    const lat0 = (pts[2 * na + 1]! + pts[2 * nb + 1]! + pts[2 * nc + 1]! + (quadCell ? pts[2 * nd + 1]! : 0)) / k;
    const s0 = Math.sin(lat0 * DEG);
    orthographic(lonA, pts[2 * na + 1]!, lon0, lat0, s0);
    const ax = projected.x, ay = projected.y;
    orthographic(pts[2 * nb]!, pts[2 * nb + 1]!, lon0, lat0, s0);
    const bx = projected.x - ax, by = projected.y - ay;
    orthographic(pts[2 * nc]!, pts[2 * nc + 1]!, lon0, lat0, s0);
    const cx = projected.x - ax, cy = projected.y - ay;
    g.flags[i] = 0;
    if (quadCell) {
      orthographic(pts[2 * nd]!, pts[2 * nd + 1]!, lon0, lat0, s0);
      quad(g, i, ax, ay, bx, by, cx, cy, projected.x - ax, projected.y - ay, repeatsNode(na, nb, nc, nd));
    } else {
      triangle(g, i, ax, ay, bx, by, cx, cy, repeatsNode(na, nb, nc, -1));
    }
    inverseOrthographic(g.centroidX[i]!, g.centroidY[i]!, lon0, lat0);
    g.centroidX[i] = projected.x;
    g.centroidY[i] = projected.y;
  }
}

/** Inverted = orientation opposite to the majority of non-degenerate cells. */
export function markInverted(g: CellGeometry): void {
  const n = g.flags.length;
  let pos = 0, neg = 0;
  for (let i = 0; i < n; i++) {
    if (g.flags[i]! & FLAG_DEGENERATE) continue;
    if (g.signedArea[i]! > 0) pos++; else neg++;
  }
  const orient = neg > pos ? -1 : 1;
  g.orientation = orient;
  for (let i = 0; i < n; i++) {
    if (g.flags[i]! & FLAG_DEGENERATE) continue;
    if (g.signedArea[i]! * orient < 0) g.flags[i] |= FLAG_INVERTED;
  }
}
