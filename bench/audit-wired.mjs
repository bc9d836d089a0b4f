/**
 * What `steplens audit FILE --cells OUT.csv --json --threads N` does once the speed-ups are
 * wired into the command (see the wiring notes of issue 6): pieces read side by side, native
 * zlib, geometry over threads, CSV rows formatted by threads into bytes. Same outputs.
 * Usage: node bench/audit-wired.mjs FILE OUT.csv THREADS
 */
import * as fs from 'node:fs';
import { parallelGeometry, readMeshParallel } from '../dist/cli/parallel.js';
import { writeCellsCsv } from '../dist/cli/parallel-csv.js';
import { runAudit } from '../dist/audit/audit.js';
import { toJson } from '../dist/io/format.js';

const [file, csv, threadsArg] = process.argv.slice(2);
const threads = Number(threadsArg);
const plan = fs.existsSync(new URL('../dist/audit/plan.js', import.meta.url)) ? await import('../dist/audit/plan.js') : null;
const mesh = await readMeshParallel(file, threads);
const result = runAudit(mesh, { file, geometry: await parallelGeometry(mesh, threads) });
const decision = plan ? plan.buildPlan(result, {}) : null;
const fd = fs.openSync(csv, 'w');
writeCellsCsv(fd, result, decision?.cellColumns ?? [], threads);
fs.closeSync(fd);
process.stdout.write(toJson(decision ? { ...result.summary, plan: decision.summary } : result.summary));
