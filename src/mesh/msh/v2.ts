/**
 * MSH 2.2 $Nodes and $Elements. Counts are ASCII lines in both encodings; binary nodes are
 * (int32 tag, 3 doubles) records, binary elements come in blocks of int32 values: a header
 * [type, count, number of tags] then per element [tag, tags..., nodes...].
 */
import { badPointMessage } from '../cells.js';
import type { Source } from './source.js';
import type { TagMap } from './tagmap.js';
import { ElementSink, PointSink, addOrFail, addRecords, atLeastF64, nodeCountOrFail } from './sinks.js';

/** Reads the ASCII count line that opens a 2.2 section (binary data starts on the next line). */
function count(src: Source, what: string): number {
  const n = src.sc.int(what, 0);
  if (src.binary) src.sc.skipLine();
  return n;
}

export function readNodes2(src: Source): PointSink {
  const sc = src.sc;
  const n = count(src, 'the number of nodes');
  src.need(n, 1, 0, 3, '$Nodes');
  const pts = new PointSink(n);
  for (let i = 0; i < n; i++) {
    const tag = src.int('a node tag');
    if (tag < 0) throw sc.error(`node tag ${tag} is negative`);
    const x = src.f64('an x coordinate');
    const y = src.f64('a y coordinate');
    const z = src.f64('a z coordinate');
    if (!pts.set(i, x, y, z)) throw sc.error(badPointMessage(`node ${tag}`, x, y, z));
    pts.tags[i] = tag;
  }
  return pts;
}

export function readElements2(src: Source, nodes: TagMap): ElementSink {
  const n = count(src, 'the number of elements');
  // smallest record: binary [tag, node]; ASCII "tag type ntags node"
  if (src.binary) src.need(n, 2, 0, 0, '$Elements');
  else src.need(n, 4, 0, 0, '$Elements');
  const sink = new ElementSink(n, nodes);
  if (src.binary) readBlocks(src, sink, n);
  else readLines(src, sink, n);
  return sink;
}

function readLines(src: Source, sink: ElementSink, n: number): void {
  const sc = src.sc;
  let nodeTags: Float64Array = new Float64Array(32);
  for (let i = 0; i < n; i++) {
    const tag = src.size('an element tag');
    const type = src.int('an element type');
    const nn = nodeCountOrFail(sc, type, tag, sc.pos);
    const ntags = sc.int('the number of element tags', 0);
    src.skip(ntags, 0, 0, 'an element tag');
    nodeTags = atLeastF64(nodeTags, nn);
    src.sizes(nodeTags, 0, nn, 'a node tag');
    if (!sc.atLineEnd()) throw sc.error(`element ${tag} has more values than the ${nn} nodes of MSH element type ${type}`);
    addOrFail(sink, sc, tag, type, nodeTags, 0, sc.pos);
  }
}

function readBlocks(src: Source, sink: ElementSink, n: number): void {
  const sc = src.sc;
  let buf: Float64Array = new Float64Array(0);
  let done = 0;
  while (done < n) {
    const at = src.mark();
    const type = src.int('an element type');
    const count = src.int('an element count');
    const ntags = src.int('a number of element tags');
    const nn = nodeCountOrFail(sc, type, null, at);
    if (count < 1 || count > n - done) {
      throw sc.error(`an element block of ${count} elements, where ${n - done} of the ${n} announced remain`, at);
    }
    if (ntags < 0) throw sc.error(`an element block with ${ntags} tags per element`, at);
    buf = addRecords(src, sink, type, nn, count, ntags, true, buf);
    done += count;
  }
}
