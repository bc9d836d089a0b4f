/** Expanding the audit's file arguments: globs, folders, repeats, natural order. */
import { beforeAll, describe, expect, it } from 'vitest';
import * as fs from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { expandInputs, globMatcher, isSnapshotInput } from '../../src/cli/snapshots.js';
import { UsageError } from '../../src/mesh/errors.js';

let dir = '';

beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'steplens-inputs-'));
  for (const n of ['m_10.vtu', 'm_2.vtu', 'm_1.vtu', 'm_1.csv', '.m_3.vtu', 'grid.ele', 'grid.node', 'a+b(1).vtu']) fs.writeFileSync(path.join(dir, n), '');
  fs.mkdirSync(path.join(dir, 'sub.vtu'));
});

describe('snapshot inputs', () => {
  it('glob: * and ? in the file name, other characters literal', () => {
    expect(globMatcher('m_*.vtu').test('m_10.vtu')).toBe(true);
    expect(globMatcher('m_*.vtu').test('m_10.vtux')).toBe(false);
    expect(globMatcher('m_?.vtu').test('m_10.vtu')).toBe(false);
    expect(globMatcher('a+b(1).vtu').test('a+b(1).vtu')).toBe(true);
    expect(globMatcher('a+b(1).vtu').test('aab1.vtu')).toBe(false);
  });

  it('expands globs and folders to files in natural order, without repeats, hidden files or folders', () => {
    const names = (l: string[]) => l.map((f) => path.basename(f));
    expect(names(expandInputs([path.join(dir, 'm_*.vtu')]))).toEqual(['m_1.vtu', 'm_2.vtu', 'm_10.vtu']);
    expect(names(expandInputs([path.join(dir, 'm_?.vtu'), path.join(dir, 'm_2.vtu')]))).toEqual(['m_1.vtu', 'm_2.vtu']);
    // a folder: mesh extensions only, Triangle meshes by their .ele
    expect(names(expandInputs([dir]))).toEqual(['a+b(1).vtu', 'grid.ele', 'm_1.vtu', 'm_2.vtu', 'm_10.vtu']);
  });

  it('usage errors: nothing matches, wildcards in a folder name, a folder without meshes', () => {
    expect(() => expandInputs([path.join(dir, 'x_*.vtu')])).toThrow(/no file matches/);
    expect(() => expandInputs([path.join(dir, '*', 'm.vtu')])).toThrow(UsageError);
    expect(() => expandInputs([path.join(dir, 'sub.vtu')])).toThrow(/no mesh files/);
  });

  it('a run is several files, a glob or a folder', () => {
    expect(isSnapshotInput(['a.vtu'])).toBe(false);
    expect(isSnapshotInput(['a.vtu', 'b.vtu'])).toBe(true);
    expect(isSnapshotInput(['run/m_?.vtu'])).toBe(true);
    expect(isSnapshotInput([dir])).toBe(true);
  });
});
