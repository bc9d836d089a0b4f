/**
 * Reading a mesh file of any size. A VTK XML file with raw appended data is read in place: its
 * XML head first, then each array at its own offset with fs.readSync, decoded by the same core
 * code (so files over Node's 4 GiB buffer limit are read too). Other files are read whole and
 * handed to readMesh, up to the buffer limit; beyond it they are refused with their size. Node only.
 */
import * as fs from 'node:fs';
import { inputStat } from './files.js';
import { constants as bufferConstants } from 'node:buffer';
import * as zlib from 'node:zlib';
import { MeshInputError } from '../mesh/errors.js';
import { readBuffer } from '../mesh/alloc.js';
import { readFully, SplitReader, SPLIT_READ_MIN } from './split-read.js';
import type { Mesh } from '../mesh/model.js';
import { readMesh } from '../mesh/read.js';
import { readVtkXml } from '../mesh/vtkxml/index.js';
import type { AppendedAccess, ByteSource, Inflate } from '../mesh/vtkxml/arrays.js';

/** Largest file read into one buffer (Node's limit for one Buffer). */
export const BUFFER_LIMIT = bufferConstants.MAX_LENGTH;

/** The XML head of a file read in place is looked for within this many bytes. */
const HEAD_LIMIT = 64 * 2 ** 20;
const HEAD_STEP = 2 ** 20;

/** Node's native zlib, several times faster than the portable inflater of the core. */
export const nativeInflate: Inflate = (src, out) => {
  const r = zlib.inflateSync(src, { maxOutputLength: out.length });
  out.set(r);
  return r.length;
};

export interface ReadFileOptions {
  /** Files larger than this are not read whole (default BUFFER_LIMIT; lowered by tests). */
  bufferLimit?: number;
  /** Above 1: large arrays of raw appended data are read by two threads (into shared memory). */
  threads?: number;
  /** Told of every file read: the mesh file, then its sibling or pieces (outputs must not overwrite them). */
  onFile?: (name: string) => void;
}

function openInput(file: string): { fd: number; size: number } {
  const st = inputStat(file);
  return { fd: fs.openSync(file, 'r'), size: st.size };
}

/** Splits large reads over two threads while a file is read with threads (see readMeshFile). */
let splitter: SplitReader | null = null;

/** Fill `out` from the file at `position`; fails at a short read (the file changed or ended). */
function readAt(fd: number, out: Uint8Array, position: number, file: string): void {
  const done = splitter ? splitter.read(fd, out, position) : readFully(fd, out, position);
  if (done < out.length) throw new MeshInputError(`the file ends at byte ${position + done}, before the ${out.length} bytes expected there`, { file, byteOffset: position + done });
}

/** Bytes of a file from one offset on, read only as they are asked for. */
class FileSource implements ByteSource {
  readonly owned = true;
  constructor(private readonly fd: number, private readonly size: number, private pos: number, private readonly file: string) {}
  available(): number {
    return this.size - this.pos;
  }
  read(n: number, what: string): Uint8Array {
    if (n > this.available()) {
      throw new MeshInputError(`${what} needs ${n} bytes but only ${this.available()} remain in the file`, { file: this.file, byteOffset: this.pos });
    }
    const out = readBuffer(n);
    readAt(this.fd, out, this.pos, this.file);
    this.pos += n;
    return out;
  }
  at(): number {
    return this.pos;
  }
}

function indexOfText(bytes: Uint8Array, text: string, from: number, to: number): number {
  const first = text.charCodeAt(0);
  for (let p = bytes.indexOf(first, from); p >= 0 && p + text.length <= to; p = bytes.indexOf(first, p + 1)) {
    let k = 1;
    while (k < text.length && bytes[p + k] === text.charCodeAt(k)) k++;
    if (k === text.length) return p;
  }
  return -1;
}

interface Head {
  /** The bytes read so far (the whole file when it has no appended data within HEAD_LIMIT). */
  bytes: Uint8Array;
  /** Index of the '_' that starts the appended data, or -1. */
  marker: number;
  /** The appended data is raw (not base64). */
  raw: boolean;
}

/** The start of the file, read until the '_' that starts its appended data (or HEAD_LIMIT, or the end). */
function readHead(fd: number, size: number, file: string): Head {
  const end = Math.min(size, HEAD_LIMIT);
  let buf = new Uint8Array(Math.min(end, HEAD_STEP));
  let have = 0;
  let tagAt = -1;
  while (have < end) {
    if (have === buf.length) {
      const grown = new Uint8Array(Math.min(end, 2 * buf.length));
      grown.set(buf);
      buf = grown;
    }
    const n = Math.min(HEAD_STEP, buf.length - have);
    readAt(fd, buf.subarray(have, have + n), have, file);
    const from = Math.max(0, have - 16);
    have += n;
    if (tagAt < 0) tagAt = indexOfText(buf, '<AppendedData', from, have);
    if (tagAt < 0) continue;
    // the '_' marker follows the tag's '>' and optional blanks
    const gt = buf.subarray(0, have).indexOf(62, tagAt);
    if (gt < 0) continue;
    let p = gt + 1;
    while (p < have && (buf[p] === 32 || buf[p] === 9 || buf[p] === 10 || buf[p] === 13)) p++;
    if (p >= have) continue;
    const tag = new TextDecoder('latin1').decode(buf.subarray(tagAt, gt));
    return { bytes: buf.subarray(0, have), marker: buf[p] === 95 ? p : -1, raw: !/encoding\s*=\s*["']base64["']/.test(tag) };
  }
  return { bytes: buf.subarray(0, have), marker: -1, raw: false };
}

function looksLikeVtkXml(fd: number, size: number, file: string): boolean {
  const start = new Uint8Array(Math.min(size, 256));
  readAt(fd, start, 0, file);
  const text = new TextDecoder('latin1').decode(start);
  return /^\s*(\uFEFF|ï»¿)?\s*(<\?xml|<VTKFile|<!--)/.test(text);
}

/** A VTK XML file with raw appended data, read array by array at their offsets. */
function readVtuInPlace(file: string, fd: number, size: number, head: Uint8Array): Mesh {
  const access: AppendedAccess = { fileSize: size, open: (offset) => new FileSource(fd, size, offset, file) };
  return readVtkXml(head, file, { appended: access, inflate: nativeInflate });
}

function tooLarge(file: string, size: number, limit: number): MeshInputError {
  return new MeshInputError(`file of ${size} bytes is larger than one buffer can hold (${limit} bytes); only VTK XML files with raw appended data are read in parts`, { file });
}

/** The whole file, `start` being its first bytes (already read). */
function readWhole(fd: number, size: number, file: string, start: Uint8Array = new Uint8Array(0)): Uint8Array {
  const bytes = new Uint8Array(size);
  bytes.set(start);
  readAt(fd, bytes.subarray(start.length), start.length, file);
  return bytes;
}

/** Bytes of a sibling file (.node/.ele pair, pieces of a .pvtu), or null when it does not exist. */
export function loadSiblingFile(name: string, options: ReadFileOptions = {}): Uint8Array | null {
  if (!fs.existsSync(name)) return null;
  const { fd, size } = openInput(name);
  options.onFile?.(name);
  try {
    const limit = options.bufferLimit ?? BUFFER_LIMIT;
    if (size > limit) throw tooLarge(name, size, limit);
    return readWhole(fd, size, name);
  } finally {
    fs.closeSync(fd);
  }
}

/**
 * The mesh in `file`, whatever its size. A VTK XML file with raw appended data is read array
 * by array at their offsets (each array lands aligned in its own buffer: no copies, and no
 * buffer for the whole file); any other file is read whole up to `bufferLimit` and refused
 * with its size beyond.
 */
export function readMeshFile(file: string, options: ReadFileOptions = {}): Mesh {
  const limit = options.bufferLimit ?? BUFFER_LIMIT;
  const { fd, size } = openInput(file);
  options.onFile?.(file);
  try {
    let start: Uint8Array | undefined;
    if (size > 0 && looksLikeVtkXml(fd, size, file)) {
      const head = readHead(fd, size, file);
      if (head.marker >= 0 && head.raw) {
        const split = (options.threads ?? 1) > 1 && size >= 4 * SPLIT_READ_MIN;
        if (split) splitter = new SplitReader();
        try {
          return readVtuInPlace(file, fd, size, head.bytes.subarray(0, head.marker + 1));
        } finally {
          if (split && splitter) void splitter.close();
          splitter = null;
        }
      }
      start = head.bytes;
    }
    if (size > limit) throw tooLarge(file, size, limit);
    const bytes = start?.length === size ? start : readWhole(fd, size, file, start);
    return readMesh(bytes, file, { loadSibling: (name) => loadSiblingFile(name, options), inflate: nativeInflate });
  } finally {
    fs.closeSync(fd);
  }
}
