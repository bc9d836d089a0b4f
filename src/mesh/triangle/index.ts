/**
 * Reader for J. R. Shewchuk's Triangle .node / .ele pair.
 *
 * .node: "points dim attributes markers" (trailing header values optional: 2, 0, 0), then
 *        "index x y [attributes] [marker]" per point.
 * .ele:  "triangles nodesPerTriangle attributes" (3 and 0 when left out), then
 *        "index n1 n2 n3 [3 more nodes of a 6-node triangle] [attributes]".
 *
 * Point attributes become point arrays attr0, attr1, …, the marker a point array `marker`,
 * triangle attributes cell arrays attr0, …. Triangle has no vector fields, so when there are
 * two or more point attributes, attr0 and attr1 are also exposed together as a 2-component
 * point array `velocity` (the array the audit looks for by default).
 */
import { assembleMesh, type KeptCells } from '../cells.js';
import { TRIANGLE, type DataArray, type Mesh } from '../model.js';
import { Rows } from './rows.js';

const MAX_ATTRIBUTES = 1000;

interface NodeFile {
  n: number;
  xy: Float64Array;
  base: number;
  pointData: DataArray[];
}

function attributeArrays(attrs: Float64Array[]): DataArray[] {
  return attrs.map((values, a) => ({ name: `attr${a}`, components: 1, values }));
}

function newArrays(count: number, n: number): Float64Array[] {
  const out: Float64Array[] = [];
  for (let a = 0; a < count; a++) out.push(new Float64Array(n));
  return out;
}

function readNodeFile(bytes: Uint8Array, file: string): NodeFile {
  const rows = new Rows(bytes, file);
  if (!rows.next()) throw rows.sc.error('the file holds no header line');
  const n = rows.int('the number of points', 0);
  const headerAt = rows.sc.pos;
  const dim = rows.optionalInt('the dimension', 2, 0, 1000);
  if (dim !== 2) throw rows.sc.error(`dimension ${dim}: only 2-D .node files are supported`, headerAt);
  const nAttr = rows.optionalInt('the number of attributes', 0, 0, MAX_ATTRIBUTES);
  const nMark = rows.optionalInt('the number of boundary markers', 0, 0, 1);
  rows.end('points, dimension, attributes, markers');
  rows.need(n, 3 + nAttr + nMark, 'points');

  const xy = new Float64Array(2 * n);
  const attrs = newArrays(nAttr, n);
  const marker = nMark ? new Float64Array(n) : null;
  const layout = `index, x, y, ${nAttr} attributes, ${nMark} markers`;
  for (let i = 0; i < n; i++) {
    rows.record(i, n, 'points');
    xy[2 * i] = rows.coordinate('the x coordinate');
    xy[2 * i + 1] = rows.coordinate('the y coordinate');
    for (let a = 0; a < nAttr; a++) attrs[a]![i] = rows.value(`attribute ${a}`);
    if (marker) marker[i] = rows.int('the boundary marker');
    rows.end(layout);
  }
  rows.finish(n, 'points');

  const pointData = attributeArrays(attrs);
  if (marker) pointData.push({ name: 'marker', components: 1, values: marker });
  if (nAttr >= 2) {
    const v = new Float64Array(2 * n);
    const u0 = attrs[0]!;
    const u1 = attrs[1]!;
    for (let i = 0; i < n; i++) {
      v[2 * i] = u0[i]!;
      v[2 * i + 1] = u1[i]!;
    }
    pointData.push({ name: 'velocity', components: 2, values: v });
  }
  return { n, xy, base: rows.base, pointData };
}

export function readTriangle(nodeBytes: Uint8Array, eleBytes: Uint8Array, nodeFile: string, eleFile: string): Mesh {
  const nodes = readNodeFile(nodeBytes, nodeFile);
  const rows = new Rows(eleBytes, eleFile);
  if (!rows.next()) throw rows.sc.error('the file holds no header line');
  const n = rows.int('the number of triangles', 0);
  const headerAt = rows.sc.pos;
  const per = rows.optionalInt('the number of nodes per triangle', 3, 0, 1000);
  if (per !== 3 && per !== 6) throw rows.sc.error(`${per} nodes per triangle (expected 3 or 6)`, headerAt);
  const nAttr = rows.optionalInt('the number of attributes', 0, 0, MAX_ATTRIBUTES);
  rows.end('triangles, nodes per triangle, attributes');
  if (n > 0 && nodes.n === 0) {
    throw rows.sc.error(`${n} triangles but ${nodeFile} holds no points (points kept in a .poly file are not supported)`, headerAt);
  }
  rows.need(n, 1 + per + nAttr, 'triangles');

  const conn = new Int32Array(n * 3);
  const attrs = newArrays(nAttr, n);
  const lo = nodes.base;
  const hi = nodes.base + nodes.n - 1;
  const layout = `index, ${per} nodes, ${nAttr} attributes`;
  for (let i = 0; i < n; i++) {
    const idx = rows.record(i, n, 'triangles');
    for (let k = 0; k < per; k++) {
      const at = (rows.ended(), rows.sc.pos);
      const v = rows.int('a node index');
      if (v < lo || v > hi) throw rows.sc.error(`triangle ${idx} uses node ${v}, outside ${lo}..${hi} (${nodeFile})`, at);
      if (k < 3) conn[i * 3 + k] = v - lo;
    }
    for (let a = 0; a < nAttr; a++) attrs[a]![i] = rows.value(`attribute ${a}`);
    rows.end(layout);
  }
  rows.finish(n, 'triangles');

  const cellOffsets = new Int32Array(n + 1);
  for (let i = 0; i <= n; i++) cellOffsets[i] = 3 * i;
  const cellTypes = new Uint8Array(n).fill(TRIANGLE);
  // 6-node triangles list their corners first
  const warnings = per === 6 && n > 0 ? [`${n} higher-order cells reduced to their corner nodes`] : [];
  const cells: KeptCells = { cellTypes, cellOffsets, cellNodes: conn, kept: null, nRawCells: n, warnings };
  return assembleMesh({
    points: nodes.xy,
    cells,
    pointData: nodes.pointData,
    cellData: attributeArrays(attrs),
    format: 'triangle',
  });
}
