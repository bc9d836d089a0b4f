/**
 * The per-cell pass on its own, in memory, medians after a warm-up: the core geometry kernels
 * (what the step needs: area, perimeter, h, radius ratio, flags) into arrays already in memory,
 * and the whole pass (core geometry + wave speed + limit dt = C·h/λ), on one thread and over
 * THREADS threads (workers kept in a pool between passes); then the shape measures (angles,
 * centroids, Verdict measures), which the audit computes only for what it writes. Prints JSON.
 * Usage: node bench/percell.mjs CELLS THREADS REPEAT
 */
import { allocCore, allocShape, coreRange, markInverted, shapeRange, FLAG_DEGENERATE } from '../dist/geometry/cells.js';
import { cellSpeeds } from '../dist/physics/speed.js';
import { parallelGeometry, WorkerPool } from '../dist/cli/parallel.js';
import { basinMesh } from './generate.mjs';

const cells = Number(process.argv[2] ?? 1e6);
const threads = Number(process.argv[3] ?? 2);
const repeat = Number(process.argv[4] ?? 5);

function limit(g, speed, dt) {
  const h = g.inradius, flags = g.flags;
  for (let i = 0; i < dt.length; i++) {
    const l = speed[i];
    dt[i] = flags[i] & FLAG_DEGENERATE ? 0 : l > 0 ? h[i] / l : Infinity;
  }
}

/** Median time (ms) of `repeat` runs of `f`, after one untimed run. */
async function time(f) {
  const t = [];
  for (let r = 0; r <= repeat; r++) {
    const t0 = performance.now();
    await f();
    if (r > 0) t.push(performance.now() - t0);
  }
  t.sort((a, b) => a - b);
  return t[Math.floor(t.length / 2)];
}

/** The mesh on shared memory, so that threaded passes time the pass, not copies. */
function sharedMesh(m) {
  const share = (a, C) => { const s = new C(new SharedArrayBuffer(a.byteLength)); s.set(a); return s; };
  return { ...m, points: share(m.points, Float64Array), cellOffsets: share(m.cellOffsets, Int32Array), cellNodes: share(m.cellNodes, Int32Array), cellTypes: share(m.cellTypes, Uint8Array) };
}

const mesh = sharedMesh(basinMesh({ cells, seed: 3 }));
const n = mesh.nCells;
const g = allocCore(n);
const shape = allocShape(n);
const dt = new Float64Array(n);
const pool = new WorkerPool(threads - 1);
let shared = await parallelGeometry(mesh, threads, { pool });
const geometryOne = await time(() => { coreRange(mesh, g, 0, n); markInverted(g); });
const geometryMany = await time(async () => { shared = await parallelGeometry(mesh, threads, { into: shared, pool }); });
const passOne = await time(() => { coreRange(mesh, g, 0, n); markInverted(g); limit(g, cellSpeeds(mesh).speed, dt); });
const shapeOne = await time(() => { shapeRange(mesh, shape, 0, n); });
const passMany = await time(async () => {
  shared = await parallelGeometry(mesh, threads, { into: shared, pool });
  limit(shared, cellSpeeds(mesh).speed, dt);
});
await pool.close();
const perSecond = (ms) => Math.round(n / (ms / 1000));
process.stdout.write(JSON.stringify({
  cells: n, threads,
  rows: [
    ['core geometry, 1 thread', geometryOne, perSecond(geometryOne)],
    [`core geometry, ${threads} threads`, geometryMany, perSecond(geometryMany)],
    ['pass, 1 thread', passOne, perSecond(passOne)],
    [`pass, ${threads} threads`, passMany, perSecond(passMany)],
    ['shape measures, 1 thread', shapeOne, perSecond(shapeOne)],
  ],
}) + '\n');
