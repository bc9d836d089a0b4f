/**
 * Random valid meshes for the cross-format fuzz tests, and their files in every format and
 * encoding we read: VTU through our writer (every option), legacy VTK and MSH through the test
 * encoders of test/mesh/, Triangle through test/fuzz/triangle-encode.ts. Each file comes with
 * the mesh it must read back as, built here from the random description (not by a reader).
 */
import fc from 'fast-check';
import { expect } from 'vitest';
import { writeVtu, type VtuWriteOptions } from '../../src/io/vtu.js';
import { MAX_COORDINATE } from '../../src/mesh/cells.js';
import { QUAD, TRIANGLE, type DataArray, type Mesh } from '../../src/mesh/model.js';
import { readMesh } from '../../src/mesh/read.js';
import { encodeLegacy, type AttributeSpec, type LegacySpec } from '../mesh/legacy/encode.js';
import { ALL_ENCODINGS, encodeMsh, encodingName, type MshElement, type MshField } from '../mesh/msh/encode.js';
import { encodeTriangle, type TriangleDoc } from './triangle-encode.js';

export interface FuzzArray {
  name: string;
  components: number;
  values: number[];
  /** Stored as Float32 where the format can (VTU, legacy VTK); values are float32 numbers. */
  float32: boolean;
}

export interface FuzzMesh {
  /** x, y interleaved. */
  points: number[];
  /** 3 or 4 point indices per cell. */
  cells: number[][];
  pointArrays: FuzzArray[];
  cellArrays: FuzzArray[];
  time: number | undefined;
}

/** The files of one encoded mesh: `entry` is the one handed to readMesh (siblings beside it). */
export interface Encoded {
  label: string;
  entry: string;
  files: Map<string, Uint8Array>;
  expected: Mesh;
}

const noNegZero = (v: number): number => v + 0;

/** Doubles of every size, with round numbers mixed in (ASCII writers print both kinds). */
const double = fc.oneof(
  fc.integer({ min: -1000, max: 1000 }),
  fc.double({ min: -1e7, max: 1e7, noNaN: true }),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
).map(noNegZero);

/** Coordinates: every size the readers accept (|x| ≤ MAX_COORDINATE, 1e150). */
const coordinate = fc.oneof(
  fc.integer({ min: -1000, max: 1000 }),
  fc.double({ min: -1e7, max: 1e7, noNaN: true }),
  fc.double({ min: -MAX_COORDINATE, max: MAX_COORDINATE, noNaN: true }),
).map(noNegZero);

const float32 = fc.float({ noNaN: true, noDefaultInfinity: true }).map(noNegZero);

/** Array names: a space and an ampersand test escaping in XML and %20 in legacy VTK. */
const NAMES = ['depth', 'water depth', 'u&v', 'eta_1', 'Roughness', 'T', 'speed2', 'tracer'];

function arrays(tuples: number, maxArrays: number): fc.Arbitrary<FuzzArray[]> {
  const one = fc.record({ components: fc.integer({ min: 1, max: 4 }), float32: fc.boolean() }).chain(({ components, float32: f32 }) =>
    fc.array(f32 ? float32 : double, { minLength: tuples * components, maxLength: tuples * components })
      .map((values) => ({ components, float32: f32, values })));
  return fc.uniqueArray(fc.constantFrom(...NAMES), { maxLength: maxArrays })
    .chain((names) => fc.tuple(...names.map(() => one)).map((list) => list.map((a, i) => ({ name: names[i]!, ...a }))));
}

export const fuzzMesh: fc.Arbitrary<FuzzMesh> = fc.integer({ min: 1, max: 24 }).chain((n) =>
  fc.record({
    points: fc.array(coordinate, { minLength: 2 * n, maxLength: 2 * n }),
    cells: fc.array(fc.array(fc.nat(n - 1), { minLength: 3, maxLength: 4 }), { maxLength: 16 }),
    pointArrays: arrays(n, 3),
    time: fc.option(double, { nil: undefined }),
  }).chain((m) => arrays(m.cells.length, 3).map((cellArrays) => ({ ...m, cellArrays }))));

function valuesOf(a: FuzzArray, keepFloat32: boolean): Float32Array | Float64Array {
  return keepFloat32 && a.float32 ? Float32Array.from(a.values) : Float64Array.from(a.values);
}

function dataArrays(list: FuzzArray[], keepFloat32: boolean): DataArray[] {
  return list.map((a) => ({ name: a.name, components: a.components, values: valuesOf(a, keepFloat32) }));
}

/** The mesh a reader must return for `m` (float32 arrays kept as such when `keepFloat32`). */
export function meshFrom(m: FuzzMesh, keepFloat32: boolean, format = 'expected'): Mesh {
  const cellOffsets = new Int32Array(m.cells.length + 1);
  m.cells.forEach((c, i) => { cellOffsets[i + 1] = cellOffsets[i]! + c.length; });
  const mesh: Mesh = {
    points: Float64Array.from(m.points),
    nPoints: m.points.length / 2,
    cellOffsets,
    cellNodes: Int32Array.from(m.cells.flat()),
    cellTypes: Uint8Array.from(m.cells, (c) => (c.length === 4 ? QUAD : TRIANGLE)),
    nCells: m.cells.length,
    pointData: dataArrays(m.pointArrays, keepFloat32),
    cellData: dataArrays(m.cellArrays, keepFloat32),
    format,
    warnings: [],
  };
  if (m.time !== undefined) mesh.time = m.time;
  return mesh;
}

const VTU_ENCODINGS = ['ascii', 'base64', 'appended-raw', 'appended-base64'] as const;

/** Every writer option that changes the bytes: 2 ASCII files and 48 binary ones. */
export function vtuOptions(blockSize: number): VtuWriteOptions[] {
  const out: VtuWriteOptions[] = [];
  for (const encoding of VTU_ENCODINGS) {
    for (const intType of ['Int32', 'Int64'] as const) {
      if (encoding === 'ascii') { out.push({ encoding, intType }); continue; }
      for (const compress of [false, true]) {
        for (const headerType of ['UInt32', 'UInt64'] as const) {
          for (const byteOrder of ['LittleEndian', 'BigEndian'] as const) out.push({ encoding, intType, compress, headerType, byteOrder, blockSize });
        }
      }
    }
  }
  return out;
}

export function vtuFiles(m: FuzzMesh, blockSize: number): Encoded[] {
  const expected = meshFrom(m, true);
  return vtuOptions(blockSize).map((o) => ({
    label: `vtu ${JSON.stringify(o)}`,
    entry: 'fuzz.vtu',
    files: new Map([['fuzz.vtu', writeVtu(expected, {}, o)]]),
    expected,
  }));
}

const legacyName = (s: string): string => s.replace(/ /g, '%20');

/** x, y interleaved → x, y, 0 (points and 2-D vectors as legacy VTK stores them). */
export function xyzOf(xy: ArrayLike<number>): number[] {
  return Array.from({ length: (3 * xy.length) / 2 }, (_, i) => (i % 3 === 2 ? 0 : xy[2 * Math.floor(i / 3) + (i % 3)]!));
}

/** The node list of every cell. */
export function cellLists(m: Mesh): number[][] {
  return Array.from({ length: m.nCells }, (_, c) => Array.from(m.cellNodes.subarray(m.cellOffsets[c], m.cellOffsets[c + 1])));
}

function legacyItems(list: FuzzArray[], pad: number): AttributeSpec[] {
  return list.map((a, k) => {
    const type = a.float32 ? 'float' : 'double';
    const values = pad > 0 ? [...Array<number>(pad * a.components).fill(0.5), ...a.values] : a.values;
    const name = legacyName(a.name);
    if (a.components === 3 && k % 2 === 0) return { kind: 'VECTORS', name, type, values };
    if (k % 3 === 2) return { kind: 'FIELD', name: 'Extra', arrays: [{ name, type, components: a.components, values }] };
    return { kind: 'SCALARS', name, type, components: a.components, ...(k % 2 === 1 ? { lookupTable: 'default' } : {}), values };
  });
}

export function legacyFiles(m: FuzzMesh, perLine: number): Encoded[] {
  const expected = meshFrom(m, true);
  const nP = m.points.length / 2;
  const xyz = xyzOf(m.points);
  const out: Encoded[] = [];
  for (const binary of [false, true]) {
    for (const version of ['4.2', '5.1']) {
      for (const dataset of ['UNSTRUCTURED_GRID', 'POLYDATA'] as const) {
        // POLYDATA numbers vertices and lines before polygons: their cell data is padded in front
        const verts = dataset === 'POLYDATA' && perLine % 2 === 0 ? [[0]] : [];
        const lines = dataset === 'POLYDATA' && nP > 1 ? [[0, nP - 1]] : [];
        const pad = verts.length + lines.length;
        const attributes = [];
        if (m.pointArrays.length > 0) attributes.push({ section: 'POINT_DATA' as const, count: nP, items: legacyItems(m.pointArrays, 0) });
        if (m.cellArrays.length > 0) attributes.push({ section: 'CELL_DATA' as const, count: m.cells.length + pad, items: legacyItems(m.cellArrays, pad) });
        const spec: LegacySpec = {
          version, binary, dataset, perLine, attributes,
          newlineAfterBinary: perLine % 3 !== 0,
          offsetsType: perLine % 2 === 0 ? 'vtktypeint64' : 'vtktypeint32',
          points: { type: 'double', xyz },
          cells: m.cells,
          cellTypes: m.cells.map((c) => (c.length === 4 ? QUAD : TRIANGLE)),
          verts, lines,
          ...(m.time !== undefined ? { fieldData: [{ name: 'TimeValue', type: 'double', values: [m.time] }] } : {}),
        };
        out.push({ label: `legacy ${version} ${binary ? 'binary' : 'ascii'} ${dataset}`, entry: 'fuzz.vtk', files: new Map([['fuzz.vtk', encodeLegacy(spec)]]), expected });
      }
    }
  }
  return out;
}

/** MSH: sparse, shuffled node and element tags, points and lines between the cells (dropped). */
export function mshFiles(m: FuzzMesh, stride: number): Encoded[] {
  const expected = meshFrom(m, false);
  const nP = m.points.length / 2;
  const nodeTag = (i: number): number => 1 + (nP - 1 - i) * stride;
  const nodes = Array.from({ length: nP }, (_, i) => ({ tag: nodeTag(i), x: m.points[2 * i]!, y: m.points[2 * i + 1]!, z: 0 }));
  const elements: MshElement[] = [];
  const cellTags: number[] = [];
  m.cells.forEach((c, i) => {
    if (i % 3 === 1) elements.push({ tag: 900000 + i, type: 15, nodes: [nodeTag(c[0]!)] });
    if (i % 4 === 2) elements.push({ tag: 800000 + i, type: 1, nodes: [nodeTag(c[0]!), nodeTag(c[1]!)] });
    const tag = 1 + i * stride;
    cellTags.push(tag);
    elements.push({ tag, type: c.length === 4 ? 3 : 2, nodes: c.map(nodeTag) });
  });
  const withTime = m.time !== undefined ? { time: m.time } : {};
  const fields: MshField[] = [
    ...m.pointArrays.map((a) => ({ kind: 'node' as const, name: a.name, ...withTime, components: a.components,
      entries: nodes.map((n, i) => ({ tag: n.tag, values: a.values.slice(i * a.components, (i + 1) * a.components) })) })),
    ...m.cellArrays.map((a) => ({ kind: 'element' as const, name: a.name, ...withTime, components: a.components,
      entries: cellTags.map((tag, i) => ({ tag, values: a.values.slice(i * a.components, (i + 1) * a.components) })) })),
  ];
  const exp: Mesh = { ...expected };
  if (fields.length === 0) delete exp.time;
  return ALL_ENCODINGS.map((enc, k) => ({
    label: `msh ${encodingName(enc)}`,
    entry: 'fuzz.msh',
    files: new Map([['fuzz.msh', encodeMsh({ nodes, elements, fields, extras: k % 2 === 0, nodeBlocks: 1 + (k % 3) }, enc)]]),
    expected: exp,
  }));
}

/** Triangle keeps triangles only, scalar arrays only, float64, no time. */
export function triangleFiles(m: FuzzMesh, markers: boolean): Encoded[] {
  const triIdx = m.cells.flatMap((c, i) => (c.length === 3 ? [i] : []));
  const pointAttributes = m.pointArrays.filter((a) => a.components === 1).map((a) => a.values);
  const triangleAttributes = m.cellArrays.filter((a) => a.components === 1).map((a) => triIdx.map((i) => a.values[i]!));
  const nP = m.points.length / 2;
  const doc: TriangleDoc = {
    points: m.points, pointAttributes, triangles: triIdx.map((i) => m.cells[i]!), triangleAttributes,
    markers: markers ? Array.from({ length: nP }, (_, i) => i % 3) : null,
  };
  const pointArrays: FuzzArray[] = pointAttributes.map((values, a) => ({ name: `attr${a}`, components: 1, values, float32: false }));
  if (doc.markers) pointArrays.push({ name: 'marker', components: 1, values: [...doc.markers], float32: false });
  if (pointAttributes.length >= 2) {
    pointArrays.push({ name: 'velocity', components: 2, values: pointAttributes[0]!.flatMap((u, i) => [u, pointAttributes[1]![i]!]), float32: false });
  }
  const expected = meshFrom({
    points: m.points, cells: doc.triangles.map((t) => [...t]), pointArrays, time: undefined,
    cellArrays: triangleAttributes.map((values, a) => ({ name: `attr${a}`, components: 1, values, float32: false })),
  }, false);
  const out: Encoded[] = [];
  for (const base of [0, 1] as const) {
    for (const noise of [false, true]) {
      const { node, ele } = encodeTriangle(doc, { base, noise });
      const files = new Map([['fuzz.node', node], ['fuzz.ele', ele]]);
      out.push({ label: `triangle base ${base}${noise ? ' with comments' : ''}`, entry: noise ? 'fuzz.ele' : 'fuzz.node', files, expected });
    }
  }
  return out;
}

/** readMesh on the entry file, siblings from the same set. */
export function readEncoded(files: Map<string, Uint8Array>, entry: string, bytes = files.get(entry)!): Mesh {
  return readMesh(bytes, entry, { loadSibling: (name) => files.get(name) ?? null });
}

/** Element-wise Object.is (tells -0 from 0 and NaN from NaN); `expect` runs only on a mismatch. */
function expectValues(actual: ArrayLike<number>, expected: ArrayLike<number>, label: string): void {
  let same = actual.length === expected.length;
  for (let i = 0; same && i < actual.length; i++) same = Object.is(actual[i], expected[i]);
  if (!same) expect(Array.from(actual), label).toEqual(Array.from(expected));
}

function expectArrays(actual: DataArray[], expected: DataArray[], label: string): void {
  expect(actual.map((a) => a.name).sort(), label).toEqual(expected.map((a) => a.name).sort());
  for (const e of expected) {
    const a = actual.find((x) => x.name === e.name)!;
    expect(a.components, `${label} ${e.name}`).toBe(e.components);
    expect(a.values.constructor, `${label} ${e.name}`).toBe(e.values.constructor);
    expectValues(a.values, e.values, `${label} ${e.name}`);
  }
}

/** Same points, cells, types and arrays, values bit for bit. */
export function expectSameMesh(actual: Mesh, expected: Mesh, label: string): void {
  expect(actual.nPoints, label).toBe(expected.nPoints);
  expectValues(actual.points, expected.points, `${label} points`);
  expect(actual.nCells, label).toBe(expected.nCells);
  expectValues(actual.cellTypes, expected.cellTypes, `${label} types`);
  expectValues(actual.cellOffsets, expected.cellOffsets, `${label} offsets`);
  expectValues(actual.cellNodes.subarray(0, actual.cellOffsets[actual.nCells]), expected.cellNodes, `${label} nodes`);
  expectArrays(actual.pointData, expected.pointData, `${label} point data`);
  expectArrays(actual.cellData, expected.cellData, `${label} cell data`);
  expect(actual.time, `${label} time`).toBe(expected.time);
}
