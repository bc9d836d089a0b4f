/**
 * VTU writer: the mesh as a VTK XML UnstructuredGrid with its point/cell arrays, in any of the
 * encodings the reader accepts. Binary parts are built as typed-array bytes, never per value.
 */
import { zlibSync } from 'fflate';
import { UsageError } from '../mesh/errors.js';
import type { DataArray, Mesh } from '../mesh/model.js';
import { Base64Writer, base64Length } from '../mesh/vtkxml/base64.js';
import { swapBytes, TWO32 } from '../mesh/vtkxml/types.js';

export type VtuEncoding = 'ascii' | 'base64' | 'appended-raw' | 'appended-base64';

export interface VtuWriteOptions {
  /** Default 'appended-raw'. */
  encoding?: VtuEncoding;
  /** zlib-compress binary arrays in blocks. */
  compress?: boolean;
  headerType?: 'UInt32' | 'UInt64';
  byteOrder?: 'LittleEndian' | 'BigEndian';
  /** Type of connectivity and offsets. */
  intType?: 'Int32' | 'Int64';
  /** Uncompressed size of a compressed block, default 32768. */
  blockSize?: number;
}

type OutType = 'Float32' | 'Float64' | 'Int32' | 'Int64' | 'UInt8';
type OutValues = Float32Array | Float64Array | Int32Array | Uint8Array;

interface OutArray {
  name: string;
  type: OutType;
  components: number;
  values: OutValues;
  /** Extra attribute text, e.g. NumberOfTuples for field data. */
  attrs?: string;
}

interface Settings {
  encoding: VtuEncoding;
  compress: boolean;
  header64: boolean;
  bigEndian: boolean;
  blockSize: number;
}

const textEncoder = new TextEncoder();

function escapeAttr(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/** Shortest text that reads back to the same double; inf/-inf/nan for the rest. */
export function formatNumber(v: number): string {
  if (v === 0) return Object.is(v, -0) ? '-0' : '0';
  if (Number.isFinite(v)) return String(v);
  return v !== v ? 'nan' : v > 0 ? 'inf' : '-inf';
}

function elementSize(t: OutType): number {
  return t === 'UInt8' ? 1 : t === 'Float32' || t === 'Int32' ? 4 : 8;
}

/** The array's bytes in the file's byte order. Int64 arrays carry Int32 values, widened here. */
function payload(a: OutArray, bigEndian: boolean): Uint8Array {
  let v: OutValues = a.values;
  if (a.type === 'Int64') {
    const w = new Int32Array(v.length * 2);
    for (let i = 0; i < v.length; i++) {
      const x = v[i]!;
      w[2 * i] = x;
      w[2 * i + 1] = x < 0 ? -1 : 0;
    }
    v = w;
  }
  const b = new Uint8Array(v.buffer, v.byteOffset, v.byteLength);
  const size = elementSize(a.type);
  if (!bigEndian || size === 1) return b;
  const c = b.slice();
  swapBytes(c, size);
  return c;
}

function headerBytes(values: number[], s: Settings): Uint8Array {
  const hs = s.header64 ? 8 : 4;
  const out = new Uint8Array(values.length * hs);
  const dv = new DataView(out.buffer);
  const le = !s.bigEndian;
  values.forEach((v, i) => {
    if (hs === 4) {
      if (v >= TWO32) throw new UsageError(`an array of ${v} bytes needs headerType UInt64`);
      dv.setUint32(i * 4, v, le);
    } else {
      const hi = Math.floor(v / TWO32);
      dv.setUint32(i * 8 + (le ? 0 : 4), v - hi * TWO32, le);
      dv.setUint32(i * 8 + (le ? 4 : 0), hi, le);
    }
  });
  return out;
}

/**
 * An array's binary form as base64 streams: uncompressed, one stream of header and data;
 * compressed, the block table on its own, then the compressed blocks.
 */
function binaryStreams(a: OutArray, s: Settings): Uint8Array[][] {
  const data = payload(a, s.bigEndian);
  if (!s.compress) return [[headerBytes([data.length], s), data]];
  const bs = s.blockSize;
  const nb = Math.ceil(data.length / bs);
  const blocks: Uint8Array[] = [];
  // level 1: as small as the default level on mesh arrays here, and about twice as fast
  for (let k = 0; k < nb; k++) blocks.push(zlibSync(data.subarray(k * bs, Math.min(data.length, (k + 1) * bs)), { level: 1 }));
  const table = headerBytes([nb, bs, data.length % bs, ...blocks.map((b) => b.length)], s);
  return [[table], blocks];
}

function streamsLength(streams: Uint8Array[][], base64: boolean): number {
  let n = 0;
  for (const st of streams) {
    let m = 0;
    for (const part of st) m += part.length;
    n += base64 ? base64Length(m) : m;
  }
  return n;
}

function encodeBase64(streams: Uint8Array[][]): Uint8Array {
  const out = new Uint8Array(streamsLength(streams, true));
  const w = new Base64Writer(out, 0);
  for (const st of streams) {
    for (const part of st) w.push(part);
    w.flush();
  }
  return out;
}

/** ASCII text of an array, a few values per line, as encoded chunks. */
function asciiChunks(a: OutArray, indent: string, out: Uint8Array[]): void {
  const v = a.values;
  const perLine = a.components * Math.max(1, Math.floor(6 / a.components));
  let text = '';
  for (let i = 0; i < v.length; i += perLine) {
    const end = Math.min(v.length, i + perLine);
    let line = indent;
    for (let k = i; k < end; k++) line += (k > i ? ' ' : '') + formatNumber(v[k]!);
    text += line + '\n';
    if (text.length > 65536) {
      out.push(textEncoder.encode(text));
      text = '';
    }
  }
  if (text.length > 0) out.push(textEncoder.encode(text));
}

function checkArray(a: DataArray, tuples: number, where: string): void {
  if (!(a.components >= 1) || a.values.length !== tuples * a.components) {
    throw new UsageError(`${where} array "${a.name}" has ${a.values.length} values; ${tuples} tuples of ${a.components} expected`);
  }
}

/** The mesh's arrays with `extra` ones added; an extra array replaces a mesh array of the same name. */
function withExtra(own: DataArray[], extra: DataArray[] | undefined, tuples: number, where: string): OutArray[] {
  const list = [...own.filter((a) => !(extra ?? []).some((e) => e.name === a.name)), ...(extra ?? [])];
  return list.map((a) => {
    checkArray(a, tuples, where);
    return { name: a.name, type: a.values instanceof Float32Array ? 'Float32' : 'Float64', components: a.components, values: a.values };
  });
}

function settingsOf(options: VtuWriteOptions): Settings {
  const blockSize = options.blockSize ?? 32768;
  if (!Number.isInteger(blockSize) || blockSize < 1) throw new UsageError(`blockSize must be a positive integer, got ${blockSize}`);
  return {
    encoding: options.encoding ?? 'appended-raw',
    compress: options.compress ?? false,
    header64: options.headerType === 'UInt64',
    bigEndian: options.byteOrder === 'BigEndian',
    blockSize,
  };
}

export function writeVtu(
  mesh: Mesh,
  extra: { pointData?: DataArray[]; cellData?: DataArray[]; time?: number } = {},
  options: VtuWriteOptions = {},
): Uint8Array {
  const s = settingsOf(options);
  const idType: OutType = options.intType === 'Int64' ? 'Int64' : 'Int32';
  const nPoints = mesh.nPoints;
  const nCells = mesh.nCells;
  const xyz = new Float64Array(nPoints * 3);
  for (let i = 0; i < nPoints; i++) {
    xyz[3 * i] = mesh.points[2 * i]!;
    xyz[3 * i + 1] = mesh.points[2 * i + 1]!;
  }
  const time = extra.time ?? mesh.time;
  const sections: Array<{ tag: string; attrs?: string; arrays: OutArray[] }> = [];
  if (time !== undefined) {
    sections.push({ tag: 'FieldData', arrays: [{ name: 'TimeValue', type: 'Float64', components: 1, values: Float64Array.of(time), attrs: ' NumberOfTuples="1"' }] });
  }
  sections.push(
    { tag: 'PointData', arrays: withExtra(mesh.pointData, extra.pointData, nPoints, 'point') },
    { tag: 'CellData', arrays: withExtra(mesh.cellData, extra.cellData, nCells, 'cell') },
    { tag: 'Points', arrays: [{ name: 'Points', type: 'Float64', components: 3, values: xyz }] },
    {
      tag: 'Cells',
      arrays: [
        { name: 'connectivity', type: idType, components: 1, values: mesh.cellNodes.subarray(0, mesh.cellOffsets[nCells]) },
        { name: 'offsets', type: idType, components: 1, values: mesh.cellOffsets.subarray(1, nCells + 1) },
        { name: 'types', type: 'UInt8', components: 1, values: mesh.cellTypes.subarray(0, nCells) },
      ],
    },
  );
  return assemble(sections, nPoints, nCells, s);
}

function assemble(sections: Array<{ tag: string; arrays: OutArray[] }>, nPoints: number, nCells: number, s: Settings): Uint8Array {
  const appended = s.encoding === 'appended-raw' || s.encoding === 'appended-base64';
  const b64 = s.encoding !== 'appended-raw';
  const binary = s.encoding !== 'ascii';
  const chunks: Uint8Array[] = [];
  const tail: Uint8Array[] = [];
  let text = '';
  const flushText = (): void => {
    if (text.length > 0) chunks.push(textEncoder.encode(text));
    text = '';
  };
  text += '<?xml version="1.0"?>\n';
  text += `<VTKFile type="UnstructuredGrid" version="1.0" byte_order="${s.bigEndian ? 'BigEndian' : 'LittleEndian'}" header_type="${s.header64 ? 'UInt64' : 'UInt32'}"`;
  text += binary && s.compress ? ' compressor="vtkZLibDataCompressor">\n' : '>\n';
  text += '  <UnstructuredGrid>\n';
  let offset = 0;
  for (const sec of sections) {
    if (sec.tag === 'PointData') text += `    <Piece NumberOfPoints="${nPoints}" NumberOfCells="${nCells}">\n`;
    const ind = sec.tag === 'FieldData' ? '    ' : '      ';
    text += `${ind}<${sec.tag}>\n`;
    for (const a of sec.arrays) {
      const head = `${ind}  <DataArray type="${a.type}" Name="${escapeAttr(a.name)}" NumberOfComponents="${a.components}"${a.attrs ?? ''}`;
      if (!binary) {
        text += `${head} format="ascii">\n`;
        flushText();
        asciiChunks(a, `${ind}    `, chunks);
        text += `${ind}  </DataArray>\n`;
        continue;
      }
      const streams = binaryStreams(a, s);
      if (appended) {
        text += `${head} format="appended" offset="${offset}"/>\n`;
        offset += streamsLength(streams, b64);
        if (b64) tail.push(encodeBase64(streams));
        else for (const st of streams) tail.push(...st);
      } else {
        text += `${head} format="binary">\n${ind}    `;
        flushText();
        chunks.push(encodeBase64(streams));
        text += `\n${ind}  </DataArray>\n`;
      }
    }
    text += `${ind}</${sec.tag}>\n`;
  }
  text += '    </Piece>\n  </UnstructuredGrid>\n';
  if (appended) {
    text += `  <AppendedData encoding="${b64 ? 'base64' : 'raw'}">\n   _`;
    flushText();
    chunks.push(...tail);
    text += '\n  </AppendedData>\n';
  }
  text += '</VTKFile>\n';
  flushText();
  let total = 0;
  for (const c of chunks) total += c.length;
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.length;
  }
  return out;
}
