/**
 * MSH 4.1 $Entities, $Nodes and $Elements. Every value of these sections is binary in binary
 * files: counts and tags are size_t, dimensions, entity tags and types are int.
 */
import { badPointMessage } from '../cells.js';
import type { Source } from './source.js';
import type { TagMap } from './tagmap.js';
import { ElementSink, PointSink, addRecords, atLeastF64, nodeCountOrFail } from './sinks.js';

/** Parsed only to move past it: entity bounding boxes and physical groups are not used. */
export function readEntities4(src: Source): void {
  src.need(1, 0, 4, 0, '$Entities');
  const nPoints = src.size('the number of point entities');
  const nCurves = src.size('the number of curve entities');
  const nSurfaces = src.size('the number of surface entities');
  const nVolumes = src.size('the number of volume entities');
  src.need(nPoints, 1, 1, 3, '$Entities points');
  src.need(nCurves + nSurfaces + nVolumes, 1, 2, 6, '$Entities curves, surfaces and volumes');
  for (let i = 0; i < nPoints; i++) {
    src.skip(1, 0, 3, 'a point entity');
    skipIntList(src, 'physical tags');
  }
  const rest = nCurves + nSurfaces + nVolumes;
  for (let i = 0; i < rest; i++) {
    src.skip(1, 0, 6, 'an entity');
    skipIntList(src, 'physical tags');
    skipIntList(src, 'bounding entities');
  }
}

function skipIntList(src: Source, what: string): void {
  const n = src.size(`the number of ${what}`);
  src.need(n, 1, 0, 0, what);
  src.skip(n, 0, 0, what);
}

/** The four size_t values that open $Nodes and $Elements: blocks, count, min tag, max tag. */
function sectionHeader(src: Source, section: string, what: string): { blocks: number; n: number } {
  src.need(1, 0, 4, 0, section);
  const blocks = src.size('the number of entity blocks');
  const n = src.size(`the number of ${what}`);
  src.size(`the smallest ${what.slice(0, -1)} tag`);
  src.size(`the largest ${what.slice(0, -1)} tag`);
  src.need(blocks, 3, 1, 0, `${section} entity blocks`);
  return { blocks, n };
}

function blockTooLarge(src: Source, at: number, count: number, what: string, done: number, n: number): Error {
  return src.sc.error(`a block of ${count} ${what}, where ${n - done} of the ${n} announced remain`, at);
}

function countMismatch(src: Source, what: string, n: number, done: number): Error {
  return src.sc.error(`the header announces ${n} ${what} but the blocks hold ${done}`);
}

export function readNodes4(src: Source): PointSink {
  const sc = src.sc;
  const { blocks, n } = sectionHeader(src, '$Nodes', 'nodes');
  src.need(n, 0, 1, 3, '$Nodes');
  const pts = new PointSink(n);
  let buf: Float64Array = new Float64Array(0);
  let done = 0;
  for (let b = 0; b < blocks; b++) {
    const at = src.mark();
    const dim = src.int('an entity dimension');
    src.int('an entity tag');
    const parametric = src.int('the parametric flag');
    const count = src.size('the number of nodes in the block');
    if (dim < 0 || dim > 3) throw sc.error(`entity dimension ${dim} (expected 0 to 3)`, at);
    if (parametric !== 0 && parametric !== 1) throw sc.error(`parametric flag ${parametric} (expected 0 or 1)`, at);
    if (count > n - done) throw blockTooLarge(src, at, count, 'nodes', done, n);
    src.sizes(pts.tags, done, count, 'a node tag');
    const per = 3 + parametric * dim;
    src.need(count, 0, 0, per, 'node coordinates');
    const chunk = Math.min(count, src.chunk);
    buf = atLeastF64(buf, chunk * per);
    for (let j = 0; j < count; j += chunk) {
      const k = Math.min(chunk, count - j);
      const start = sc.pos;
      src.f64s(buf, 0, k * per, 'a node coordinate');
      for (let e = 0; e < k; e++) {
        const q = e * per;
        if (!pts.set(done + j + e, buf[q]!, buf[q + 1]!, buf[q + 2]!)) {
          throw sc.error(badPointMessage(`node ${pts.tags[done + j + e]}`, buf[q]!, buf[q + 1]!, buf[q + 2]!), src.at(start, e, 8 * per));
        }
      }
    }
    done += count;
  }
  if (done !== n) throw countMismatch(src, 'nodes', n, done);
  return pts;
}

export function readElements4(src: Source, nodes: TagMap): ElementSink {
  const sc = src.sc;
  const { blocks, n } = sectionHeader(src, '$Elements', 'elements');
  src.need(n, 0, 2, 0, '$Elements');
  const sink = new ElementSink(n, nodes);
  let buf: Float64Array = new Float64Array(0);
  let done = 0;
  for (let b = 0; b < blocks; b++) {
    const at = src.mark();
    src.int('an entity dimension');
    src.int('an entity tag');
    const type = src.int('an element type');
    const count = src.size('the number of elements in the block');
    const nn = nodeCountOrFail(sc, type, null, at);
    if (count > n - done) throw blockTooLarge(src, at, count, 'elements', done, n);
    buf = addRecords(src, sink, type, nn, count, 0, false, buf);
    done += count;
  }
  if (done !== n) throw countMismatch(src, 'elements', n, done);
  return sink;
}
