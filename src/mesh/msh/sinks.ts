/**
 * Where the MSH section parsers put what they read: points (x, y kept, z range noted) and
 * elements (2-D and 3-D ones stored with their VTK id, points and lines only counted).
 */
import { keepSurfaceCells, usableCoordinate, type KeptCells } from '../cells.js';
import type { ErrorLocation } from '../errors.js';
import { QUAD, TRIANGLE } from '../model.js';
import type { Scanner } from '../scan.js';
import type { Source } from './source.js';
import { MSH_DIM, MSH_NODES, MSH_VTK, mshNodeCount } from './elementTypes.js';
import type { TagMap } from './tagmap.js';

export class PointSink {
  readonly xy: Float64Array;
  readonly tags: Float64Array;
  private zmin = Infinity;
  private zmax = -Infinity;

  constructor(readonly n: number) {
    this.xy = new Float64Array(2 * n);
    this.tags = new Float64Array(n);
  }

  /** False when a coordinate is not usable (the caller reports where, with badPointMessage). */
  set(i: number, x: number, y: number, z: number): boolean {
    if (!usableCoordinate(x) || !usableCoordinate(y) || !usableCoordinate(z)) return false;
    this.xy[2 * i] = x;
    this.xy[2 * i + 1] = y;
    if (z < this.zmin) this.zmin = z;
    if (z > this.zmax) this.zmax = z;
    return true;
  }

  warnings(out: string[]): void {
    if (this.zmax > this.zmin) out.push(`z varies from ${this.zmin} to ${this.zmax}; the mesh is read as its projection on the x-y plane`);
  }
}

export class ElementSink {
  /** VTK id of each stored (2-D or 3-D) element. */
  readonly types: Uint8Array;
  readonly offsets: Int32Array;
  /** MSH tag of each stored element. */
  readonly tags: Float64Array;
  count = 0;
  private conn: Int32Array;
  private len = 0;
  /** Tags of points and lines, which are not stored (their data is dropped). */
  private skipped: Float64Array;
  private nSkipped = 0;
  /** True until a volume or a higher-order triangle or quad is added. */
  private linear = true;

  constructor(capacity: number, private readonly nodes: TagMap) {
    this.types = new Uint8Array(capacity);
    this.offsets = new Int32Array(capacity + 1);
    this.tags = new Float64Array(capacity);
    this.conn = new Int32Array(Math.max(16, 3 * capacity));
    this.skipped = new Float64Array(16);
  }

  /**
   * Add one element of MSH type `type` (a known id) whose node tags are
   * `nodeTags[at .. at + nodes)`. Returns -1, or a node tag that is not in the node map.
   */
  add(tag: number, type: number, nodeTags: ArrayLike<number>, at: number): number {
    const nn = MSH_NODES[type]!;
    const dim = MSH_DIM[type]!;
    const map = this.nodes;
    if (dim === 2) {
      if (this.len + nn > this.conn.length) this.grow(this.len + nn);
      const conn = this.conn;
      let p = this.len;
      for (let k = 0; k < nn; k++) {
        const v = map.get(nodeTags[at + k]!);
        if (v < 0) return nodeTags[at + k]!;
        conn[p++] = v;
      }
      this.len = p;
    } else {
      for (let k = 0; k < nn; k++) if (map.get(nodeTags[at + k]!) < 0) return nodeTags[at + k]!;
    }
    if (dim === 0) {
      if (this.nSkipped === this.skipped.length) {
        const s = new Float64Array(2 * this.skipped.length);
        s.set(this.skipped);
        this.skipped = s;
      }
      this.skipped[this.nSkipped++] = tag;
      return -1;
    }
    const i = this.count++;
    const vtk = MSH_VTK[type]!;
    if (vtk !== TRIANGLE && vtk !== QUAD) this.linear = false;
    this.types[i] = vtk;
    this.tags[i] = tag;
    this.offsets[i + 1] = this.len;
    return -1;
  }

  private grow(min: number): void {
    let cap = this.conn.length * 2;
    while (cap < min) cap *= 2;
    const c = new Int32Array(cap);
    c.set(this.conn.subarray(0, this.len));
    this.conn = c;
  }

  /** Element tags of the points and lines that were dropped. */
  skippedTags(): Float64Array {
    return this.skipped.subarray(0, this.nSkipped);
  }

  /** The triangles and quads (corners only), in file order; fails on 3-D elements. */
  finish(nPoints: number, where: () => ErrorLocation): KeptCells {
    const n = this.count;
    if (this.linear) {
      // node indices come from the tag map, so they are already in range
      const cellTypes = this.types.subarray(0, n);
      return { cellTypes, cellOffsets: this.offsets.subarray(0, n + 1), cellNodes: this.conn.subarray(0, this.len), kept: null, nRawCells: n, warnings: [] };
    }
    return keepSurfaceCells(
      { types: this.types.subarray(0, n), offsets: this.offsets.subarray(0, n + 1), connectivity: this.conn.subarray(0, this.len) },
      nPoints,
      where(),
    );
  }
}

/** Node count of MSH element type `type`; fails naming the id when it is unknown. */
export function nodeCountOrFail(sc: Scanner, type: number, tag: number | null, where: number): number {
  const nn = mshNodeCount(type);
  if (nn === 0) throw sc.error(`${tag === null ? 'an element block' : `element ${tag}`} has unknown MSH element type ${type}`, where);
  return nn;
}

/** `sink.add`, failing with the element and node tags when a node is not in $Nodes. */
export function addOrFail(sink: ElementSink, sc: Scanner, tag: number, type: number, nodeTags: ArrayLike<number>, at: number, where: number): void {
  if (tag < 0) throw sc.error(`element tag ${tag} is negative`, where);
  const bad = sink.add(tag, type, nodeTags, at);
  if (bad >= 0) throw sc.error(`element ${tag} uses node tag ${bad}, which is not in $Nodes`, where);
}

/**
 * Read `count` element records of MSH type `type` (with `nn` nodes) in chunks and add them.
 * A record holds the element tag, `extra` values to ignore, then the node tags: int32 values
 * (2.2 binary) or size_t values (4.1). Returns the scratch buffer, possibly grown.
 */
export function addRecords(src: Source, sink: ElementSink, type: number, nn: number, count: number, extra: number, int32: boolean, buf: Float64Array): Float64Array {
  const sc = src.sc;
  const rec = 1 + extra + nn;
  if (int32) src.need(count, rec, 0, 0, 'element block');
  else src.need(count, 0, rec, 0, 'element block');
  const chunk = Math.min(count, src.chunk);
  const out = atLeastF64(buf, chunk * rec);
  const recBytes = int32 ? src.recordBytes(rec, 0, 0) : src.recordBytes(0, rec, 0);
  for (let j = 0; j < count; j += chunk) {
    const k = Math.min(chunk, count - j);
    const start = sc.pos;
    if (int32) src.ints(out, 0, k * rec, 'element records');
    else src.sizes(out, 0, k * rec, 'an element or node tag');
    for (let e = 0; e < k; e++) {
      const base = e * rec;
      addOrFail(sink, sc, out[base]!, type, out, base + 1 + extra, src.at(start, e, recBytes));
    }
  }
  return out;
}

/** A scratch array of at least `n` entries (the same one when it is large enough). */
export function atLeastF64(buf: Float64Array, n: number): Float64Array {
  return buf.length >= n ? buf : new Float64Array(Math.max(n, 2 * buf.length));
}
