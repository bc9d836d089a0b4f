/** Node-only file handling: guarded reads and writes that never damage the user's files. */
import * as fs from 'node:fs';
import * as path from 'node:path';
import { constants as bufferConstants } from 'node:buffer';
import { UsageError, MeshInputError } from '../mesh/errors.js';

/** The file's stats, or a clear error when it does not exist or is a folder. */
export function inputStat(file: string): fs.Stats {
  let st: fs.Stats;
  try {
    st = fs.statSync(file);
  } catch {
    throw new UsageError(`${file}: no such file`);
  }
  if (st.isDirectory()) throw new UsageError(`${file}: is a folder, not a mesh file`);
  return st;
}

export function readInput(file: string): Uint8Array {
  const st = inputStat(file);
  if (st.size > bufferConstants.MAX_LENGTH) {
    throw new MeshInputError(`file of ${st.size} bytes is larger than one buffer can hold (${bufferConstants.MAX_LENGTH} bytes)`, { file });
  }
  const buf = fs.readFileSync(file);
  return new Uint8Array(buf.buffer, buf.byteOffset, buf.byteLength);
}

function sameFile(a: string, b: string): boolean {
  try {
    const sa = fs.statSync(a), sb = fs.statSync(b);
    return sa.ino === sb.ino && sa.dev === sb.dev;
  } catch {
    return path.resolve(a) === path.resolve(b);
  }
}

/**
 * Write an output through a temporary file and a rename, so a crash leaves no half-written
 * table; refuse to overwrite any of the inputs; a missing folder is a clear error.
 */
export function writeOutput(file: string, inputs: string[], write: (fd: number) => void): void {
  for (const input of inputs) {
    if (sameFile(file, input)) throw new UsageError(`${file}: refusing to overwrite the input file`);
  }
  const dir = path.dirname(path.resolve(file));
  if (!fs.existsSync(dir) || !fs.statSync(dir).isDirectory()) throw new UsageError(`${file}: the folder ${dir} does not exist`);
  const tmp = path.join(dir, `.${path.basename(file)}.${process.pid}.tmp`);
  const fd = fs.openSync(tmp, 'w');
  try {
    write(fd);
    fs.closeSync(fd);
  } catch (e) {
    try { fs.closeSync(fd); } catch { /* already closed */ }
    try { fs.unlinkSync(tmp); } catch { /* nothing to clean */ }
    throw e;
  }
  fs.renameSync(tmp, file);
}

export function writeText(fd: number, s: string): void {
  fs.writeSync(fd, s);
}

export function writeBytes(fd: number, b: Uint8Array): void {
  let off = 0;
  while (off < b.length) off += fs.writeSync(fd, b, off, b.length - off);
}
