import { describe, expect, it } from 'vitest';
import { runAudit } from '../../src/audit/audit.js';
import { MeshInputError, UsageError } from '../../src/mesh/errors.js';
import { LoadError, primaryOf, sameOriginUrl } from '../../src/view/load.js';
import { autoOptions, optionsFromQuery, queryFromOptions, UNIT_SPEED, velocityPairs } from '../../src/view/options.js';
import { errorPayload } from '../../src/view/worker/error.js';
import { cellInfo, fieldPayload } from '../../src/view/worker/results.js';
import { gridMesh } from '../helpers/meshes.js';

describe('first settings from the arrays of a file', () => {
  it('chooses shallow water when a depth is found', () => {
    const { options, note } = autoOptions([{ name: 'velocity', components: 2 }, { name: 'depth', components: 1 }]);
    expect(options).toEqual({ velocity: 'velocity', model: 'shallow-water', depth: 'depth' });
    expect(note).toBeNull();
  });

  it('chooses acoustic with a sound speed, advection with a velocity only, and pairs of components', () => {
    expect(autoOptions([{ name: 'c', components: 1 }]).options).toEqual({ model: 'acoustic', soundSpeed: 'c' });
    expect(autoOptions([{ name: 'U', components: 3 }]).options).toEqual({ model: 'advection', velocity: 'U' });
    expect(autoOptions([{ name: 'vx', components: 1 }, { name: 'vy', components: 1 }]).options.velocity).toEqual(['vx', 'vy']);
    expect(velocityPairs([{ name: 'u', components: 1 }, { name: 'v', components: 2 }])).toEqual([]);
  });

  it('falls back to a unit speed, and says so, when the file has no flow fields', () => {
    const { options, note } = autoOptions([{ name: 'material', components: 1 }]);
    expect(options).toEqual({ model: 'acoustic', soundSpeed: UNIT_SPEED });
    expect(note).toMatch(/λ = 1 m\/s/);
    // the stand-in makes every step h / 1 m/s: a grid of 2 m squares has h = 1 m (2A/P = 8/8)
    const r = runAudit(gridMesh(2, 2, 2), options);
    expect(r.summary.limit.dt).toBeCloseTo(1, 12);
  });

  it('round-trips through the query string with the CLI option names', () => {
    const o = { model: 'acoustic' as const, velocity: ['ux', 'uy'] as [string, string], soundSpeed: 340, courant: 0.8, dt: 0.01, top: 5, length: 'flux' as const, diffusivity: 'nu' };
    const q = queryFromOptions(o);
    expect(q.get('sound-speed')).toBe('340');
    expect(q.get('velocity')).toBe('ux,uy');
    expect(optionsFromQuery(q)).toEqual(o);
    expect(optionsFromQuery(new URLSearchParams('mesh=a.vtu'))).toBeNull();
    expect(optionsFromQuery(new URLSearchParams('model=warp&courant=x'))).toBeNull();
  });
});

describe('getting files in', () => {
  it('starts from the .node of a Triangle pair and refuses other multiple selections', () => {
    expect(primaryOf(['a.vtu'])).toBe('a.vtu');
    expect(primaryOf(['box.1.ele', 'box.1.node'])).toBe('box.1.node');
    expect(() => primaryOf(['a.vtu', 'b.vtu'])).toThrow(LoadError);
    expect(() => primaryOf([])).toThrow(LoadError);
  });

  it('opens only same-origin addresses', () => {
    const base = 'http://127.0.0.1:8080/?mesh=x';
    expect(sameOriginUrl('mesh/a.vtu', base).href).toBe('http://127.0.0.1:8080/mesh/a.vtu');
    expect(() => sameOriginUrl('http://example.org/a.vtu', base)).toThrow(LoadError);
    expect(() => sameOriginUrl('//example.org/a.vtu', base)).toThrow(LoadError);
  });
});

describe('worker results', () => {
  const mesh = gridMesh(3, 2, 2);
  mesh.pointData.push({ name: 'velocity', components: 2, values: new Float64Array(mesh.nPoints * 2).fill(2) });

  it('sends the fields the view colours by, falling back to dt when a field is missing', () => {
    const r = runAudit(mesh, { velocity: 'velocity' });
    const dt = fieldPayload(r, 'dt');
    expect(dt.field).toBe('dt');
    // |u| = √8 on every node, h = 1 m: dt = 1/√8 s in every cell
    for (const v of dt.values) expect(v).toBeCloseTo(1 / Math.sqrt(8), 6);
    expect(fieldPayload(r, 'courant').field).toBe('dt');
    const c = fieldPayload(runAudit(mesh, { velocity: 'velocity', dt: 0.1 }), 'courant');
    expect(c.field).toBe('courant');
    expect(c.values[0]).toBeCloseTo(0.1 * Math.sqrt(8), 6);
  });

  it('describes one cell', () => {
    const r = runAudit(mesh, { velocity: 'velocity' });
    const info = cellInfo(r, 4);
    expect(info.type).toBe('quad');
    expect(info.nodes).toHaveLength(4);
    expect(info.area).toBeCloseTo(4, 12);
    expect(info.h).toBeCloseTo(1, 12);
    expect(info.centroidX).toBeCloseTo(3, 12);
    expect(info.centroidY).toBeCloseTo(3, 12);
  });

  it('turns errors into plain data with their location', () => {
    expect(errorPayload(new MeshInputError('bad count', { file: 'a.vtk', line: 7 }))).toEqual({
      kind: 'input', detail: 'bad count', message: 'a.vtk: line 7: bad count', file: 'a.vtk', line: 7,
    });
    expect(errorPayload(new UsageError('no array')).kind).toBe('usage');
    const internal = errorPayload(new TypeError('x is null'));
    expect(internal.kind).toBe('internal');
    expect(internal.detail).toBe('TypeError: x is null');
  });
});
