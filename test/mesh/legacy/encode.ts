/**
 * A small legacy VTK writer used only by the tests: ASCII or big-endian BINARY, the 4.x
 * counted cell layout or the 5.x OFFSETS/CONNECTIVITY layout, UNSTRUCTURED_GRID or POLYDATA.
 * It writes exactly what the spec says (counts included), so tests can also build bad files.
 */

export interface ArraySpec {
  name: string;
  type: string;
  components?: number;
  values: readonly number[];
}

export type AttributeSpec =
  | { kind: 'SCALARS'; name: string; type: string; components?: number; lookupTable?: string; values: readonly number[] }
  | { kind: 'VECTORS' | 'NORMALS' | 'TENSORS' | 'GLOBAL_IDS'; name: string; type: string; values: readonly number[] }
  | { kind: 'TEXTURE_COORDINATES'; name: string; dim: number; type: string; values: readonly number[] }
  /** Colours in [0, 1]; bytes of round(255 v) in binary files. */
  | { kind: 'COLOR_SCALARS'; name: string; nValues: number; values: readonly number[] }
  | { kind: 'LOOKUP_TABLE'; name: string; values: readonly number[] }
  | { kind: 'FIELD'; name: string; arrays: ArraySpec[] }
  | { kind: 'METADATA'; lines: string[] };

export interface AttributeBlock {
  section: 'POINT_DATA' | 'CELL_DATA';
  count: number;
  items: AttributeSpec[];
}

export interface LegacySpec {
  /** Header version, default 4.2. */
  version?: string;
  /** Default: 'offsets' when the version starts with 5, else 'counted'. */
  layout?: 'counted' | 'offsets';
  binary?: boolean;
  /** Newline after each binary block (default true). */
  newlineAfterBinary?: boolean;
  /** ASCII values per line (default 7, so values wrap across lines). */
  perLine?: number;
  dataset?: 'UNSTRUCTURED_GRID' | 'POLYDATA';
  title?: string;
  /** Arrays of a dataset-level FIELD FieldData block. */
  fieldData?: ArraySpec[];
  points: { type: string; xyz: readonly number[] };
  /** UNSTRUCTURED_GRID cells (with types) or POLYDATA polygons. */
  cells: readonly (readonly number[])[];
  cellTypes?: readonly number[];
  verts?: readonly (readonly number[])[];
  lines?: readonly (readonly number[])[];
  /** Type of OFFSETS and CONNECTIVITY in the 5.x layout (default vtktypeint64). */
  offsetsType?: string;
  attributes?: AttributeBlock[];
}

class Out {
  private chunks: Uint8Array[] = [];
  private readonly enc = new TextEncoder();
  constructor(private readonly spec: LegacySpec) {}

  line(s: string): void {
    this.chunks.push(this.enc.encode(s + '\n'));
  }

  values(type: string, vals: readonly number[]): void {
    if (!this.spec.binary) {
      const per = this.spec.perLine ?? 7;
      for (let i = 0; i < vals.length; i += per) this.line(vals.slice(i, i + per).map((v) => String(v)).join(' '));
      return;
    }
    this.chunks.push(bigEndian(type, vals));
    if (this.spec.newlineAfterBinary ?? true) this.line('');
  }

  bytes(): Uint8Array {
    return concatBytes(this.chunks);
  }
}

/** Text (as UTF-8), byte arrays and lists of byte values, one after the other. */
export function concatBytes(parts: readonly (string | Uint8Array | readonly number[])[]): Uint8Array {
  const chunks = parts.map((p) => (typeof p === 'string' ? new TextEncoder().encode(p) : Uint8Array.from(p)));
  const out = new Uint8Array(chunks.reduce((n, c) => n + c.length, 0));
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.length;
  }
  return out;
}

const SIZES: Record<string, number> = {
  char: 1, signed_char: 1, unsigned_char: 1, vtktypeint8: 1, vtktypeuint8: 1,
  short: 2, unsigned_short: 2, vtktypeint16: 2, vtktypeuint16: 2,
  int: 4, unsigned_int: 4, vtktypeint32: 4, vtktypeuint32: 4, vtkidtype: 4, float: 4,
  long: 8, unsigned_long: 8, vtktypeint64: 8, vtktypeuint64: 8, double: 8,
};

/** Values of `type` as big-endian bytes, written with DataView (independent of the reader's swap). */
export function bigEndian(type: string, vals: readonly number[]): Uint8Array {
  const t = type.toLowerCase();
  const size = SIZES[t];
  if (size === undefined) throw new Error(`encode: no binary form for type ${type}`);
  const out = new Uint8Array(vals.length * size);
  const dv = new DataView(out.buffer);
  vals.forEach((v, i) => {
    const p = i * size;
    switch (t) {
      case 'char': case 'signed_char': case 'vtktypeint8': dv.setInt8(p, v); break;
      case 'unsigned_char': case 'vtktypeuint8': dv.setUint8(p, v); break;
      case 'short': case 'vtktypeint16': dv.setInt16(p, v, false); break;
      case 'unsigned_short': case 'vtktypeuint16': dv.setUint16(p, v, false); break;
      case 'int': case 'vtktypeint32': case 'vtkidtype': dv.setInt32(p, v, false); break;
      case 'unsigned_int': case 'vtktypeuint32': dv.setUint32(p, v, false); break;
      case 'long': case 'vtktypeint64': dv.setBigInt64(p, BigInt(v), false); break;
      case 'unsigned_long': case 'vtktypeuint64': dv.setBigUint64(p, BigInt(v), false); break;
      case 'float': dv.setFloat32(p, v, false); break;
      default: dv.setFloat64(p, v, false);
    }
  });
  return out;
}

function writeCells(out: Out, spec: LegacySpec, keyword: string, cells: readonly (readonly number[])[]): void {
  const sum = cells.reduce((s, c) => s + c.length, 0);
  const layout = spec.layout ?? ((spec.version ?? '4.2').startsWith('5') ? 'offsets' : 'counted');
  if (layout === 'counted') {
    out.line(`${keyword} ${cells.length} ${cells.length + sum}`);
    out.values('int', cells.flatMap((c) => [c.length, ...c]));
    return;
  }
  const type = spec.offsetsType ?? 'vtktypeint64';
  const offsets = [0];
  for (const c of cells) offsets.push(offsets[offsets.length - 1]! + c.length);
  out.line(`${keyword} ${offsets.length} ${sum}`);
  out.line(`OFFSETS ${type}`);
  out.values(type, offsets);
  out.line(`CONNECTIVITY ${type}`);
  out.values(type, cells.flat());
}

function writeField(out: Out, name: string, arrays: ArraySpec[]): void {
  out.line(`FIELD ${name} ${arrays.length}`);
  for (const a of arrays) {
    const comps = a.components ?? 1;
    out.line(`${a.name} ${comps} ${a.values.length / comps} ${a.type}`);
    out.values(a.type, a.values);
  }
}

function writeAttribute(out: Out, spec: LegacySpec, item: AttributeSpec): void {
  switch (item.kind) {
    case 'SCALARS':
      out.line(`SCALARS ${item.name} ${item.type}${item.components !== undefined ? ` ${item.components}` : ''}`);
      if (item.lookupTable !== undefined) out.line(`LOOKUP_TABLE ${item.lookupTable}`);
      out.values(item.type, item.values);
      break;
    case 'TEXTURE_COORDINATES':
      out.line(`TEXTURE_COORDINATES ${item.name} ${item.dim} ${item.type}`);
      out.values(item.type, item.values);
      break;
    case 'COLOR_SCALARS':
    case 'LOOKUP_TABLE': {
      const m = item.kind === 'COLOR_SCALARS' ? item.nValues : item.values.length / 4;
      out.line(`${item.kind} ${item.name} ${m}`);
      out.values(spec.binary ? 'unsigned_char' : 'float', spec.binary ? item.values.map((v) => Math.round(v * 255)) : item.values);
      break;
    }
    case 'FIELD':
      writeField(out, item.name, item.arrays);
      break;
    case 'METADATA':
      out.line('METADATA');
      for (const l of item.lines) out.line(l);
      out.line('');
      break;
    default:
      out.line(`${item.kind} ${item.name} ${item.type}`);
      out.values(item.type, item.values);
  }
}

export function encodeLegacy(spec: LegacySpec): Uint8Array {
  const out = new Out(spec);
  const dataset = spec.dataset ?? 'UNSTRUCTURED_GRID';
  out.line(`# vtk DataFile Version ${spec.version ?? '4.2'}`);
  out.line(spec.title ?? 'test mesh');
  out.line(spec.binary ? 'BINARY' : 'ASCII');
  out.line(`DATASET ${dataset}`);
  if (spec.fieldData) writeField(out, 'FieldData', spec.fieldData);
  out.line(`POINTS ${spec.points.xyz.length / 3} ${spec.points.type}`);
  out.values(spec.points.type, spec.points.xyz);
  if (dataset === 'UNSTRUCTURED_GRID') {
    writeCells(out, spec, 'CELLS', spec.cells);
    out.line(`CELL_TYPES ${spec.cellTypes?.length ?? 0}`);
    out.values('int', spec.cellTypes ?? []);
  } else {
    if (spec.verts) writeCells(out, spec, 'VERTICES', spec.verts);
    if (spec.lines) writeCells(out, spec, 'LINES', spec.lines);
    writeCells(out, spec, 'POLYGONS', spec.cells);
  }
  for (const block of spec.attributes ?? []) {
    out.line(`${block.section} ${block.count}`);
    for (const item of block.items) writeAttribute(out, spec, item);
  }
  return out.bytes();
}

/** Byte offset of the first occurrence of `text`, or -1. */
export function indexOfText(bytes: Uint8Array, text: string, from = 0): number {
  const f = new TextEncoder().encode(text);
  outer: for (let i = from; i + f.length <= bytes.length; i++) {
    for (let k = 0; k < f.length; k++) if (bytes[i + k] !== f[k]) continue outer;
    return i;
  }
  return -1;
}

/** Replace the first occurrence of the text `from` (e.g. a keyword line) in a file's bytes. */
export function replaceText(bytes: Uint8Array, from: string, to: string): Uint8Array {
  const i = indexOfText(bytes, from);
  if (i < 0) throw new Error(`replaceText: "${from}" not found`);
  const t = new TextEncoder().encode(to);
  const n = new TextEncoder().encode(from).length;
  const out = new Uint8Array(bytes.length - n + t.length);
  out.set(bytes.subarray(0, i), 0);
  out.set(t, i);
  out.set(bytes.subarray(i + n), i + t.length);
  return out;
}
