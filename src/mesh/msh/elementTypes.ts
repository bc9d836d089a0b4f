/**
 * MSH element type ids: node count and the VTK id the shared cell filter understands.
 * Higher-order triangles and quads map to VTK cells of the same shape so that their corners
 * are kept; every 3-D kind maps to its linear VTK id so the 2-D-only error counts by kind.
 * Node counts follow the element names of the Gmsh reference manual (e.g. "15-node
 * fourth-order triangle").
 */

const VERTEX = 1;
const LINE = 3;
const QUADRATIC_EDGE = 21;
const LAGRANGE_CURVE = 68;
const TRIANGLE = 5;
const QUADRATIC_TRIANGLE = 22;
const LAGRANGE_TRIANGLE = 69;
const QUAD = 9;
const QUADRATIC_QUAD = 23;
const BIQUADRATIC_QUAD = 28;
const LAGRANGE_QUAD = 70;
const TETRA = 10;
const HEXAHEDRON = 12;
const WEDGE = 13;
const PYRAMID = 14;

/** [VTK id, then pairs of MSH type id and node count]. */
const GROUPS: number[][] = [
  [VERTEX, 15, 1],
  [LINE, 1, 2],
  [QUADRATIC_EDGE, 8, 3],
  [LAGRANGE_CURVE, 26, 4, 27, 5, 28, 6, 62, 7, 63, 8, 64, 9, 65, 10, 66, 11],
  [TRIANGLE, 2, 3],
  [QUADRATIC_TRIANGLE, 9, 6],
  [LAGRANGE_TRIANGLE, 20, 9, 21, 10, 22, 12, 23, 15, 24, 15, 25, 21, 42, 28, 43, 36, 44, 45, 45, 55, 46, 66,
    52, 18, 53, 21, 54, 24, 55, 27, 56, 30],
  [QUAD, 3, 4],
  [QUADRATIC_QUAD, 16, 8],
  [BIQUADRATIC_QUAD, 10, 9],
  [LAGRANGE_QUAD, 36, 16, 37, 25, 38, 36, 39, 12, 40, 16, 41, 20, 47, 49, 48, 64, 49, 81, 50, 100, 51, 121,
    57, 24, 58, 28, 59, 32, 60, 36, 61, 40],
  [TETRA, 4, 4, 11, 10, 29, 20, 30, 35, 31, 56, 32, 22, 33, 28, 71, 84, 72, 120, 73, 165, 74, 220, 75, 286,
    79, 34, 80, 40, 81, 46, 82, 52, 83, 58, 137, 16],
  [HEXAHEDRON, 5, 8, 12, 27, 17, 20, 92, 64, 93, 125, 94, 216, 95, 343, 96, 512, 97, 729, 98, 1000,
    99, 32, 100, 44, 101, 56, 102, 68, 103, 80, 104, 92, 105, 104],
  [WEDGE, 6, 6, 13, 18, 18, 15, 90, 40, 91, 75, 106, 126, 107, 196, 108, 288, 109, 405, 110, 550,
    111, 24, 112, 33, 113, 42, 114, 51, 115, 60, 116, 69, 117, 78],
  [PYRAMID, 7, 5, 14, 14, 19, 13, 118, 30, 119, 55, 120, 91, 121, 140, 122, 204, 123, 285, 124, 385,
    125, 21, 126, 29, 127, 37, 128, 45, 129, 53, 130, 61, 131, 69],
];

const MAX_TYPE = 140;

/** Node count per MSH type id (0 = unknown id). */
export const MSH_NODES = new Int16Array(MAX_TYPE + 1);
/** VTK cell type id per MSH type id. */
export const MSH_VTK = new Uint8Array(MAX_TYPE + 1);
/** 0 = skipped (points, lines), 2 = triangle or quad, 3 = volume. */
export const MSH_DIM = new Uint8Array(MAX_TYPE + 1);

function dimOf(vtk: number): number {
  if (vtk === VERTEX || vtk === LINE || vtk === QUADRATIC_EDGE || vtk === LAGRANGE_CURVE) return 0;
  if (vtk === TETRA || vtk === HEXAHEDRON || vtk === WEDGE || vtk === PYRAMID) return 3;
  return 2;
}

for (const g of GROUPS) {
  const vtk = g[0]!;
  for (let i = 1; i < g.length; i += 2) {
    MSH_NODES[g[i]!] = g[i + 1]!;
    MSH_VTK[g[i]!] = vtk;
    MSH_DIM[g[i]!] = dimOf(vtk);
  }
}

/** Node count of an MSH element type, or 0 when the id is unknown. */
export function mshNodeCount(type: number): number {
  return type >= 0 && type <= MAX_TYPE && Number.isInteger(type) ? MSH_NODES[type]! : 0;
}
