/**
 * The benchmark's files, written into a folder: VTU (appended raw with 64-bit ids, as common
 * writers produce them; zlib-compressed), legacy ASCII VTK, and a .pvtu of four pieces.
 */
import * as fs from 'node:fs';
import * as path from 'node:path';
import { writeVtu } from '../dist/io/vtu.js';
import { basinMesh, cellRange, pvtuText, writeLegacyAscii } from './generate.mjs';

const VTU = { encoding: 'appended-raw', intType: 'Int64', headerType: 'UInt32' };

/** Every case; `big` ones are skipped by --quick, `smoke` ones alone run under --smoke. */
export const CASES = [
  { name: 'tri-20k.vtu', cells: 20_000, smoke: true },
  { name: 'tri-20k.vtk', cells: 20_000, legacy: true, smoke: true },
  { name: 'tri-250k.vtu', cells: 250_000 },
  { name: 'tri-1m.vtu', cells: 1_000_000 },
  { name: 'mixed-1m.vtu', cells: 1_000_000, quads: 0.5 },
  { name: 'tri-1m-zlib.vtu', cells: 1_000_000, compress: true },
  { name: 'tri-1m-4pieces.pvtu', cells: 1_000_000, pieces: 4 },
  { name: 'tri-1m.vtk', cells: 1_000_000, legacy: true },
  { name: 'tri-4m.vtu', cells: 4_000_000, big: true },
];

function writeAll(file, bytes) {
  fs.writeFileSync(file, bytes);
}

/** Write the case's file(s) into `dir`; returns the path the audit reads. */
export function writeCase(c, dir) {
  const file = path.join(dir, c.name);
  const mesh = basinMesh({ cells: c.cells, quads: c.quads ?? 0, seed: 7 });
  if (c.legacy) {
    const fd = fs.openSync(file, 'w');
    writeLegacyAscii(mesh, (b) => fs.writeSync(fd, b));
    fs.closeSync(fd);
  } else if (c.pieces) {
    const stem = c.name.replace(/\.pvtu$/, '');
    const sources = [];
    for (let k = 0; k < c.pieces; k++) {
      const from = Math.floor((mesh.nCells * k) / c.pieces), to = Math.floor((mesh.nCells * (k + 1)) / c.pieces);
      const source = `${stem}_${k}.vtu`;
      writeAll(path.join(dir, source), writeVtu(cellRange(mesh, from, to), {}, VTU));
      sources.push(source);
    }
    fs.writeFileSync(file, pvtuText(sources));
  } else {
    writeAll(file, writeVtu(mesh, {}, { ...VTU, compress: Boolean(c.compress) }));
  }
  return file;
}

/** Bytes of the case on disk (a .pvtu with its pieces). */
export function caseBytes(file) {
  let size = fs.statSync(file).size;
  if (file.endsWith('.pvtu')) {
    const dir = path.dirname(file);
    for (const m of fs.readFileSync(file, 'utf8').matchAll(/Source="([^"]+)"/g)) size += fs.statSync(path.join(dir, m[1])).size;
  }
  return size;
}
