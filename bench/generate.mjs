/**
 * Deterministic benchmark meshes: a jittered structured triangulation of an invented tidal
 * basin (optionally with a band of quads), a point velocity field with a fast jet through its
 * mouth, and a legacy ASCII VTK writer. Everything from a seeded generator, so every run
 * measures the same bytes.
 */
import { TRIANGLE, QUAD } from '../dist/mesh/model.js';

/** A seeded generator: xorshift32 (Marsaglia 2003) stepped from the seed; uniform in [0, 1). */
export function rng(seed) {
  let x = (seed * 2654435761) >>> 0 || 1;
  return () => {
    x ^= x << 13;
    x ^= x >>> 17;
    x ^= x << 5;
    x >>>= 0;
    return x / 4294967296;
  };
}

/** Grid size (nx × ny squares) giving about `cells` cells when a fraction `quads` of rows are quads. */
function gridFor(cells, quads) {
  // each row of triangles holds 2·nx cells, each row of quads nx
  const perSquare = 2 - quads;
  const squares = cells / perSquare;
  const nx = Math.max(2, Math.round(Math.sqrt(squares * 2)));
  const ny = Math.max(2, Math.round(squares / nx));
  return { nx, ny };
}

/**
 * A basin of nx × ny squares (side 10 m, in projected coordinates around 4.2e5, 5.1e6), nodes
 * jittered by up to a quarter side; the lowest `quads` fraction of rows stays quads, the rest is
 * split into triangles along alternating diagonals.
 */
export function basinMesh({ cells, quads = 0, seed = 1 }) {
  const { nx, ny } = gridFor(cells, quads);
  const d = 10;
  const x0 = 420000, y0 = 5100000;
  const next = rng(seed);
  const nPoints = (nx + 1) * (ny + 1);
  const points = new Float64Array(2 * nPoints);
  const velocity = new Float64Array(3 * nPoints);
  const W = nx * d, H = ny * d;
  for (let j = 0, k = 0; j <= ny; j++) {
    for (let i = 0; i <= nx; i++, k++) {
      const inner = i > 0 && i < nx && j > 0 && j < ny;
      const x = i * d + (inner ? (next() - 0.5) * 0.5 * d : 0);
      const y = j * d + (inner ? (next() - 0.5) * 0.5 * d : 0);
      points[2 * k] = x0 + x;
      points[2 * k + 1] = y0 + y;
      // a slow gyre plus a fast jet through the mouth at the middle of the north side
      const s = (x / W - 0.5) ** 2 / 0.002 + (y / H - 1) ** 2 / 0.02;
      velocity[3 * k] = 0.3 * Math.sin(Math.PI * y / H) + 0.2 * next();
      velocity[3 * k + 1] = -0.3 * Math.sin(Math.PI * x / W) - 2.5 * Math.exp(-s);
    }
  }
  const quadRows = Math.round(ny * quads);
  const nCells = quadRows * nx + (ny - quadRows) * nx * 2;
  const cellTypes = new Uint8Array(nCells);
  const cellOffsets = new Int32Array(nCells + 1);
  const nNodes = quadRows * nx * 4 + (ny - quadRows) * nx * 6;
  const cellNodes = new Int32Array(nNodes);
  let c = 0, p = 0;
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const a = j * (nx + 1) + i, b = a + 1, e = a + nx + 1, f = e + 1;
      if (j < quadRows) {
        cellNodes.set([a, b, f, e], p); p += 4;
        cellTypes[c++] = QUAD; cellOffsets[c] = p;
      } else if ((i + j) % 2 === 0) {
        cellNodes.set([a, b, f], p); p += 3; cellTypes[c++] = TRIANGLE; cellOffsets[c] = p;
        cellNodes.set([a, f, e], p); p += 3; cellTypes[c++] = TRIANGLE; cellOffsets[c] = p;
      } else {
        cellNodes.set([a, b, e], p); p += 3; cellTypes[c++] = TRIANGLE; cellOffsets[c] = p;
        cellNodes.set([b, f, e], p); p += 3; cellTypes[c++] = TRIANGLE; cellOffsets[c] = p;
      }
    }
  }
  return {
    points, nPoints, cellOffsets, cellNodes, cellTypes, nCells,
    pointData: [{ name: 'velocity', components: 3, values: velocity }],
    cellData: [], format: 'bench', warnings: [],
  };
}

const enc = new TextEncoder();

/** Shortest round-trip text of a double, the way a general-purpose writer prints it. */
function fmt(v) {
  return String(v);
}

/** Legacy VTK 4.2 ASCII text of a mesh, in chunks written through `write(bytes)`. */
export function writeLegacyAscii(mesh, write) {
  const { nPoints, nCells } = mesh;
  let s = `# vtk DataFile Version 4.2\nsteplens bench basin\nASCII\nDATASET UNSTRUCTURED_GRID\nPOINTS ${nPoints} double\n`;
  const flush = (force) => {
    if (force || s.length > 2 ** 20) { write(enc.encode(s)); s = ''; }
  };
  const pts = mesh.points;
  for (let i = 0; i < nPoints; i++) { s += fmt(pts[2 * i]) + ' ' + fmt(pts[2 * i + 1]) + ' 0\n'; flush(false); }
  const size = nCells + mesh.cellOffsets[nCells];
  s += `CELLS ${nCells} ${size}\n`;
  for (let c = 0; c < nCells; c++) {
    const a = mesh.cellOffsets[c], b = mesh.cellOffsets[c + 1];
    s += String(b - a);
    for (let k = a; k < b; k++) s += ' ' + mesh.cellNodes[k];
    s += '\n';
    flush(false);
  }
  s += `CELL_TYPES ${nCells}\n`;
  for (let c = 0; c < nCells; c++) { s += mesh.cellTypes[c] + '\n'; flush(false); }
  s += `POINT_DATA ${nPoints}\n`;
  for (const a of mesh.pointData) {
    s += `VECTORS ${a.name} double\n`;
    const v = a.values;
    for (let i = 0; i < nPoints; i++) { s += fmt(v[3 * i]) + ' ' + fmt(v[3 * i + 1]) + ' ' + fmt(v[3 * i + 2]) + '\n'; flush(false); }
  }
  flush(true);
}

/** Cells [from, to) of a mesh as a mesh of their own (points renumbered, point data carried). */
export function cellRange(mesh, from, to) {
  const map = new Int32Array(mesh.nPoints).fill(-1);
  const a = mesh.cellOffsets[from], b = mesh.cellOffsets[to];
  let nPoints = 0;
  const cellNodes = new Int32Array(b - a);
  for (let k = a; k < b; k++) {
    const v = mesh.cellNodes[k];
    if (map[v] < 0) map[v] = nPoints++;
    cellNodes[k - a] = map[v];
  }
  const points = new Float64Array(2 * nPoints);
  const pointData = mesh.pointData.map((d) => ({ ...d, values: new Float64Array(nPoints * d.components) }));
  for (let v = 0; v < mesh.nPoints; v++) {
    const w = map[v];
    if (w < 0) continue;
    points[2 * w] = mesh.points[2 * v];
    points[2 * w + 1] = mesh.points[2 * v + 1];
    mesh.pointData.forEach((d, j) => {
      for (let c = 0; c < d.components; c++) pointData[j].values[w * d.components + c] = d.values[v * d.components + c];
    });
  }
  const cellOffsets = new Int32Array(to - from + 1);
  for (let i = from; i <= to; i++) cellOffsets[i - from] = mesh.cellOffsets[i] - a;
  return {
    points, nPoints, cellOffsets, cellNodes, cellTypes: mesh.cellTypes.slice(from, to), nCells: to - from,
    pointData, cellData: [], format: 'bench', warnings: [],
  };
}

/** The text of a .pvtu naming `sources` (pieces holding a 3-component point velocity). */
export function pvtuText(sources) {
  return `<?xml version="1.0"?>
<VTKFile type="PUnstructuredGrid" version="1.0" byte_order="LittleEndian" header_type="UInt32">
  <PUnstructuredGrid GhostLevel="0">
    <PPointData><PDataArray type="Float64" Name="velocity" NumberOfComponents="3"/></PPointData>
    <PPoints><PDataArray type="Float64" NumberOfComponents="3"/></PPoints>
${sources.map((s) => `    <Piece Source="${s}"/>`).join('\n')}
  </PUnstructuredGrid>
</VTKFile>
`;
}
