/**
 * Valid files in every format and encoding, to be broken by the fuzz tests: one invented mesh
 * (a small basin with velocity, depth and roughness arrays) through every writer, plus the
 * reader fixtures of test/fixtures/.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { legacyFiles, mshFiles, triangleFiles, vtuFiles, type FuzzMesh } from './meshes.js';

export interface Seed {
  label: string;
  entry: string;
  files: Map<string, Uint8Array>;
}

/** A 4 × 3 basin of quads with its last row split into triangles, and some arrays. */
function basin(): FuzzMesh {
  const nx = 5, ny = 4;
  const points: number[] = [];
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) points.push(12.5 * i + 0.25 * j, 10 * j - 0.125 * i);
  const id = (i: number, j: number): number => j * nx + i;
  const cells: number[][] = [];
  for (let j = 0; j < ny - 1; j++) {
    for (let i = 0; i < nx - 1; i++) {
      const q = [id(i, j), id(i + 1, j), id(i + 1, j + 1), id(i, j + 1)];
      if (j === ny - 2) cells.push([q[0]!, q[1]!, q[2]!], [q[0]!, q[2]!, q[3]!]);
      else cells.push(q);
    }
  }
  const n = nx * ny;
  return {
    points,
    cells,
    pointArrays: [
      { name: 'velocity', components: 3, float32: false, values: Array.from({ length: 3 * n }, (_, k) => (k % 3 === 2 ? 0 : 0.5 + ((k * 37) % 11) / 8)) },
      { name: 'depth', components: 1, float32: true, values: Array.from({ length: n }, (_, k) => Math.fround(2 + (k % 7) * 0.3)) },
    ],
    cellArrays: [{ name: 'roughness', components: 1, float32: false, values: cells.map((_, k) => 0.02 + k / 1000) }],
    time: 3600.5,
  };
}

const FIXTURES = new URL('../fixtures/', import.meta.url);

function fixtureSeeds(): Seed[] {
  const out: Seed[] = [];
  for (const dir of ['vtkxml', 'legacy', 'msh', 'triangle']) {
    const path = fileURLToPath(new URL(`${dir}/`, FIXTURES));
    const names = readdirSync(path).filter((f) => !f.endsWith('.mjs')).sort();
    const files = new Map(names.map((f) => [f, new Uint8Array(readFileSync(path + f))]));
    for (const f of names) {
      if (f.endsWith('.ele')) continue; // the .node of each Triangle pair is the entry
      out.push({ label: `fixture ${dir}/${f}`, entry: f, files });
    }
  }
  return out;
}

export function seeds(): Seed[] {
  const m = basin();
  const written = [...vtuFiles(m, 64), ...legacyFiles(m, 5), ...legacyFiles(m, 2), ...mshFiles(m, 1000003), ...triangleFiles(m, true)];
  return [...written.map(({ label, entry, files }) => ({ label, entry, files })), ...fixtureSeeds()];
}
