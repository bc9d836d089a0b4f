/**
 * npm run bench — speed at real sizes.
 *
 * Writes deterministic (seeded) meshes into a temporary folder and, for each, times as fresh
 * processes: the floor (bench/floor.mjs: read the file and decode its arrays, nothing else) and
 * the audit (`node bin/steplens.js audit FILE --cells OUT.csv --json`), and the same audit without
 * the per-cell table (what the analysis costs apart from writing it). Medians of --repeat runs,
 * after one untimed warm-up; peak RSS from a preloaded hook (bench/rss-hook.mjs). Then the
 * per-cell pass on its own (bench/percell.mjs), on one thread and over threads.
 *
 *   --quick        skip the 4M-cell case
 *   --smoke        the 20k-cell cases only, one run each (checks that the table prints)
 *   --repeat N     runs per measurement (default 3)
 *   --threads N    threads for the per-cell pass and for `audit --threads`
 *                  (default: the available cores)
 *   --only TEXT    only the cases whose name contains TEXT
 *   --keep         keep the folder of generated files
 */
import { spawnSync } from 'node:child_process';
import * as fs from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';
import { CASES, caseBytes, writeCase } from './cases.mjs';

const here = path.dirname(fileURLToPath(import.meta.url));
const root = path.resolve(here, '..');
const bin = path.join(root, 'bin/steplens.js');
const hook = pathToFileURL(path.join(here, 'rss-hook.mjs')).href;

const { values: opt } = parseArgs({
  options: {
    quick: { type: 'boolean' }, smoke: { type: 'boolean' }, repeat: { type: 'string' }, threads: { type: 'string' },
    only: { type: 'string' }, keep: { type: 'boolean' },
  },
});
const repeat = opt.smoke ? 1 : Math.max(1, Number(opt.repeat ?? 3));
const threads = Math.max(1, Number(opt.threads ?? os.availableParallelism()));
/** Bytes per cell of the audit's own per-cell outputs (17 geometry doubles, flags, λ, dt, limits, cause). */
const OUTPUT_BYTES_PER_CELL = 17 * 8 + 1 + 4 * 8 + 1;

function median(v) {
  const s = [...v].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

/** Run `node [hook] args` and return its wall time (s), CPU time (s), peak RSS (MiB) and stdout. */
function runNode(args) {
  const t = performance.now();
  const r = spawnSync(process.execPath, ['--import', hook, ...args], { cwd: root, encoding: 'utf8', maxBuffer: 2 ** 28 });
  const wall = (performance.now() - t) / 1000;
  const m = /STEPLENS_BENCH_MAXRSS (\d+) CPU (\d+)/.exec(r.stderr ?? '');
  if (r.status !== 0 || !m) throw new Error(`node ${args.join(' ')} failed (exit ${r.status}):\n${(r.stderr ?? '').slice(-2000)}`);
  return { wall, cpu: Number(m[2]) / 1000, rss: Number(m[1]) / 1024, out: r.stdout };
}

/** Medians of wall time, CPU time and peak RSS over runs. */
function medians(runs) {
  return { wall: median(runs.map((r) => r.wall)), cpu: median(runs.map((r) => r.cpu)), rss: median(runs.map((r) => r.rss)) };
}


function fmt(x, digits) {
  return x.toFixed(digits);
}

function table(rows, head) {
  const cells = [head, ...rows].map((r) => r.map(String));
  const width = head.map((_, j) => Math.max(...cells.map((r) => r[j].length)));
  return cells.map((r) => r.map((c, j) => (j === 0 ? c.padEnd(width[j]) : c.padStart(width[j]))).join('  ')).join('\n');
}

function measureCase(c, dir, auditExtra) {
  const file = writeCase(c, dir);
  const size = caseBytes(file);
  const csv = path.join(dir, 'out.csv');
  const floors = [], audits = [], bare = [];
  let cells = 0;
  for (let k = 0; k < repeat; k++) {
    const f = runNode([path.join(here, 'floor.mjs'), file]);
    cells = JSON.parse(f.out).cells;
    floors.push(f);
    const a = runNode([bin, 'audit', file, '--cells', csv, '--json', ...auditExtra]);
    if (JSON.parse(a.out).mesh.cells !== cells) throw new Error(`${c.name}: the audit saw ${JSON.parse(a.out).mesh.cells} cells, the floor ${cells}`);
    audits.push(a);
    fs.rmSync(csv, { force: true });
    const b = runNode([bin, 'audit', file, '--json', ...auditExtra]);
    if (JSON.parse(b.out).mesh.cells !== cells) throw new Error(`${c.name}: the audit without a table saw another mesh`);
    bare.push(b);
  }
  if (!opt.keep) for (const name of fs.readdirSync(dir)) fs.rmSync(path.join(dir, name), { force: true });
  const fl = medians(floors);
  const budget = (3 * size + cells * OUTPUT_BYTES_PER_CELL) / 2 ** 20;
  const columns = (m) => [fmt(m.wall, 2), fmt(m.wall / fl.wall, 2), fmt(m.cpu / fl.cpu, 2), Math.round(cells / m.wall).toLocaleString('en'), fmt(m.rss, 0), fmt(m.rss / budget, 2)];
  const nb = medians(bare);
  return [c.name, fmt(size / 2 ** 20, 1), cells, fmt(fl.wall, 2), ...columns(medians(audits)), fmt(nb.wall, 2), fmt(nb.wall / fl.wall, 2)];
}

function main() {
  const cases = CASES.filter((c) => (opt.smoke ? c.smoke : !c.smoke) && !(opt.quick && c.big) && (!opt.only || c.name.includes(opt.only)));
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'steplens-bench-'));
  const auditExtra = ['--threads', String(threads)];
  console.log(`steplens bench: node ${process.version}, ${os.availableParallelism()} cores, load ${os.loadavg().map((l) => l.toFixed(1)).join(' ')}, ${repeat} run(s) each, medians; folder ${dir}`);
  console.log(`audit: node bin/steplens.js audit FILE --cells OUT.csv --json ${auditExtra.join(' ')}`.trimEnd());
  // warm-up: one untimed floor and audit
  const warm = writeCase(CASES[0], dir);
  runNode([path.join(here, 'floor.mjs'), warm]);
  runNode([bin, 'audit', warm, '--cells', path.join(dir, 'out.csv'), '--json']);
  const rows = [];
  try {
    for (const c of cases) {
      rows.push(measureCase(c, dir, auditExtra));
      console.log(`  ${c.name} done`);
    }
  } finally {
    if (!opt.keep) fs.rmSync(dir, { recursive: true, force: true });
  }
  const measured = ['ratio', 'cpu ratio', 'cells/s', 'RSS MiB', 'RSS/budget'];
  console.log('\n' + table(rows, ['file', 'MiB', 'cells', 'floor s', 'audit s', ...measured, 'no-table s', 'ratio']));
  console.log('floor: read + decode only, one thread (bench/floor.mjs); audit: the command above; no-table: the same without --cells.');
  console.log('Each a fresh process; ratio = wall time / floor\'s,');
  console.log("cpu ratio = CPU time (every thread) / floor's; budget = 3 × file size + per-cell outputs");
  const perCells = opt.smoke ? 20_000 : opt.quick ? 1_000_000 : 4_000_000;
  const r = runNode([path.join(here, 'percell.mjs'), String(perCells), String(threads), String(opt.smoke ? 1 : 5)]);
  const p = JSON.parse(r.out);
  console.log(`\nper-cell pass, ${p.cells.toLocaleString('en')} cells in memory, medians after a warm-up (pass = core geometry + speed + limit):`);
  console.log(table(p.rows.map(([what, ms, perS]) => [what, fmt(ms, 1), perS.toLocaleString('en')]), ['', 'ms', 'cells/s']));
  console.log(`load at the end ${os.loadavg().map((l) => l.toFixed(1)).join(' ')}`);
}

main();
