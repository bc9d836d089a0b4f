/**
 * Gmsh MSH reader: versions 2.2 and 4.1, ASCII and binary (either byte order).
 * Keeps the triangles and quads (higher-order ones reduced to corners) in file order, drops
 * points and lines, rejects volumes. $NodeData / $ElementData become point / cell arrays.
 */
import { assembleMesh } from '../cells.js';
import { MeshInputError } from '../errors.js';
import type { DataArray, Mesh } from '../model.js';
import { Scanner, lineAt } from '../scan.js';
import { FieldCollector, readFieldBlock, spreadGroup } from './data.js';
import { ElementSink, PointSink } from './sinks.js';
import { AsciiSource, BinarySource, ByteScanner, type Source } from './source.js';
import { TagMap } from './tagmap.js';
import { readElements2, readNodes2 } from './v2.js';
import { readElements4, readEntities4, readNodes4 } from './v4.js';

interface Header {
  version: 2 | 4;
  binary: boolean;
  le: boolean;
  dataSize: number;
  /** Where the header's values end (the endianness check included). */
  pos: number;
}

function shown(tok: string): string {
  return tok === '' ? 'the end of the file' : JSON.stringify(tok.length > 24 ? tok.slice(0, 24) + '…' : tok);
}

function expectToken(sc: Scanner, want: string): void {
  sc.skipSpace();
  const at = sc.pos;
  const tok = sc.token();
  if (tok !== want) throw sc.error(`expected ${want}, found ${shown(tok)}`, at);
}

function readHeader(bytes: Uint8Array, file: string): Header {
  const start = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  const sc = new Scanner(bytes, file, start);
  sc.skipSpace();
  const first = sc.token();
  if (first === '$NOD' || first === '$NOE') throw sc.error('MSH version 1.0 is not supported (2.2 and 4.1 are)', start);
  if (first !== '$MeshFormat') throw sc.error(`expected $MeshFormat at the start of the file, found ${shown(first)}`, start);
  sc.skipSpace();
  const vat = sc.pos;
  const vtok = sc.token();
  const v = Number(vtok);
  if (v !== 2.2 && v !== 4.1) throw sc.error(`MSH version ${shown(vtok)} is not supported (2.2 and 4.1 are)`, vat);
  const version = v === 2.2 ? 2 : 4;
  const binary = sc.int('the file type (0 for ASCII, 1 for binary)', 0, 1) === 1;
  sc.skipSpace();
  const dat = sc.pos;
  const dataSize = sc.int('the data size', 0, 64);
  let le = true;
  if (binary) {
    // 2.2: the size of a double; 4.1: the size of size_t
    if (version === 2 ? dataSize !== 8 : dataSize !== 8 && dataSize !== 4) {
      throw sc.error(`data size ${dataSize} is not supported in a binary MSH ${vtok} file (expected ${version === 2 ? '8' : '4 or 8'})`, dat);
    }
    sc.skipLine();
    const p = sc.pos;
    if (p + 4 > sc.end) throw new MeshInputError('unexpected end of file: expected the endianness check (int 1)', { file, byteOffset: p });
    const dv = new DataView(bytes.buffer, bytes.byteOffset + p, 4);
    if (dv.getInt32(0, false) === 1) le = false;
    else if (dv.getInt32(0, true) !== 1) {
      throw new MeshInputError(`the endianness check is ${dv.getInt32(0, true)}, expected 1 in either byte order`, { file, byteOffset: p });
    }
    sc.pos = p + 4;
  }
  return { version, binary, le, dataSize, pos: sc.pos };
}

/** The next section's opening keyword ($Name), or null at the end. Other lines are ignored. */
function nextSection(sc: Scanner): string | null {
  for (;;) {
    sc.skipSpace();
    if (sc.pos >= sc.end) return null;
    if (sc.bytes[sc.pos] === 36) return sc.token();
    sc.skipLine();
  }
}

/** Move past `$EndName` (a section this reader does not use). */
function skipSection(sc: Scanner, name: string, at: number): void {
  const end = '$End' + name.slice(1);
  const b = sc.bytes;
  let p = sc.pos;
  for (;;) {
    p = b.indexOf(36, p);
    if (p < 0 || p + end.length > sc.end) throw sc.error(`section ${name} has no ${end}`, at);
    let k = 1;
    while (k < end.length && b[p + k] === end.charCodeAt(k)) k++;
    if (k === end.length) break;
    p++;
  }
  sc.pos = p + end.length;
}

export function readMsh(bytes: Uint8Array, file: string): Mesh {
  const h = readHeader(bytes, file);
  const sc = h.binary ? new ByteScanner(bytes, file, h.pos) : new Scanner(bytes, file, h.pos);
  expectToken(sc, '$EndMeshFormat');
  const src: Source = h.binary ? new BinarySource(sc, h.le, h.version === 4 ? h.dataSize : 8) : new AsciiSource(sc);
  const fields = new FieldCollector();
  let pts: PointSink | null = null;
  let nodeMap: TagMap | null = null;
  let elems: ElementSink | null = null;
  let elemsAt = 0;
  for (;;) {
    const name = nextSection(sc);
    if (name === null) break;
    const at = sc.pos - name.length;
    sc.skipLine();
    switch (name) {
      case '$Nodes': {
        if (pts) throw sc.error('a second $Nodes section', at);
        const p = h.version === 2 ? readNodes2(src) : readNodes4(src);
        nodeMap = new TagMap(p.tags, p.n, (t) => sc.error(`node tag ${t} appears twice in $Nodes`, at));
        pts = p;
        break;
      }
      case '$Elements':
        if (!nodeMap) throw sc.error('$Elements comes before $Nodes', at);
        if (elems) throw sc.error('a second $Elements section', at);
        elems = h.version === 2 ? readElements2(src, nodeMap) : readElements4(src, nodeMap);
        elemsAt = at;
        break;
      case '$Entities':
        if (h.version !== 4) {
          skipSection(sc, name, at);
          continue;
        }
        readEntities4(src);
        break;
      case '$NodeData':
      case '$ElementData':
        fields.add(name === '$NodeData' ? 'node' : 'element', readFieldBlock(src, name, at), sc);
        break;
      case '$MeshFormat':
        throw sc.error('a second $MeshFormat section', at);
      default:
        skipSection(sc, name, at);
        continue;
    }
    expectToken(sc, '$End' + name.slice(1));
  }
  if (!pts || !nodeMap) throw sc.error('the file ends without a $Nodes section', sc.end);
  if (!elems) throw sc.error('the file ends without an $Elements section', sc.end);

  const cells = elems.finish(pts.n, () => (h.binary ? { file, byteOffset: elemsAt } : { file, line: lineAt(bytes, elemsAt) }));
  const warnings: string[] = [];
  pts.warnings(warnings);
  if (cells.cellTypes.length === 0) warnings.push('$Elements holds no triangles or quads');
  const pointData: DataArray[] = [];
  for (const b of fields.node.values()) pointData.push(spreadGroup(b, pts.n, nodeMap, null, 'node', warnings, sc));
  const cellData: DataArray[] = [];
  if (fields.element.size > 0) {
    const e = elems;
    const dup = (t: number): Error => sc.error(`element tag ${t} appears twice in $Elements`, elemsAt);
    const cellMap = new TagMap(e.tags, e.count, dup);
    const skipped = e.skippedTags();
    const dropped = new TagMap(skipped, skipped.length, dup);
    for (const b of fields.element.values()) cellData.push(spreadGroup(b, e.count, cellMap, dropped, 'element', warnings, sc));
  }
  return assembleMesh({
    points: pts.xy,
    cells,
    pointData,
    cellData,
    format: `msh/${h.version === 2 ? '2.2' : '4.1'}-${h.binary ? 'binary' : 'ascii'}`,
    warnings,
    time: fields.time,
  });
}
