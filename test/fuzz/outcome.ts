/**
 * What a read of hostile bytes may end in: a mesh that holds together (and audits without a
 * NaN), or one of our typed errors naming the file and a line or byte. Anything else (a
 * TypeError, a RangeError, a slow case, a large allocation) fails the test.
 */
import { expect } from 'vitest';
import { runAudit, type AuditResult } from '../../src/audit/audit.js';
import { MeshInputError, SteplensError, UsageError } from '../../src/mesh/errors.js';
import { QUAD, TRIANGLE, type Mesh } from '../../src/mesh/model.js';
import { readEncoded } from './meshes.js';

/**
 * fast-check settings: `STEPLENS_FUZZ_RUNS=20 STEPLENS_FUZZ_SEED=5 npx vitest run test/fuzz` for
 * a longer hunt with other cases; the defaults keep the suite quick and repeatable.
 */
export function runs(numRuns: number, seed: number): { numRuns: number; seed: number } {
  const scale = Number(process.env.STEPLENS_FUZZ_RUNS ?? 1);
  return { numRuns: Math.max(1, Math.round(numRuns * scale)), seed: seed + Number(process.env.STEPLENS_FUZZ_SEED ?? 0) };
}

/** Per case: 2 s of wall time (the machine is shared; a real case takes milliseconds). */
export const CASE_MS = 2000;

/**
 * Bytes a read may hold on to beyond the file: ASCII numbers take two bytes and become eight
 * (common practice); zlib expands at most about 1032 times (from memory). Over-generous on
 * purpose: what this catches is an allocation sized by a lie, megabytes to gigabytes.
 */
export function allocationBudget(fileBytes: number): number {
  return 16 * 1024 * 1024 + 1100 * fileBytes;
}

/** Every typed array of the result (its own, its geometry's, its extra columns') and every number of the summary is free of NaN. */
export function expectNoNaN(r: AuditResult, label: string): void {
  const arrays: [string, ArrayLike<number>][] = [];
  const collect = (prefix: string, o: object): void => {
    for (const [k, v] of Object.entries(o)) if (ArrayBuffer.isView(v) && !(v instanceof DataView)) arrays.push([prefix + k, v as unknown as ArrayLike<number>]);
  };
  collect('', r);
  collect('geom.', r.geom);
  for (const c of r.columns) arrays.push([c.name, c.values]);
  for (const [name, a] of arrays) {
    for (let i = 0; i < a.length; i++) if (Number.isNaN(a[i])) expect.fail(`${label}: ${name}[${i}] is NaN`);
  }
  const walk = (v: unknown, path: string): void => {
    if (typeof v === 'number') { if (Number.isNaN(v)) expect.fail(`${label}: summary ${path} is NaN`); return; }
    if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) walk(x, `${path}.${k}`);
  };
  walk(r.summary, 'summary');
}

/** The structural promises of the mesh model. */
export function expectWellFormed(m: Mesh, label: string): void {
  const fail = (what: string): never => expect.fail(`${label}: ${what}`);
  if (m.points.length !== 2 * m.nPoints) fail(`points has ${m.points.length} values for ${m.nPoints} points`);
  for (let i = 0; i < m.points.length; i++) if (!Number.isFinite(m.points[i])) fail(`coordinate ${i} is ${m.points[i]}`);
  if (m.cellOffsets.length !== m.nCells + 1 || m.cellTypes.length !== m.nCells || m.cellOffsets[0] !== 0) fail('cell arrays disagree');
  for (let c = 0; c < m.nCells; c++) {
    const len = m.cellOffsets[c + 1]! - m.cellOffsets[c]!;
    const t = m.cellTypes[c];
    if (!((t === TRIANGLE && len === 3) || (t === QUAD && len === 4))) fail(`cell ${c}: type ${t} with ${len} nodes`);
  }
  const end = m.cellOffsets[m.nCells]!;
  if (end > m.cellNodes.length) fail('connectivity too short');
  for (let k = 0; k < end; k++) {
    const v = m.cellNodes[k]!;
    if (!(v >= 0 && v < m.nPoints)) fail(`node index ${v} outside 0..${m.nPoints - 1}`);
  }
  for (const [list, n] of [[m.pointData, m.nPoints], [m.cellData, m.nCells]] as const) {
    for (const a of list) if (!(a.components >= 1) || a.values.length !== n * a.components) fail(`array "${a.name}" has ${a.values.length} values`);
  }
}

export interface Tally {
  cases: number;
  read: number;
  failed: number;
}

export function newTally(): Tally {
  return { cases: 0, read: 0, failed: 0 };
}

/** A typed error must name the file it is about and where in it (an empty file has no where). */
function expectLocated(e: SteplensError, files: Map<string, Uint8Array>, label: string): void {
  if (e instanceof UsageError) return;
  const loc = e.location;
  if (loc.file === undefined || !files.has(loc.file)) expect.fail(`${label}: error names no file of the set: ${e.message}`);
  if (loc.line === undefined && loc.byteOffset === undefined && files.get(loc.file)!.length > 0) {
    expect.fail(`${label}: error has no line or byte: ${e.message}`);
  }
}

/**
 * Read `bytes` as the entry file (siblings from `files`) and hold the outcome to the rules
 * above; a mesh read is also audited. Returns the error, or null when a mesh was read.
 */
export function expectTypedOutcome(
  files: Map<string, Uint8Array>, entry: string, bytes: Uint8Array, label: string, tally: Tally, maxMs = CASE_MS,
): SteplensError | null {
  tally.cases++;
  const before = process.memoryUsage().arrayBuffers;
  const t0 = performance.now();
  let mesh: Mesh | null = null;
  let err: unknown = null;
  try {
    mesh = readEncoded(files, entry, bytes);
  } catch (e) {
    err = e;
  }
  const ms = performance.now() - t0;
  const grown = process.memoryUsage().arrayBuffers - before;
  if (ms > maxMs) expect.fail(`${label}: took ${ms.toFixed(0)} ms`);
  if (grown > allocationBudget(bytes.length)) expect.fail(`${label}: ${grown} bytes allocated for a file of ${bytes.length}`);
  if (err !== null) {
    if (!(err instanceof MeshInputError || err instanceof UsageError)) {
      throw new Error(`${label}: ${err instanceof Error ? err.stack : String(err)}`);
    }
    expectLocated(err, new Map(files).set(entry, bytes), label);
    tally.failed++;
    return err;
  }
  tally.read++;
  expectWellFormed(mesh!, label);
  try {
    expectNoNaN(runAudit(mesh!, { file: entry }), label);
  } catch (e) {
    if (!(e instanceof SteplensError)) throw e;
  }
  return null;
}
