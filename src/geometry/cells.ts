/**
 * Per-cell geometry and quality, float64: core arrays (the step limit's) and shape measures,
 * each by its own kernels over a range of cells.
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
  radiusRatio: Float64Array;
  flags: Uint8Array;
  /** Orientation of the majority of non-degenerate cells: 1 (counter-clockwise) or -1. */
  orientation: number;
  // the shape measures below: computed with the rest (computeGeometry) or on first use (deferGeometry)
  /** Circumradius of triangles; 0 for quads (not defined). */
  circumradius: Float64Array;
  /** 2A / longest edge. */
  minAltitude: Float64Array;
  minEdge: Float64Array;
  maxEdge: Float64Array;
  /** Degrees. */
  minAngle: Float64Array;
  maxAngle: Float64Array;
  aspectRatio: Float64Array;
  scaledJacobian: Float64Array;
  condition: Float64Array;
  edgeRatio: Float64Array;
  centroidX: Float64Array;
  centroidY: Float64Array;
  /**
   * Set when the shape measures are computed on first use (deferGeometry): the mesh and
   * coordinates they come from, and whether they have been computed yet. Writers that go cell
   * block by cell block (the CSV) compute them per block instead of all at once.
   */
  deferred?: DeferredShape;
}

export interface DeferredShape {
  mesh: Mesh;
  coords: CoordinateSystem;
  computed: boolean;
}

/** The arrays every audit needs: the step limit, the causes and the inverted check. */
export const CORE_FIELDS = ['signedArea', 'area', 'perimeter', 'inradius', 'radiusRatio'] as const;
/** The shape measures: for tables, exports and the view. */
export const SHAPE_FIELDS = [
  'circumradius', 'minAltitude', 'minEdge', 'maxEdge', 'minAngle', 'maxAngle', 'aspectRatio',
  'scaledJacobian', 'condition', 'edgeRatio', 'centroidX', 'centroidY',
] as const;
export type CoreField = (typeof CORE_FIELDS)[number];
export type ShapeField = (typeof SHAPE_FIELDS)[number];
/** The core arrays and flags, written by the core kernels. */
export type CoreGeometry = Pick<CellGeometry, CoreField | 'flags' | 'orientation'>;
/** The shape arrays, written by the shape kernels. */
export type ShapeGeometry = Pick<CellGeometry, ShapeField>;

const SQRT3 = Math.sqrt(3);
const SQRT2 = Math.SQRT2;

export function allocCore(n: number, make: (n: number) => Float64Array = (m) => new Float64Array(m), flags: Uint8Array = new Uint8Array(n)): CoreGeometry {
  return { signedArea: make(n), area: make(n), perimeter: make(n), inradius: make(n), radiusRatio: make(n), flags, orientation: 1 };
}

export function allocShape(n: number): ShapeGeometry {
  const f = () => new Float64Array(n);
  return {
    circumradius: f(), minAltitude: f(), minEdge: f(), maxEdge: f(), minAngle: f(), maxAngle: f(), aspectRatio: f(),
    scaledJacobian: f(), condition: f(), edgeRatio: f(), centroidX: f(), centroidY: f(),
  };
}

export function allocGeometry(n: number): CellGeometry {
  return { ...allocCore(n), ...allocShape(n) };
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

// The kernels. Vertices are relative to the cell's first node: (0,0), b, c (and d for a quad);
// (ox, oy) is the first node itself. The core kernels write the step-limit arrays and the flags,
// the shape kernels the shape measures; both derive the degenerate test from the same lengths.

/** Triangle core. Edges e0 = b − a, e1 = c − b, e2 = a − c. */
function triangleCore(g: CoreGeometry, i: number, bx: number, by: number, cx: number, cy: number, repeated: boolean): void {
  const l0 = len(bx, by);
  const l1 = len(cx - bx, cy - by);
  const l2 = len(cx, cy);
  const sa = 0.5 * (bx * cy - by * cx);
  const A = Math.abs(sa);
  const P = l0 + l1 + l2;
  const lmax = Math.max(l0, l1, l2);
  const twoA = 2 * A;
  g.signedArea[i] = sa;
  g.area[i] = A;
  g.perimeter[i] = P;
  if (repeated || !(A > DEGENERATE_AREA * lmax * lmax)) {
    g.inradius[i] = P > 0 ? twoA / P : 0;
    g.radiusRatio[i] = Infinity;
    g.flags[i] = FLAG_DEGENERATE | (repeated ? FLAG_REPEATED_NODE : 0);
    return;
  }
  const r = twoA / P;
  g.inradius[i] = r;
  g.radiusRatio[i] = (l0 * l1 * l2) / (4 * A) / (2 * r);
  g.flags[i] = 0;
}

/** Shape measures of a degenerate cell: at their worst, never NaN. */
function setDegenerateShape(g: ShapeGeometry, i: number, altitude: number, amin: number, amax: number, lmin: number, lmax: number): void {
  g.minAltitude[i] = altitude;
  g.minAngle[i] = amin;
  g.maxAngle[i] = amax;
  g.aspectRatio[i] = Infinity;
  g.scaledJacobian[i] = 0;
  g.condition[i] = Infinity;
  g.edgeRatio[i] = lmin > 0 ? lmax / lmin : Infinity;
}

/** Triangle shape measures. */
function triangleShape(g: ShapeGeometry, i: number, ox: number, oy: number, bx: number, by: number, cx: number, cy: number, repeated: boolean): void {
  const e1x = cx - bx, e1y = cy - by;
  const l0 = len(bx, by);
  const l1 = len(e1x, e1y);
  const l2 = len(cx, cy);
  const A = Math.abs(0.5 * (bx * cy - by * cx));
  const P = l0 + l1 + l2;
  const lmin = Math.min(l0, l1, l2);
  const lmax = Math.max(l0, l1, l2);
  g.minEdge[i] = lmin;
  g.maxEdge[i] = lmax;
  g.centroidX[i] = ox + (bx + cx) / 3;
  g.centroidY[i] = oy + (by + cy) / 3;
  // corner dot products: at a, (b − a)·(c − a) = b·c; at b, (a − b)·(c − b); at c, (a − c)·(b − c)
  const da = bx * cx + by * cy;
  const db = -(bx * e1x + by * e1y);
  const dc = e1x * cx + e1y * cy;
  const twoA = 2 * A;
  // every corner angle is atan2(2A, its dot product), decreasing in the dot product: the
  // largest dot gives the smallest angle and the smallest dot the largest (two atan2, not three)
  const amin = angleDeg(twoA, Math.max(da, db, dc));
  const amax = angleDeg(twoA, Math.min(da, db, dc));
  if (repeated || !(A > DEGENERATE_AREA * lmax * lmax)) {
    g.circumradius[i] = Infinity;
    setDegenerateShape(g, i, lmax > 0 ? twoA / lmax : 0, A > 0 ? amin : 0, A > 0 ? amax : 180, lmin, lmax);
    return;
  }
  g.circumradius[i] = (l0 * l1 * l2) / (4 * A);
  g.minAltitude[i] = twoA / lmax;
  g.minAngle[i] = amin;
  g.maxAngle[i] = amax;
  g.aspectRatio[i] = (lmax * P) / (4 * SQRT3 * A);
  // scaled Jacobian: (2/√3) · min over corners of 2A / (product of the two adjacent edges)
  const pmax = Math.max(l0 * l2, l0 * l1, l1 * l2);
  g.scaledJacobian[i] = (2 / SQRT3) * (twoA / pmax);
  // condition: (|v1|² + |v2|² − v1·v2) / (2A·√3) with v1 = b − a, v2 = c − a
  g.condition[i] = (l0 * l0 + l2 * l2 - da) / (twoA * SQRT3);
  g.edgeRatio[i] = lmax / lmin;
}

/**
 * What both quad kernels start from (module scratch, no allocation per cell): edges
 * e0 = b − a, e1 = c − b, e2 = d − c, e3 = a − d, their lengths, the signed area, and the
 * corner cross products α_k = e_{k−1} × e_k in the quad's own orientation.
 */
const qf = {
  e1x: 0, e1y: 0, e2x: 0, e2y: 0, e3x: 0, e3y: 0, l0: 0, l1: 0, l2: 0, l3: 0,
  sa: 0, A: 0, P: 0, lmax: 0, a0: 0, a1: 0, a2: 0, a3: 0,
};

function quadFrame(bx: number, by: number, cx: number, cy: number, dx: number, dy: number): void {
  const e1x = cx - bx, e1y = cy - by;
  const e2x = dx - cx, e2y = dy - cy;
  const e3x = -dx, e3y = -dy;
  const l0 = len(bx, by), l1 = len(e1x, e1y), l2 = len(e2x, e2y), l3 = len(e3x, e3y);
  // shoelace with a at the origin: 2A = b×c + c×d
  const sa = 0.5 * ((bx * cy - by * cx) + (cx * dy - cy * dx));
  const s = sa < 0 ? -1 : 1;
  qf.e1x = e1x; qf.e1y = e1y; qf.e2x = e2x; qf.e2y = e2y; qf.e3x = e3x; qf.e3y = e3y;
  qf.l0 = l0; qf.l1 = l1; qf.l2 = l2; qf.l3 = l3;
  qf.sa = sa;
  qf.A = Math.abs(sa);
  qf.P = l0 + l1 + l2 + l3;
  qf.lmax = Math.max(l0, l1, l2, l3);
  qf.a0 = s * (e3x * by - e3y * bx);
  qf.a1 = s * (bx * e1y - by * e1x);
  qf.a2 = s * (e1x * e2y - e1y * e2x);
  qf.a3 = s * (e2x * e3y - e2y * e3x);
}

/** Quad core. */
function quadCore(g: CoreGeometry, i: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number, repeated: boolean): void {
  quadFrame(bx, by, cx, cy, dx, dy);
  const { l0, l1, l2, l3, sa, A, P, lmax, a0, a1, a2, a3 } = qf;
  const f = a0 < 0 || a1 < 0 || a2 < 0 || a3 < 0 ? FLAG_NONCONVEX : 0;
  g.signedArea[i] = sa;
  g.area[i] = A;
  g.perimeter[i] = P;
  g.inradius[i] = P > 0 ? (2 * A) / P : 0;
  if (repeated || !(A > DEGENERATE_AREA * lmax * lmax)) {
    g.radiusRatio[i] = Infinity;
    g.flags[i] = f | FLAG_DEGENERATE | (repeated ? FLAG_REPEATED_NODE : 0);
    return;
  }
  const m2 = cx * cx + cy * cy; // diagonal a–c
  const n2x = dx - bx, n2y = dy - by;
  const n2 = n2x * n2x + n2y * n2y; // diagonal b–d
  const h2 = Math.max(lmax * lmax, m2, n2);
  const amn = Math.min(Math.abs(a0), Math.abs(a1), Math.abs(a2), Math.abs(a3));
  const sumL2 = l0 * l0 + l1 * l1 + l2 * l2 + l3 * l3;
  g.radiusRatio[i] = amn > 0 ? Math.sqrt(sumL2 * h2) / (2 * SQRT2 * amn) : Infinity;
  g.flags[i] = f;
}

/** Quad shape measures. */
function quadShape(g: ShapeGeometry, i: number, ox: number, oy: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number, repeated: boolean): void {
  quadFrame(bx, by, cx, cy, dx, dy);
  const { e1x, e1y, e2x, e2y, e3x, e3y, l0, l1, l2, l3, sa, A, P, lmax, a0, a1, a2, a3 } = qf;
  const e0x = bx, e0y = by;
  const lmin = Math.min(l0, l1, l2, l3);
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
  // interior angles: at corner k between −e_{k−1} and e_k; reflex where α_k < 0
  const q0 = cornerAngle(e3x, e3y, e0x, e0y, a0), q1 = cornerAngle(e0x, e0y, e1x, e1y, a1);
  const q2 = cornerAngle(e1x, e1y, e2x, e2y, a2), q3 = cornerAngle(e2x, e2y, e3x, e3y, a3);
  const amin = Math.min(q0, q1, q2, q3), amax = Math.max(q0, q1, q2, q3);
  g.circumradius[i] = 0;
  if (repeated || !(A > DEGENERATE_AREA * lmax * lmax)) {
    setDegenerateShape(g, i, 0, lmin > 0 ? amin : 0, lmin > 0 ? amax : 180, lmin, lmax);
    return;
  }
  const twoA = 2 * A;
  g.minAltitude[i] = twoA / lmax;
  g.minAngle[i] = amin;
  g.maxAngle[i] = amax;
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

/**
 * A cell's vertices as the kernels take them (module scratch, no allocation per cell): the first
 * node (ox, oy), the others relative to it; for geographic cells, projected onto the plane
 * tangent at the cell's vertex mean (lon0, lat0) (src/geometry/geographic.ts), lengths in metres.
 */
const v = { ox: 0, oy: 0, bx: 0, by: 0, cx: 0, cy: 0, dx: 0, dy: 0, lon0: 0, lat0: 0, repeated: false };

/** Load cell i's vertices into `v`; returns true for a quad. */
function loadCell(mesh: Mesh, i: number, geographic: boolean): boolean {
  const pts = mesh.points;
  const nodes = mesh.cellNodes;
  const s = mesh.cellOffsets[i]!;
  const isQuad = mesh.cellTypes[i] === QUAD;
  const na = nodes[s]!, nb = nodes[s + 1]!, nc = nodes[s + 2]!, nd = isQuad ? nodes[s + 3]! : -1;
  v.repeated = repeatsNode(na, nb, nc, nd);
  if (!geographic) {
    const ox = pts[2 * na]!, oy = pts[2 * na + 1]!;
    v.ox = ox; v.oy = oy;
    v.bx = pts[2 * nb]! - ox; v.by = pts[2 * nb + 1]! - oy;
    v.cx = pts[2 * nc]! - ox; v.cy = pts[2 * nc + 1]! - oy;
    if (isQuad) { v.dx = pts[2 * nd]! - ox; v.dy = pts[2 * nd + 1]! - oy; }
    return isQuad;
  }
  const lonA = pts[2 * na]!;
  const k = isQuad ? 4 : 3;
  const lon0 = lonA + (wrapLongitude(pts[2 * nb]! - lonA) + wrapLongitude(pts[2 * nc]! - lonA) + (isQuad ? wrapLongitude(pts[2 * nd]! - lonA) : 0)) / k;
  const lat0 = (pts[2 * na + 1]! + pts[2 * nb + 1]! + pts[2 * nc + 1]! + (isQuad ? pts[2 * nd + 1]! : 0)) / k;
  const s0 = Math.sin(lat0 * DEG);
  v.lon0 = lon0; v.lat0 = lat0;
  orthographic(lonA, pts[2 * na + 1]!, lon0, lat0, s0);
  const ax = projected.x, ay = projected.y;
  v.ox = ax; v.oy = ay;
  orthographic(pts[2 * nb]!, pts[2 * nb + 1]!, lon0, lat0, s0);
  v.bx = projected.x - ax; v.by = projected.y - ay;
  orthographic(pts[2 * nc]!, pts[2 * nc + 1]!, lon0, lat0, s0);
  v.cx = projected.x - ax; v.cy = projected.y - ay;
  if (isQuad) {
    orthographic(pts[2 * nd]!, pts[2 * nd + 1]!, lon0, lat0, s0);
    v.dx = projected.x - ax; v.dy = projected.y - ay;
  }
  return isQuad;
}

/**
 * The core kernels for cells [from, to) into g (at the same index): independent per cell, so
 * ranges may run in parallel; `markInverted` must follow once every range is done.
 */
export function coreRange(mesh: Mesh, g: CoreGeometry, from: number, to: number, coords: CoordinateSystem = 'planar'): void {
  if (coords !== 'geographic') { planarCoreRange(mesh, g, from, to); return; }
  for (let i = from; i < to; i++) {
    if (loadCell(mesh, i, true)) quadCore(g, i, v.bx, v.by, v.cx, v.cy, v.dx, v.dy, v.repeated);
    else triangleCore(g, i, v.bx, v.by, v.cx, v.cy, v.repeated);
  }
}

/** coreRange for planar coordinates, the hot loop written out. */
function planarCoreRange(mesh: Mesh, g: CoreGeometry, from: number, to: number): void {
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
    if (types[i] === QUAD) {
      const nd = nodes[s + 3]!;
      quadCore(g, i, bx, by, cx, cy, pts[2 * nd]! - ox, pts[2 * nd + 1]! - oy, repeatsNode(na, nb, nc, nd));
    } else {
      triangleCore(g, i, bx, by, cx, cy, repeatsNode(na, nb, nc, -1));
    }
  }
}

/**
 * The shape kernels for cells [from, to), cell i written at index i − base of g (base = from
 * fills a block-sized scratch); centroids of geographic cells are in degrees.
 */
export function shapeRange(mesh: Mesh, g: ShapeGeometry, from: number, to: number, coords: CoordinateSystem = 'planar', base = 0): void {
  const geographic = coords === 'geographic';
  for (let i = from; i < to; i++) {
    const j = i - base;
    if (loadCell(mesh, i, geographic)) quadShape(g, j, v.ox, v.oy, v.bx, v.by, v.cx, v.cy, v.dx, v.dy, v.repeated);
    else triangleShape(g, j, v.ox, v.oy, v.bx, v.by, v.cx, v.cy, v.repeated);
    if (geographic) {
      inverseOrthographic(g.centroidX[j]!, g.centroidY[j]!, v.lon0, v.lat0);
      g.centroidX[j] = projected.x;
      g.centroidY[j] = projected.y;
    }
  }
}

/** Every kernel for cells [from, to) of a planar mesh (see coreRange). */
export function computeCellRange(mesh: Mesh, g: CellGeometry, from: number, to: number): void {
  coreRange(mesh, g, from, to, 'planar');
  shapeRange(mesh, g, from, to, 'planar');
}

/**
 * Every kernel for cells [from, to) of a longitude/latitude mesh: each cell projected onto the
 * plane tangent at its vertex mean; lengths in metres, areas in m², centroids in degrees.
 */
export function computeGeographicRange(mesh: Mesh, g: CellGeometry, from: number, to: number): void {
  coreRange(mesh, g, from, to, 'geographic');
  shapeRange(mesh, g, from, to, 'geographic');
}

/** Compute geometry for every cell of the mesh, then mark inverted cells. */
export function computeGeometry(mesh: Mesh, g: CellGeometry = allocGeometry(mesh.nCells), coords: CoordinateSystem = 'planar'): CellGeometry {
  coreRange(mesh, g, 0, mesh.nCells, coords);
  shapeRange(mesh, g, 0, mesh.nCells, coords);
  markInverted(g);
  return g;
}

/**
 * A geometry whose core arrays are given (computed by coreRange, inverted cells marked) and whose
 * shape measures are computed for every cell on first use of any of them. The values equal
 * computeGeometry's bit for bit: the same kernels run. `mesh` must have the points the core was
 * computed from (scaled to metres).
 */
export function deferGeometry(mesh: Mesh, core: CoreGeometry, coords: CoordinateSystem = 'planar'): CellGeometry {
  const deferred: DeferredShape = { mesh, coords, computed: false };
  let shape: ShapeGeometry | null = null;
  const fill = (): ShapeGeometry => {
    if (!shape) {
      shape = allocShape(mesh.nCells);
      shapeRange(mesh, shape, 0, mesh.nCells, coords);
      deferred.computed = true;
    }
    return shape;
  };
  const g = { ...core, deferred } as CellGeometry;
  for (const key of SHAPE_FIELDS) Object.defineProperty(g, key, { get: () => fill()[key], enumerable: true });
  return g;
}

/** The shape measures of one cell (a one-cell scratch; for the few cells a report lists). */
export function cellShape(mesh: Mesh, i: number, coords: CoordinateSystem = 'planar'): { [K in ShapeField]: number } {
  const one = allocShape(1);
  shapeRange(mesh, one, i, i + 1, coords, i);
  const out = {} as { [K in ShapeField]: number };
  for (const key of SHAPE_FIELDS) out[key] = one[key][0]!;
  return out;
}

/** Inverted = orientation opposite to the majority of non-degenerate cells. */
export function markInverted(g: CoreGeometry): void {
  const flags = g.flags, sa = g.signedArea;
  const n = flags.length;
  let pos = 0, neg = 0;
  for (let i = 0; i < n; i++) {
    if (flags[i]! & FLAG_DEGENERATE) continue;
    if (sa[i]! > 0) pos++; else neg++;
  }
  const orient = neg > pos ? -1 : 1;
  g.orientation = orient;
  // every non-degenerate cell turns the majority's way: none to mark
  if ((orient === 1 ? neg : pos) === 0) return;
  for (let i = 0; i < n; i++) {
    if (flags[i]! & FLAG_DEGENERATE) continue;
    if (sa[i]! * orient < 0) flags[i] |= FLAG_INVERTED;
  }
}

/**
 * The shape measures of cell i of g: read from its arrays when they exist, else computed for that
 * cell alone (a deferred geometry whose measures are not computed yet stays so).
 */
export function shapeAt(g: CellGeometry, i: number): { [K in ShapeField]: number } {
  if (g.deferred && !g.deferred.computed) return cellShape(g.deferred.mesh, i, g.deferred.coords);
  const out = {} as { [K in ShapeField]: number };
  for (const key of SHAPE_FIELDS) out[key] = g[key][i]!;
  return out;
}

/** The centroid of cell i (see shapeAt). */
export function centroidOf(g: CellGeometry, i: number): [number, number] {
  const s = shapeAt(g, i);
  return [s.centroidX, s.centroidY];
}

/** The core arrays of every cell now, the shape measures on first use (deferGeometry). */
export function computeCoreGeometry(mesh: Mesh, coords: CoordinateSystem = 'planar'): CellGeometry {
  const core = allocCore(mesh.nCells);
  coreRange(mesh, core, 0, mesh.nCells, coords);
  markInverted(core);
  return deferGeometry(mesh, core, coords);
}
