/**
 * Triangle .node / .ele reader. File layouts follow J. R. Shewchuk's Triangle documentation
 * (".node files" and ".ele files" pages): header lines, optional attributes and boundary
 * markers, '#' comments and blank lines anywhere, numbering from 0 or 1, 6-node triangles with
 * the corners first. Fixtures are invented (a basin and a channel); values are read off them.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { MeshInputError } from '../../../src/mesh/errors.js';
import { findArray, TRIANGLE } from '../../../src/mesh/model.js';
import { readTriangle } from '../../../src/mesh/triangle/index.js';
import { cellArea, expectInputError, text, totalArea } from '../msh/helpers.js';

const dir = new URL('../../fixtures/triangle/', import.meta.url);
const loadPair = (name: string) =>
  readTriangle(readFileSync(new URL(`${name}.node`, dir)), readFileSync(new URL(`${name}.ele`, dir)), `${name}.node`, `${name}.ele`);
const readText = (node: string, ele: string) => () => readTriangle(text(node), text(ele), 'x.node', 'x.ele');

describe('basin (1-based, comments, blank lines, attributes, markers)', () => {
  const m = loadPair('basin');

  it('reads the points and the 0-based triangles', () => {
    expect(m.format).toBe('triangle');
    expect(Array.from(m.points)).toEqual([0, 0, 1, 0, 1, 1, 0, 1, 0.5, 0.5]);
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 4, 1, 2, 4, 2, 3, 4, 3, 0, 4]);
    expect(Array.from(m.cellTypes)).toEqual([TRIANGLE, TRIANGLE, TRIANGLE, TRIANGLE]);
    expect(m.warnings).toEqual([]);
  });

  it('fans four counter-clockwise quarter triangles over the unit square', () => {
    for (let i = 0; i < 4; i++) expect(cellArea(m, i)).toBeCloseTo(0.25, 15);
    expect(totalArea(m)).toBeCloseTo(1, 15);
  });

  it('exposes attributes, markers and a velocity built from attr0 and attr1', () => {
    expect(Array.from(findArray(m.pointData, 'attr0')!.values)).toEqual([0.5, 0.5, 0, -0.5, 0.1]);
    expect(Array.from(findArray(m.pointData, 'attr1')!.values)).toEqual([-0.25, 0.25, 0, 0, 0.2]);
    expect(Array.from(findArray(m.pointData, 'marker')!.values)).toEqual([1, 1, 1, 2, 0]);
    const v = findArray(m.pointData, 'velocity')!;
    expect(v.components).toBe(2);
    expect(Array.from(v.values)).toEqual([0.5, -0.25, 0.5, 0.25, 0, 0, -0.5, 0, 0.1, 0.2]);
    expect(Array.from(findArray(m.cellData, 'attr0')!.values)).toEqual([10, 10, 20, 20]);
  });
});

describe('channel (0-based, 6-node triangles)', () => {
  const m = loadPair('channel');

  it('keeps all nine points and the corners of each triangle, with a warning', () => {
    expect(m.nPoints).toBe(9);
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 2, 0, 2, 3]);
    expect(Array.from(m.cellOffsets)).toEqual([0, 3, 6]);
    expect(m.warnings.some((w) => w.includes('2 higher-order cells'))).toBe(true);
    expect(totalArea(m)).toBeCloseTo(2, 15);
    expect(m.pointData).toEqual([]);
    expect(m.cellData).toEqual([]);
  });
});

describe('header and layout', () => {
  it('takes defaults for the optional header values (2-D, no attributes, no markers, 3 nodes)', () => {
    const m = readText('3\n0 0 0\n1 1 0\n2 0 1\n', '1\n0 0 1 2\n')();
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 2]);
    expect(m.pointData).toEqual([]);
  });

  it('keeps one attribute without making a velocity', () => {
    const m = readText('3 2 1 0\n1 0 0 7\n2 1 0 8\n3 0 1 9\n', '1 3 0\n1 1 2 3\n')();
    expect(m.pointData.map((a) => a.name)).toEqual(['attr0']);
  });

  it('accepts CRLF line ends and comments after values', () => {
    const m = readText('3 2 0 0 # header\r\n0 0 0\r\n\r\n1 1 0 #a\r\n2 0 1\r\n', '1 3 0\r\n0 0 1 2\r\n')();
    expect(Array.from(m.points)).toEqual([0, 0, 1, 0, 0, 1]);
  });
});

describe('bad input', () => {
  const node3 = '3 2 0 0\n1 0 0\n2 1 0\n3 0 1\n';

  it('rejects a dimension other than 2', () => {
    expectInputError(readText('3 3 0 0\n1 0 0 0\n', '0 3 0\n'), /dimension 3/, 'line');
  });

  it('names the line of a skipped index', () => {
    const err = expectInputError(readText('# pts\n3 2 0 0\n1 0 0\n3 1 0\n4 0 1\n', '0 3 0\n'), /index 3 where 2 was expected \(an index was skipped\)/, 'line');
    expect(err.location).toEqual({ file: 'x.node', line: 4 });
  });

  it('names the line of a duplicated index', () => {
    const err = expectInputError(readText(node3, '2 3 0\n1 1 2 3\n1 1 2 3\n'), /index 1 where 2 was expected \(duplicated/, 'line');
    expect(err.location).toEqual({ file: 'x.ele', line: 3 });
  });

  it('rejects numbering that starts at neither 0 nor 1', () => {
    expectInputError(readText('1 2 0 0\n2 0 0\n', '0 3 0\n'), /numbering must start at 0 or 1/, 'line');
  });

  it('names a node index out of range with its line', () => {
    const err = expectInputError(readText(node3, '1 3 0\n\n1 1 2 4\n'), /triangle 1 uses node 4, outside 1\.\.3/, 'line');
    expect(err.location.line).toBe(3);
    expectInputError(readText(node3, '1 3 0\n1 0 1 2\n'), /uses node 0, outside 1\.\.3/, 'line');
  });

  it('reports lines with too few or too many values', () => {
    expectInputError(readText('2 2 1 1\n1 0 0 5\n2 1 0 5 1\n', '0 3 0\n'), /line ends before the boundary marker/, 'line');
    expectInputError(readText('2 2 0 0\n1 0 0 5\n2 1 0\n', '0 3 0\n'), /more values on this line than the header announces/, 'line');
  });

  it('reports truncated files and extra records', () => {
    expectInputError(readText('3 2 0 0\n1 0 0\n2 1 0\n# gone\n', '0 3 0\n'), /(ends after 2 of the 3 points|announces 3 points)/, 'line');
    expectInputError(readText(node3, '2 3 0\n1 1 2 3\n'), /ends after 1 of the 2 triangles|announces 2 triangles/, 'line');
    expectInputError(readText(node3 + '4 1 1\n', '0 3 0\n'), /more lines than the 3 points/, 'line');
    expectInputError(readText('', '0 3 0\n'), /no header line/, 'line');
  });

  it('fails at once on a huge count', () => {
    expectInputError(readText('1099511627776 2 0 0\n1 0 0\n', '0 3 0\n'), /announces 1099511627776 points/, 'line');
    expectInputError(readText(node3, '1099511627776 3 0\n1 1 2 3\n'), /announces 1099511627776 triangles/, 'line');
  });

  it('rejects non-numeric and non-finite values and unsupported node counts', () => {
    expectInputError(readText('1 2 0 0\n1 0 north\n', '0 3 0\n'), /expected the y coordinate, found "north"/, 'line');
    expectInputError(readText('1 2 0 0\n1 inf 0\n', '0 3 0\n'), /the x coordinate is Infinity/, 'line');
    expectInputError(readText(node3, '1 4 0\n1 1 2 3 3\n'), /4 nodes per triangle/, 'line');
  });

  it('explains a .node file without points', () => {
    expectInputError(readText('0 2 0 0\n', '1 3 0\n1 1 2 3\n'), /holds no points/, 'line');
  });

  it('survives random corruption with a MeshInputError or a valid mesh', () => {
    const node = readFileSync(new URL('basin.node', dir));
    const ele = readFileSync(new URL('basin.ele', dir));
    let seed = 99;
    const next = () => (seed = (Math.imul(seed, 1103515245) + 12345) >>> 0) / 4294967296;
    for (let trial = 0; trial < 300; trial++) {
      const n = node.slice();
      const e = ele.slice();
      const target = trial % 2 === 0 ? n : e;
      target[Math.floor(next() * target.length)] = [48, 49, 57, 32, 10, 35, 45, 46, 120][Math.floor(next() * 9)]!;
      try {
        const m = readTriangle(n, e, 'basin.node', 'basin.ele');
        for (const v of m.cellNodes) expect(v >= 0 && v < m.nPoints).toBe(true);
      } catch (err) {
        if (!(err instanceof MeshInputError)) throw err;
      }
    }
  });
});
