/**
 * The broken-file corpus (test/fixtures/broken/, written by make-broken.mjs): each file fails
 * with the error fragment and the location its manifest names, through readMesh and through
 * the command (`steplens audit FILE` exits 2 with one line on stderr naming the file and where).
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import * as path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { MeshInputError } from '../../src/mesh/errors.js';
import { readMesh } from '../../src/mesh/read.js';
import { ensureCli, root, steplens } from './cli.js';

const dir = path.join(root, 'test/fixtures/broken');
const manifest = JSON.parse(readFileSync(path.join(dir, 'manifest.json'), 'utf8')) as Record<string, { error: string; location: string }>;
const names = Object.keys(manifest);

function load(name: string): Uint8Array | null {
  const file = path.join(dir, name);
  return existsSync(file) ? new Uint8Array(readFileSync(file)) : null;
}

beforeAll(ensureCli);

describe('broken-file corpus', () => {
  it('holds at least 25 files across the four formats, each named in the manifest', () => {
    expect(names.length).toBeGreaterThanOrEqual(25);
    for (const prefix of ['vtu-', 'vtk-', 'msh-', 'tri-']) expect(names.filter((n) => n.startsWith(prefix)).length, prefix).toBeGreaterThanOrEqual(4);
    // every other file is the generator, the manifest, or the Triangle sibling of a listed file
    const siblings = new Set(names.flatMap((n) => [n.replace(/\.node$/, '.ele'), n.replace(/\.ele$/, '.node')]));
    const stray = readdirSync(dir).filter((f) => !manifest[f] && !siblings.has(f) && f !== 'manifest.json' && f !== 'make-broken.mjs');
    expect(stray).toEqual([]);
  });

  it.each(names)('%s: readMesh names what is wrong and where', (name) => {
    const want = manifest[name]!;
    let caught: unknown = null;
    try {
      readMesh(load(name)!, name, { loadSibling: load });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(MeshInputError);
    const e = caught as MeshInputError;
    expect(e.detail).toContain(want.error);
    expect(e.message.startsWith(`${name}: ${want.location}: `), e.message).toBe(true);
  });

  it('steplens audit FILE: exit 2, one line on stderr with the file, the location and the error', async () => {
    const results = [];
    // two at a time: the machine has two cores
    for (let i = 0; i < names.length; i += 2) {
      results.push(...await Promise.all(names.slice(i, i + 2).map(async (name) => {
        const file = path.join(dir, name);
        return { name, file, ...await steplens(['audit', file]) };
      })));
    }
    for (const r of results) {
      const want = manifest[r.name]!;
      expect(r.code, `${r.name}: ${r.err}`).toBe(2);
      const lines = r.err.trimEnd().split('\n');
      expect(lines, r.name).toHaveLength(1);
      expect(lines[0], r.name).toContain(`${r.file}: ${want.location}: `);
      expect(lines[0], r.name).toContain(want.error);
    }
  });
});
