import { describe, expect, test } from 'vitest';
import { schemeCommand, type SchemeIo } from '../../src/cli/scheme-command.js';

function fakeIo(files: Record<string, string> = {}) {
  const out: string[] = [];
  const err: string[] = [];
  const written: Record<string, string> = {};
  const io: SchemeIo = {
    stdout: (s) => out.push(s),
    stderr: (s) => err.push(s),
    readFile: (path) => {
      if (!(path in files)) throw Object.assign(new Error(`ENOENT: no such file or directory, open '${path}'`), { code: 'ENOENT' });
      return new TextEncoder().encode(files[path]);
    },
    writeFile: (path, data) => {
      written[path] = typeof data === 'string' ? data : new TextDecoder().decode(data);
    },
  };
  return { io, out: () => out.join(''), err: () => err.join(''), written };
}

describe('steplens scheme', () => {
  test('--json prints the numbers', async () => {
    const f = fakeIo();
    expect(await schemeCommand(['--time', 'ssp-rk3', '--space', 'upwind3', '--json'], f.io)).toBe(0);
    const j = JSON.parse(f.out());
    expect(j).toMatchObject({ status: 'stable', time: 'ssp-rk3', space: 'upwind3' });
    expect(j.courant).toBeCloseTo(1.6259, 3);
    expect(j.realInterval).toBeCloseTo(2.5127453, 6);
    expect(j.imagInterval).toBeCloseTo(Math.sqrt(3), 10);
    expect(j.diffusion).toBeCloseTo(2.5127453 / 4, 6);
    expect(f.err()).toBe('');
  });

  test('--json rounds away the tolerance: Euler gives exactly 2 and 0.5', async () => {
    const f = fakeIo();
    await schemeCommand(['--time=heun', '--space=dg0', '--json'], f.io);
    const j = JSON.parse(f.out());
    expect(j.realInterval).toBe(2);
    expect(j.diffusion).toBe(0.5);
    expect(j.courant).toBe(1);
  });

  test('the plain report says what the number means', async () => {
    const f = fakeIo();
    expect(await schemeCommand(['--time', 'RK4', '--space', 'dg2'], f.io)).toBe(0);
    const text = f.out();
    expect(text).toContain('rk4 in time, dg2 in space');
    expect(text).toMatch(/Courant number\s+0\.2352\d?\s+stable/);
    expect(text).toContain('dt ≤ 0.2352');
    expect(text).toContain('h = 2A/P in place of dx');
  });

  test('a weakly unstable pairing says that no step is stable', async () => {
    const f = fakeIo();
    expect(await schemeCommand(['--time', 'euler', '--space', 'central2'], f.io)).toBe(0);
    expect(f.out()).toMatch(/Courant number\s+0\s+weakly-unstable/);
    expect(f.out()).toContain('no dt is stable');
  });

  test('--svg writes the picture through the given writer', async () => {
    const f = fakeIo();
    expect(await schemeCommand(['--time', 'rk4', '--space', 'central4', '--svg', 'out/region.svg', '--json'], f.io)).toBe(0);
    expect(f.written['out/region.svg']).toMatch(/^<svg /);
    expect(JSON.parse(f.out()).svg).toBe('out/region.svg');
  });

  test('--list and --help', async () => {
    const f = fakeIo();
    expect(await schemeCommand(['--list'], f.io)).toBe(0);
    expect(f.out()).toContain('ssp-rk54');
    expect(f.out()).toContain('dg6');
    const h = fakeIo();
    expect(await schemeCommand(['--help'], h.io)).toBe(0);
    expect(h.out()).toContain('--time NAME|FILE.json');
  });

  test('a tableau file is read, named in the output, and matches the built-in', async () => {
    const f = fakeIo({ 'my-rk3.json': JSON.stringify({ A: [[0, 0, 0], [1, 0, 0], ['1/4', '1/4', 0]], b: ['1/6', '1/6', '2/3'], c: [0, 1, 0.5] }) });
    expect(await schemeCommand(['--time', 'my-rk3.json', '--space', 'dg1', '--json'], f.io)).toBe(0);
    const j = JSON.parse(f.out());
    expect(j.time).toBe('my-rk3.json');
    expect(Math.floor(1000 * j.courant)).toBe(409);
  });

  const usage: [string, string[], RegExp][] = [
    ['missing --space', ['--time', 'rk4'], /--space is required: one of upwind1, .*dg6/],
    ['missing --time', ['--space', 'dg1'], /--time is required/],
    ['unknown integrator', ['--time', 'rk9', '--space', 'dg1'], /unknown time integrator "rk9"; known: euler, heun/],
    ['unknown operator', ['--time', 'rk4', '--space', 'dg9'], /unknown space operator "dg9"/],
    ['unknown option', ['--time', 'rk4', '--space', 'dg1', '--cfl', '2'], /cfl/],
    ['stray argument', ['rk4'], /unexpected argument "rk4"/],
    ['missing tableau file', ['--time', 'nope.json', '--space', 'dg1'], /cannot read nope\.json: no such file/],
  ];
  test.each(usage)('%s: exit 2 with one line on stderr', async (_, args, message) => {
    const f = fakeIo();
    expect(await schemeCommand(args, f.io)).toBe(2);
    expect(f.err()).toMatch(message);
    expect(f.err().trimEnd().split('\n')).toHaveLength(1);
    expect(f.out()).toBe('');
  });

  test('an invalid tableau file: exit 2 naming the file and the fault', async () => {
    const f = fakeIo({ 'bad.json': JSON.stringify({ A: [[0, 0], [1, 0]], b: [0.5, 0.5], c: [0, 0.7] }) });
    expect(await schemeCommand(['--time', 'bad.json', '--space', 'upwind1'], f.io)).toBe(2);
    expect(f.err()).toMatch(/^steplens scheme: bad\.json: c\[2\] = 0\.7/);
  });
});
