/**
 * `steplens audit A.vtu B.vtu …` (files, a glob, or a folder): the audit of every snapshot of a run,
 * the envelope over the run, the cells that set the limit at which times, and a step schedule.
 */
import * as fs from 'node:fs';
import * as path from 'node:path';
import { runAudit, type AuditResult } from '../audit/audit.js';
import {
  DEFAULT_SAFETY, Envelope, checkSameMesh, compareFileNames, precedes, runSummary, snapshotOrder, snapshotSummary,
  type RunSummary, type SnapshotSummary,
} from '../audit/snapshots.js';
import { UsageError } from '../mesh/errors.js';
import type { Mesh } from '../mesh/model.js';
import { toJson } from '../io/format.js';
import { numberOption } from './args.js';
import { auditOptionsFrom, loadMesh, writeResults } from './audit-command.js';
import type { CliIo } from './io.js';
import { formatCount, formatNumber, formatSeconds } from './units.js';

/** Extensions taken from a folder (Triangle meshes by their .ele file; the .node is read beside it). */
export const SNAPSHOT_EXTENSIONS = ['.vtu', '.vtp', '.vtk', '.msh', '.ele'];

function hasWildcard(s: string): boolean {
  return s.includes('*') || s.includes('?');
}

function isFolder(p: string): boolean {
  try {
    return fs.statSync(p).isDirectory();
  } catch {
    return false;
  }
}

/** True when the audit arguments name a run rather than one file: several files, a glob or a folder. */
export function isSnapshotInput(positionals: string[]): boolean {
  return positionals.length > 1 || positionals.some((p) => hasWildcard(p) || isFolder(p));
}

/** `*` (any run of characters) and `?` (one character) in a file name; everything else literal. */
export function globMatcher(pattern: string): RegExp {
  let re = '^';
  for (const ch of pattern) {
    if (ch === '*') re += '[^/]*';
    else if (ch === '?') re += '[^/]';
    else re += ch.replace(/[.+^${}()|[\]\\]/g, '\\$&');
  }
  return new RegExp(re + '$');
}

function listFolder(dir: string): string[] {
  try {
    return fs.readdirSync(dir).filter((n) => !n.startsWith('.') && fs.statSync(path.join(dir, n)).isFile());
  } catch {
    throw new UsageError(`${dir}: cannot list the folder`);
  }
}

/** Files, globs (wildcards in the last path component only) and folders → files in natural order, without repeats. */
export function expandInputs(args: string[]): string[] {
  const out: string[] = [];
  for (const arg of args) {
    if (hasWildcard(arg)) {
      const dir = path.dirname(arg);
      if (hasWildcard(dir)) throw new UsageError(`${arg}: wildcards are supported in the last path component only`);
      if (!isFolder(dir)) throw new UsageError(`${arg}: the folder ${dir} does not exist`);
      const re = globMatcher(path.basename(arg));
      const hits = listFolder(dir).filter((n) => re.test(n));
      if (hits.length === 0) throw new UsageError(`no file matches ${arg}`);
      for (const n of hits) out.push(dir === '.' && !arg.startsWith('.') ? n : path.join(dir, n));
    } else if (isFolder(arg)) {
      const hits = listFolder(arg).filter((n) => SNAPSHOT_EXTENSIONS.includes(path.extname(n).toLowerCase()));
      if (hits.length === 0) throw new UsageError(`${arg}: no mesh files in the folder (${SNAPSHOT_EXTENSIONS.join(', ')})`);
      for (const n of hits) out.push(path.join(arg, n));
    } else out.push(arg);
  }
  const seen = new Set<string>();
  const files = out.filter((f) => {
    const key = path.resolve(f);
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
  return files.sort(compareFileNames);
}

function safetyOption(values: Record<string, unknown>): number {
  const s = numberOption(values.safety, 'safety') ?? DEFAULT_SAFETY;
  if (!(s > 0 && s <= 1)) throw new UsageError(`--safety must be in (0, 1], got ${s}`);
  return s;
}

/** Topology and points only: the reference every later snapshot is checked against. */
function shape(m: Mesh): Mesh {
  return { ...m, pointData: [], cellData: [] };
}

/** Options of the single-file decision report, not computed over a run. */
const SINGLE_FILE_OPTIONS = ['gains', 'target-dt', 'size-field', 'lts', 'lts-levels', 'duration', 'cell-step-cost', 'courant-min', 'suggest-dt', 'band-share'];

export async function snapshotAudit(files: string[], values: Record<string, unknown>, io: CliIo): Promise<number> {
  const single = SINGLE_FILE_OPTIONS.filter((o) => values[o] !== undefined && values[o] !== false);
  if (single.length) throw new UsageError(`--${single[0]} applies to one mesh file, not to a run of snapshots; audit one snapshot (e.g. the one that sets the envelope) for it`);
  const list = expandInputs(files);
  if (list.length === 0) throw new UsageError('audit needs at least one mesh file');
  const safety = safetyOption(values);
  const failBelow = numberOption(values['fail-below'], 'fail-below');
  let ref: Mesh | null = null;
  let base: AuditResult | null = null;
  let env: Envelope | null = null;
  const read: SnapshotSummary[] = [];
  const times: (number | null)[] = [];
  const inputs: string[] = [];
  for (let k = 0; k < list.length; k++) {
    const file = list[k]!;
    io.progress?.(`snapshot ${k + 1} of ${list.length}: reading ${file}`);
    const mesh = loadMesh(file, inputs);
    const options = auditOptionsFrom(values, file);
    if (ref && base) {
      checkSameMesh(ref, list[0]!, mesh, file);
      options.geometry = base.geom;
    }
    io.progress?.(`snapshot ${k + 1} of ${list.length}: auditing ${formatCount(mesh.nCells)} cells`);
    const r = runAudit(mesh, options);
    times.push(mesh.time ?? null);
    if (!env) {
      ref = shape(mesh);
      base = { ...r, mesh: shape(r.mesh) };
      env = new Envelope(r);
    } else env.fold(r, precedes(list, times, k));
    read.push(snapshotSummary(r.summary, file, mesh.time ?? null));
  }
  const order = snapshotOrder(list, times);
  const rank = new Array<number>(list.length);
  order.order.forEach((k, pos) => { rank[k] = pos; });
  env!.renumber(rank);
  const snaps = order.order.map((k) => read[k]!);
  const summary = runSummary(base!.summary, snaps, env!, base!, order.by, safety, order.warnings);
  writeResults(env!.asResult(base!), values, inputs);
  io.progress?.('');
  io.stdout(values.json ? toJson(summary) : renderRun(summary));
  if (failBelow !== undefined && summary.envelope.dt !== null && summary.envelope.dt < failBelow) {
    io.stderr(`steplens: the smallest stable step over the run, ${summary.envelope.dt} s, is below --fail-below ${failBelow} s\n`);
    return 3;
  }
  return 0;
}

function timeText(t: number | null): string {
  return t === null ? '—' : formatSeconds(t);
}

/** The human report of a run (our own layout). */
export function renderRun(s: RunSummary): string {
  const out: string[] = [];
  const m = s.mesh;
  out.push(`steplens ${s.steplens} · ${s.snapshots.length} snapshot${s.snapshots.length === 1 ? '' : 's'}, ordered by ${s.ordered_by === 'time' ? 'the time stored in the files' : 'file name'}`);
  out.push(`  mesh      ${formatCount(m.cells)} cells (${formatCount(m.types.triangle)} triangles, ${formatCount(m.types.quad)} quads), ${formatCount(m.points)} points [${m.format}]`);
  out.push(`  physics   ${s.model.name}${s.model.velocity ? `; velocity: ${s.model.velocity}` : ''}${s.model.depth ? `; depth: ${s.model.depth}` : ''}`);
  out.push(`  Courant   C = ${formatNumber(s.courant.value, 6)} (${s.courant.source})`);
  out.push('');
  out.push(`  ${'#'.padEnd(4)}${'time'.padStart(10)}${'limit'.padStart(12)}  ${'cell'.padEnd(9)}${'cause'.padEnd(22)}file`);
  s.snapshots.forEach((sn, k) => {
    const cause = sn.limit.dt === null ? '' : sn.limit.cause.join(', ') || '—';
    out.push(`  ${String(k).padEnd(4)}${timeText(sn.time).padStart(10)}${formatSeconds(sn.limit.dt).padStart(12)}  ${(sn.limit.cell === null ? '—' : String(sn.limit.cell)).padEnd(9)}${cause.padEnd(22)}${sn.file}`);
  });
  out.push('');
  const e = s.envelope;
  if (e.dt === null) out.push('ENVELOPE  no limit: no cell has a nonzero wave speed in any snapshot');
  else {
    out.push(`ENVELOPE  ${formatSeconds(e.dt)}  (${e.dt} s): the smallest step of any cell over the run`);
    const c = e.centroid;
    out.push(`  set by cell ${e.cell}${c ? ` at x = ${formatNumber(c[0], 10)}, y = ${formatNumber(c[1], 10)}` : ''} in snapshot ${e.snapshot}${e.time === null ? '' : ` (t = ${formatSeconds(e.time)})`}`);
  }
  if (s.limiting_cells.length) {
    out.push('');
    out.push('cells that set the limit');
    for (const lc of s.limiting_cells) {
      const when = lc.snapshots.map((k, j) => (lc.times[j] === null ? `#${k}` : `t = ${formatSeconds(lc.times[j]!)}`)).join(', ');
      out.push(`  cell ${String(lc.cell).padEnd(9)} ${when}`);
    }
  }
  const sc = s.schedule;
  out.push('');
  out.push(`suggested steps (safety ${sc.safety} × the smaller limit of the two snapshots around each interval)`);
  if (sc.intervals.length) {
    out.push(`  ${'from'.padStart(10)}${'to'.padStart(10)}${'step'.padStart(12)}${'steps'.padStart(10)}${'even step'.padStart(14)}`);
    for (const it of sc.intervals) {
      const from = it.from === null ? `#${it.from_snapshot}` : formatSeconds(it.from);
      const to = it.to === null ? `#${it.to_snapshot}` : formatSeconds(it.to);
      out.push(`  ${from.padStart(10)}${to.padStart(10)}${formatSeconds(it.dt).padStart(12)}${(it.steps === null ? '—' : formatCount(it.steps)).padStart(10)}` +
        `${(it.dt_even === null ? '—' : `${formatNumber(it.dt_even, 6)} s`).padStart(14)}`);
    }
  }
  out.push(`  one step for the whole run: ${formatSeconds(sc.constant)}`);
  out.push(`  ${sc.assumption}`);
  const warn = [...s.warnings];
  s.snapshots.forEach((sn) => { for (const w of sn.warnings) warn.push(`${sn.file}: ${w}`); });
  if (warn.length) {
    out.push('');
    out.push('warnings');
    for (const w of warn) out.push(`  - ${w}`);
  }
  out.push('');
  out.push(`note: ${s.caution}`);
  return out.join('\n') + '\n';
}
