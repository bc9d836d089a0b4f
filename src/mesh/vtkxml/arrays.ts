/**
 * Reading one VTK XML DataArray in any of its encodings: ascii text, inline base64, appended
 * raw or base64, each optionally zlib-compressed in blocks.
 */
import { unzlibSync } from 'fflate';
import { MeshInputError, type ErrorLocation } from '../errors.js';
import type { FieldValues } from '../model.js';
import { Scanner, isSpace, lineAt } from '../scan.js';
import { Base64Reader } from './base64.js';
import { fieldValues, indexValues, numType, typeSize, TWO32, type NumType } from './types.js';
import type { XmlElement } from './xml.js';

/** File-wide settings that decide how array bytes are laid out. */
export interface ArrayContext {
  bytes: Uint8Array;
  file: string;
  bigEndian: boolean;
  /** Header integers are UInt64 (else UInt32). */
  header64: boolean;
  /** null: not compressed; otherwise the compressor named by the file. */
  compressor: string | null;
  /** Start of the appended data (the byte after '_'), or -1 when the file has none. */
  appendedStart: number;
  appendedEncoding: 'raw' | 'base64';
  /**
   * Raw appended data read in place from the file: `bytes` then holds only the XML head, and
   * each array is read at its own offset into a buffer of its own (aligned, so viewed without
   * a copy; and files over the buffer limit can be read).
   */
  appended?: AppendedAccess;
  /** zlib inflation to use instead of the built-in one (the CLI passes Node's native zlib). */
  inflate?: Inflate;
}

/** Inflate one zlib stream into `out`; returns the bytes written (throws on bad data or overflow). */
export type Inflate = (src: Uint8Array, out: Uint8Array) => number;

/** Access to the raw appended data of a file that is not held in memory as a whole. */
export interface AppendedAccess {
  /** Size of the whole file in bytes. */
  fileSize: number;
  /** Bytes of the file from `fileOffset` on. */
  open(fileOffset: number): ByteSource;
}

export const ZLIB = 'vtkZLibDataCompressor';

/** zlib cannot expand data by more than about 1032:1; a block table claiming more is lying. */
const MAX_INFLATE_RATIO = 1040;

/**
 * How many values an array must hold: one count, or any of a few. Always known before reading,
 * so that no size claimed by the file is allocated before it is checked.
 */
export type Expect = number | readonly number[];

function expected(n: number, expect: Expect): boolean {
  return typeof expect === 'number' ? n === expect : expect.includes(n);
}

function describe(expect: Expect): string {
  return typeof expect === 'number' ? String(expect) : expect.join(' or ');
}

export type ArrayEncoding = 'ascii' | 'binary' | 'appended-raw' | 'appended-base64';

export interface ArrayInfo {
  el: XmlElement;
  name: string;
  type: NumType;
  components: number;
  encoding: ArrayEncoding;
  /** Where the array's data starts, for messages. */
  loc: ErrorLocation;
}

export function attrInt(ctx: ArrayContext, el: XmlElement, key: string, fallback: number | null): number {
  const s = el.attrs.get(key);
  if (s === undefined) {
    if (fallback === null) throw new MeshInputError(`<${el.name}> has no ${key} attribute`, { file: ctx.file, byteOffset: el.start });
    return fallback;
  }
  const t = s.trim();
  const v = /^[+]?\d+$/.test(t) ? Number(t) : NaN;
  if (!Number.isSafeInteger(v)) {
    throw new MeshInputError(`${key}="${s}" of <${el.name}> is not a non-negative integer`, { file: ctx.file, byteOffset: el.start });
  }
  return v;
}

/** A location whose line number (a pass over the file) is found only when a message reads it. */
function lazyLine(bytes: Uint8Array, file: string, at: number): ErrorLocation {
  let line: number | undefined;
  return {
    file,
    get line(): number {
      line ??= lineAt(bytes, at);
      return line;
    },
  };
}

/** Type, encoding and location of a DataArray; null for non-numeric arrays (String, Bit). */
export function arrayInfo(ctx: ArrayContext, el: XmlElement): ArrayInfo | null {
  const file = ctx.file;
  const typeName = el.attrs.get('type') ?? '';
  const type = numType(typeName);
  if (type === null) {
    if (typeName === 'String' || typeName === 'Bit') return null;
    throw new MeshInputError(`DataArray has an unknown type "${typeName}"`, { file, byteOffset: el.start });
  }
  const name = el.attrs.get('Name') ?? '';
  const components = attrInt(ctx, el, 'NumberOfComponents', 1);
  if (components < 1) throw new MeshInputError(`DataArray "${name}" has ${components} components`, { file, byteOffset: el.start });
  const format = (el.attrs.get('format') ?? (el.attrs.has('offset') ? 'appended' : 'ascii')).trim();
  let encoding: ArrayEncoding;
  let loc: ErrorLocation | null = null;
  if (format === 'ascii') {
    encoding = 'ascii';
  } else if (format === 'binary') {
    encoding = 'binary';
    loc = { file, byteOffset: el.textStart };
  } else if (format === 'appended') {
    if (ctx.appendedStart < 0) throw new MeshInputError(`DataArray "${name}" is appended but the file has no AppendedData section`, { file, byteOffset: el.start });
    encoding = ctx.appendedEncoding === 'raw' ? 'appended-raw' : 'appended-base64';
    const offset = attrInt(ctx, el, 'offset', null);
    const size = (ctx.appended?.fileSize ?? ctx.bytes.length) - ctx.appendedStart;
    if (offset >= size) {
      throw new MeshInputError(`DataArray "${name}" has offset ${offset}, beyond the end of the appended data (${size} bytes)`, { file, byteOffset: el.start });
    }
    loc = { file, byteOffset: ctx.appendedStart + offset };
  } else {
    throw new MeshInputError(`DataArray "${name}" has an unknown format "${format}"`, { file, byteOffset: el.start });
  }
  return { el, name, type, components, encoding, loc: loc ?? lazyLine(ctx.bytes, file, el.textStart) };
}

/** Bytes of an array's binary data, read through the file's header integers. */
export interface ByteSource {
  /** An upper bound of the bytes left. */
  available(): number;
  read(n: number, what: string): Uint8Array;
  /** Byte offset in the file of the next byte (approximate for base64). */
  at(): number;
  /** True when `read` returns fresh memory the caller may modify. */
  readonly owned: boolean;
}

class RawSource implements ByteSource {
  readonly owned = false;
  constructor(private readonly bytes: Uint8Array, private pos: number, private readonly file: string) {}
  available(): number {
    return this.bytes.length - this.pos;
  }
  read(n: number, what: string): Uint8Array {
    if (n > this.available()) {
      throw new MeshInputError(`${what} needs ${n} bytes but only ${this.available()} remain in the file`, { file: this.file, byteOffset: this.pos });
    }
    const out = this.bytes.subarray(this.pos, this.pos + n);
    this.pos += n;
    return out;
  }
  at(): number {
    return this.pos;
  }
}

class Base64Source implements ByteSource {
  readonly owned = true;
  private readonly r: Base64Reader;
  constructor(bytes: Uint8Array, start: number, end: number, file: string) {
    this.r = new Base64Reader(bytes, start, end, file);
  }
  available(): number {
    return this.r.available();
  }
  read(n: number, what: string): Uint8Array {
    return this.r.read(n, what);
  }
  at(): number {
    return this.r.pos;
  }
}

/** `count` header integers (UInt32 or UInt64 in the file's byte order) starting at `at`. */
function headerInts(ctx: ArrayContext, src: ByteSource, count: number, what: string): number[] {
  const hs = ctx.header64 ? 8 : 4;
  const at = src.at();
  const b = src.read(count * hs, what);
  const dv = new DataView(b.buffer, b.byteOffset, b.length);
  const le = !ctx.bigEndian;
  const out: number[] = new Array<number>(count);
  for (let i = 0; i < count; i++) {
    let v: number;
    if (hs === 4) {
      v = dv.getUint32(i * 4, le);
    } else {
      const lo = dv.getUint32(i * 8 + (le ? 0 : 4), le);
      const hi = dv.getUint32(i * 8 + (le ? 4 : 0), le);
      v = hi * TWO32 + lo;
      if (hi >= 0x200000) throw new MeshInputError(`${what} holds an impossible size ${v}`, { file: ctx.file, byteOffset: at });
    }
    out[i] = v;
  }
  return out;
}

function inflateBlocks(ctx: ArrayContext, src: ByteSource, name: string, expect: Expect, elemSize: number): Uint8Array {
  const file = ctx.file;
  const tableAt = src.at();
  const [nb, blockSize, lastSize] = headerInts(ctx, src, 3, `the block table of "${name}"`) as [number, number, number];
  const hs = ctx.header64 ? 8 : 4;
  if (nb * hs > src.available()) {
    throw new MeshInputError(`"${name}" claims ${nb} compressed blocks, more than the file holds`, { file, byteOffset: tableAt });
  }
  const sizes = nb > 0 ? headerInts(ctx, src, nb, `the block table of "${name}"`) : [];
  if (nb > 0 && (lastSize > blockSize || blockSize === 0)) {
    throw new MeshInputError(`"${name}" has an invalid block table (block size ${blockSize}, last block ${lastSize})`, { file, byteOffset: tableAt });
  }
  const total = nb === 0 ? 0 : (nb - 1) * blockSize + (lastSize === 0 ? blockSize : lastSize);
  let compressed = 0;
  for (const s of sizes) compressed += s;
  const dataAt = src.at();
  if (compressed > src.available()) {
    throw new MeshInputError(`compressed blocks of "${name}" need ${compressed} bytes but at most ${src.available()} remain`, { file, byteOffset: dataAt });
  }
  if (total > compressed * MAX_INFLATE_RATIO + 64 * nb) {
    throw new MeshInputError(`"${name}" claims ${total} bytes from ${compressed} compressed bytes, more than zlib can expand`, { file, byteOffset: tableAt });
  }
  checkByteCount(ctx, name, total, expect, elemSize, tableAt);
  const comp = src.read(compressed, `compressed blocks of "${name}"`);
  // one spare byte lets a block that inflates too far show itself
  let out: Uint8Array;
  try {
    out = new Uint8Array(total + 1);
  } catch {
    throw new MeshInputError(`"${name}" inflates to ${total} bytes, more memory than is available`, { file, byteOffset: tableAt });
  }
  let ci = 0;
  let oi = 0;
  for (let k = 0; k < nb; k++) {
    const want = k === nb - 1 && lastSize !== 0 ? lastSize : blockSize;
    const blockAt = src.owned ? dataAt : dataAt + ci;
    let got: number;
    try {
      const block = comp.subarray(ci, ci + sizes[k]!), room = out.subarray(oi, oi + want + 1);
      got = ctx.inflate ? ctx.inflate(block, room) : unzlibSync(block, { out: room }).length;
    } catch (e) {
      throw new MeshInputError(`block ${k + 1} of ${nb} of "${name}" does not inflate (${e instanceof Error ? e.message : String(e)})`, { file, byteOffset: blockAt });
    }
    if (got !== want) {
      throw new MeshInputError(`block ${k + 1} of ${nb} of "${name}" inflates to ${got > want ? 'more than ' + want : got} bytes, ${want} expected`, { file, byteOffset: blockAt });
    }
    ci += sizes[k]!;
    oi += want;
  }
  return out.subarray(0, total);
}

function checkByteCount(ctx: ArrayContext, name: string, nBytes: number, expect: Expect, elemSize: number, at: number): void {
  if (nBytes % elemSize !== 0) {
    throw new MeshInputError(`"${name}" holds ${nBytes} bytes, not a whole number of ${elemSize}-byte values`, { file: ctx.file, byteOffset: at });
  }
  if (!expected(nBytes / elemSize, expect)) {
    throw new MeshInputError(`"${name}" holds ${nBytes / elemSize} values, ${describe(expect)} expected`, { file: ctx.file, byteOffset: at });
  }
}

/** The decoded bytes of a binary or appended array, and whether they are fresh memory. */
function binaryBytes(ctx: ArrayContext, info: ArrayInfo, expect: Expect): { data: Uint8Array; owned: boolean } {
  const { el, name } = info;
  const size = typeSize(info.type);
  let src: ByteSource;
  if (info.encoding === 'binary') src = new Base64Source(ctx.bytes, el.textStart, el.textEnd, ctx.file);
  else if (ctx.appended) {
    if (info.encoding === 'appended-base64') {
      throw new MeshInputError(`"${name}": appended base64 data is read only from files that fit in one buffer; write the file with raw appended data`, info.loc);
    }
    src = ctx.appended.open(info.loc.byteOffset!);
  } else if (info.encoding === 'appended-base64') src = new Base64Source(ctx.bytes, info.loc.byteOffset!, ctx.bytes.length, ctx.file);
  else src = new RawSource(ctx.bytes, info.loc.byteOffset!, ctx.file);
  if (ctx.compressor !== null) {
    if (ctx.compressor !== ZLIB) {
      throw new MeshInputError(`unsupported compressor "${ctx.compressor}" (only ${ZLIB} is read)`, { file: ctx.file, byteOffset: src.at() });
    }
    return { data: inflateBlocks(ctx, src, name, expect, size), owned: true };
  }
  const headerAt = src.at();
  const [nBytes] = headerInts(ctx, src, 1, `the size header of "${name}"`) as [number];
  if (nBytes > src.available()) {
    throw new MeshInputError(`"${name}" claims ${nBytes} bytes but at most ${src.available()} remain`, { file: ctx.file, byteOffset: headerAt });
  }
  checkByteCount(ctx, name, nBytes, expect, size, headerAt);
  return { data: src.read(nBytes, `"${name}"`), owned: src.owned };
}

/** Number of whitespace-separated tokens in bytes[start, end). */
function countTokens(b: Uint8Array, start: number, end: number): number {
  let n = 0;
  let inTok = false;
  for (let p = start; p < end; p++) {
    const sp = isSpace(b[p]!);
    if (!sp && !inTok) n++;
    inTok = !sp;
  }
  return n;
}

function asciiValues(ctx: ArrayContext, info: ArrayInfo, expect: Expect, float32: boolean): FieldValues {
  const { el, name } = info;
  const { textStart, textEnd } = el;
  // every value takes at least two bytes (a digit and a separator): a cheap bound before counting
  const fewest = typeof expect === 'number' ? expect : Math.min(...expect);
  if (fewest > (textEnd - textStart + 1) / 2) {
    throw new MeshInputError(`"${name}" should hold ${describe(expect)} values but its text is only ${textEnd - textStart} bytes`, info.loc);
  }
  const n = countTokens(ctx.bytes, textStart, textEnd);
  if (!expected(n, expect)) {
    throw new MeshInputError(`"${name}" holds ${n} values, ${describe(expect)} expected`, info.loc);
  }
  const out = float32 ? new Float32Array(n) : new Float64Array(n);
  const sc = new Scanner(ctx.bytes, ctx.file, textStart, textEnd);
  const what = `a value of "${name}"`;
  for (let i = 0; i < n; i++) out[i] = sc.number(what);
  return out;
}

/** Field values (Float32Array for Float32 arrays, else Float64Array), as many as `expect` says. */
export function readField(ctx: ArrayContext, info: ArrayInfo, expect: Expect): FieldValues {
  if (info.encoding === 'ascii') return asciiValues(ctx, info, expect, info.type === 'Float32');
  const { data, owned } = binaryBytes(ctx, info, expect);
  return fieldValues(data, info.type, ctx.bigEndian, owned);
}

/** Integer-valued arrays (connectivity, offsets, types), as compact as their file type allows. */
export function readIndices(ctx: ArrayContext, info: ArrayInfo, expect: Expect): ArrayLike<number> {
  if (info.encoding === 'ascii') return asciiValues(ctx, info, expect, false);
  const { data, owned } = binaryBytes(ctx, info, expect);
  return indexValues(data, info.type, ctx.bigEndian, owned, (i, v) => {
    throw new MeshInputError(`value ${i} of "${info.name}" is ${v}, outside the 32-bit range`, info.loc);
  });
}
