/**
 * Snapshots over a run: the same mesh with a new velocity at each saved time. Per snapshot the
 * global limit; per cell the envelope (the minimum step over all snapshots and where it occurs);
 * a suggested step schedule between snapshot times.
 *
 * Memory: one snapshot's audit at a time is folded into the envelope (a few arrays per cell);
 * only the first mesh's points and cells are kept, to check that every later file has the same.
 */
import type { AuditResult, AuditSummary } from './audit.js';
import { CAUTION, VERSION } from './audit.js';
import { MeshInputError, UsageError } from '../mesh/errors.js';
import { centroidOf } from '../geometry/cells.js';
import type { Mesh } from '../mesh/model.js';

/** Natural order: digit runs compare as numbers, so "_2" sorts before "_10"; then plain order. */
/** By file name (natural order), then by the whole path: where the files sit does not reorder them. */
export function compareFileNames(a: string, b: string): number {
  return naturalCompare(a.replace(/^.*[\\/]/, ''), b.replace(/^.*[\\/]/, '')) || naturalCompare(a, b);
}

export function naturalCompare(a: string, b: string): number {
  let i = 0, j = 0;
  while (i < a.length && j < b.length) {
    const ca = a.charCodeAt(i), cb = b.charCodeAt(j);
    if (isDigit(ca) && isDigit(cb)) {
      const si = i, sj = j;
      while (i < a.length && a.charCodeAt(i) === 48) i++;
      while (j < b.length && b.charCodeAt(j) === 48) j++;
      const zi = i, zj = j;
      while (i < a.length && isDigit(a.charCodeAt(i))) i++;
      while (j < b.length && isDigit(b.charCodeAt(j))) j++;
      const la = i - zi, lb = j - zj;
      if (la !== lb) return la - lb;
      for (let k = 0; k < la; k++) {
        const d = a.charCodeAt(zi + k) - b.charCodeAt(zj + k);
        if (d !== 0) return d;
      }
      // equal values: fewer leading zeros first
      const lz = (zi - si) - (zj - sj);
      if (lz !== 0) return lz;
      continue;
    }
    if (ca !== cb) return ca - cb;
    i++;
    j++;
  }
  return (a.length - i) - (b.length - j);
}

function isDigit(c: number): boolean {
  return c >= 48 && c <= 57;
}

export interface SnapshotOrder {
  /** Positions into the input list, in run order. */
  order: number[];
  by: 'time' | 'name';
  warnings: string[];
}

/** By the time stored in the files when every file has one (ties by name), else by name. */
export function snapshotOrder(files: string[], times: (number | null)[]): SnapshotOrder {
  const idx = files.map((_, k) => k);
  const byName = (p: number, q: number) => compareFileNames(files[p]!, files[q]!);
  const withTime = times.filter((t) => t !== null).length;
  const warnings: string[] = [];
  if (withTime === files.length && files.length > 0) {
    idx.sort((p, q) => (times[p]! - times[q]!) || byName(p, q));
    for (let k = 1; k < idx.length; k++) {
      if (times[idx[k]!] === times[idx[k - 1]!]) warnings.push(`${files[idx[k - 1]!]} and ${files[idx[k]!]} hold the same time ${times[idx[k]!]}`);
    }
    return { order: idx, by: 'time', warnings };
  }
  if (withTime > 0) warnings.push(`${withTime} of ${files.length} files hold a time value and the others do not: snapshots are ordered by name and the times are not used for the schedule`);
  idx.sort(byName);
  return { order: idx, by: 'name', warnings };
}

/** Points may differ by rounding (an ASCII copy of a binary file): this much of the mesh's extent. */
export const SAME_POINT_TOLERANCE = 1e-9;

/** What makes `mesh` differ from `ref` (points, cells, node lists), or null when it is the same mesh. */
export function meshDifference(ref: Mesh, mesh: Mesh): string | null {
  if (mesh.nPoints !== ref.nPoints) return `${mesh.nPoints} points instead of ${ref.nPoints}`;
  if (mesh.nCells !== ref.nCells) return `${mesh.nCells} cells instead of ${ref.nCells}`;
  const p = ref.points, q = mesh.points;
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < p.length; i++) { const v = p[i]!; if (v < lo) lo = v; if (v > hi) hi = v; }
  const tol = p.length ? SAME_POINT_TOLERANCE * Math.max(hi - lo, Math.abs(hi), Math.abs(lo)) : 0;
  for (let i = 0; i < p.length; i++) {
    if (!(Math.abs(q[i]! - p[i]!) <= tol)) {
      const k = Math.floor(i / 2);
      return `point ${k} is at (${q[2 * k]}, ${q[2 * k + 1]}) instead of (${p[2 * k]}, ${p[2 * k + 1]})`;
    }
  }
  for (let c = 0; c < ref.nCells; c++) {
    if (mesh.cellTypes[c] !== ref.cellTypes[c] || mesh.cellOffsets[c + 1] !== ref.cellOffsets[c + 1]) {
      return `cell ${c} is a ${cellWord(mesh, c)} instead of a ${cellWord(ref, c)}`;
    }
    for (let k = ref.cellOffsets[c]!; k < ref.cellOffsets[c + 1]!; k++) {
      if (mesh.cellNodes[k] !== ref.cellNodes[k]) return `cell ${c} has nodes ${nodeList(mesh, c)} instead of ${nodeList(ref, c)}`;
    }
  }
  return null;
}

function cellWord(m: Mesh, c: number): string {
  return m.cellOffsets[c + 1]! - m.cellOffsets[c]! === 4 ? 'quad' : 'triangle';
}

function nodeList(m: Mesh, c: number): string {
  return `[${Array.from(m.cellNodes.subarray(m.cellOffsets[c]!, m.cellOffsets[c + 1]!)).join(', ')}]`;
}

/** Throws a MeshInputError naming `file` and the first difference from the reference mesh. */
export function checkSameMesh(ref: Mesh, refFile: string, mesh: Mesh, file: string): void {
  const d = meshDifference(ref, mesh);
  if (d !== null) throw new MeshInputError(`not the same mesh as ${refFile}: ${d}`, { file });
}

/**
 * Which earlier-read snapshots the k-th one precedes in run order (1 = it comes first): by time
 * when both hold one, else by name. Used to break ties in the envelope.
 */
export function precedes(files: string[], times: (number | null)[], k: number): Uint8Array {
  const out = new Uint8Array(k);
  const tk = times[k] ?? null;
  for (let j = 0; j < k; j++) {
    const tj = times[j] ?? null;
    out[j] = (tk !== null && tj !== null && tk !== tj ? tk < tj : naturalCompare(files[k]!, files[j]!) < 0) ? 1 : 0;
  }
  return out;
}

/**
 * Per cell, the row of the snapshot where its step is smallest: dt, λ, causes and the extra
 * columns of that snapshot, and which snapshot it was. A tie goes to the snapshot that comes first
 * in run order (so a cell with no limit anywhere points at the first snapshot).
 */
export class Envelope {
  readonly dt: Float64Array;
  readonly snapshot: Int32Array;
  readonly speed: Float64Array;
  readonly cause: Uint8Array;
  readonly courant: Float64Array | null;
  readonly columns: { name: string; values: Float64Array }[];
  private folded = 0;

  constructor(first: AuditResult) {
    const n = first.mesh.nCells;
    this.dt = Float64Array.from(first.dt);
    this.snapshot = new Int32Array(n);
    this.speed = Float64Array.from(first.speed);
    this.cause = Uint8Array.from(first.cause);
    this.courant = first.courantAtDt ? Float64Array.from(first.courantAtDt) : null;
    this.columns = first.columns.map((c) => ({ name: c.name, values: Float64Array.from(c.values) }));
    this.folded = 1;
  }

  /**
   * Folds the next snapshot's result and returns its index; `before[j]` = 1 when it comes before
   * the j-th folded snapshot in run order (default: it comes after all of them).
   */
  fold(r: AuditResult, before: Uint8Array = new Uint8Array(this.folded)): number {
    const k = this.folded++;
    const { dt, snapshot, speed, cause, courant, columns } = this;
    const rdt = r.dt;
    if (rdt.length !== dt.length || r.columns.length !== columns.length) throw new Error('snapshot results differ in shape');
    for (let i = 0; i < dt.length; i++) {
      const v = rdt[i]!, held = dt[i]!;
      if (!(v < held || (v === held && before[snapshot[i]!] === 1))) continue;
      dt[i] = v;
      snapshot[i] = k;
      speed[i] = r.speed[i]!;
      cause[i] = r.cause[i]!;
      if (courant && r.courantAtDt) courant[i] = r.courantAtDt[i]!;
      for (let c = 0; c < columns.length; c++) columns[c]!.values[i] = r.columns[c]!.values[i]!;
    }
    return k;
  }

  get count(): number {
    return this.folded;
  }

  /** Renumbers the snapshot of each cell after sorting: `rank[k]` is the run position of the k-th folded snapshot. */
  renumber(rank: number[]): void {
    const s = this.snapshot;
    for (let i = 0; i < s.length; i++) s[i] = rank[s[i]!]!;
  }

  /** The smallest envelope step and its cell (null when no cell is limited). */
  limit(): { dt: number | null; cell: number | null } {
    let best = Infinity, cell = -1;
    const dt = this.dt;
    for (let i = 0; i < dt.length; i++) if (dt[i]! < best) { best = dt[i]!; cell = i; }
    return cell < 0 ? { dt: null, cell: null } : { dt: best, cell };
  }

  /**
   * An audit result over the envelope, for the per-cell writers: the standard columns on the
   * envelope plus dt_envelope and snapshot_of_min. `base` supplies mesh, geometry and summary.
   */
  asResult(base: AuditResult): AuditResult {
    const snap = new Float64Array(this.snapshot.length);
    for (let i = 0; i < snap.length; i++) snap[i] = this.snapshot[i]!;
    return {
      ...base,
      speed: this.speed,
      dt: this.dt,
      cause: this.cause,
      courantAtDt: this.courant,
      columns: [...this.columns, { name: 'dt_envelope', values: this.dt }, { name: 'snapshot_of_min', values: snap }],
    };
  }
}

export interface SnapshotSummary {
  file: string;
  time: number | null;
  limit: AuditSummary['limit'];
  worst: { cell: number; dt: number | null; cause: string[] }[];
  quantiles: AuditSummary['quantiles'];
  near_limit: AuditSummary['near_limit'];
  warnings: string[];
}

export function snapshotSummary(s: AuditSummary, file: string, time: number | null): SnapshotSummary {
  return {
    file,
    time,
    limit: s.limit,
    worst: s.worst.map((w) => ({ cell: w.cell, dt: w.dt, cause: w.cause })),
    quantiles: s.quantiles,
    near_limit: s.near_limit,
    warnings: s.warnings,
  };
}

export interface ScheduleInterval {
  from_snapshot: number;
  to_snapshot: number;
  /** Snapshot times (null when the files hold none). */
  from: number | null;
  to: number | null;
  /** safety × min(limit at the two ends); null when neither end is limited. */
  dt: number | null;
  /** Steps to cross the interval and the even step that lands on its end (null without times). */
  steps: number | null;
  dt_even: number | null;
}

export interface Schedule {
  safety: number;
  intervals: ScheduleInterval[];
  /** One step for the whole run: safety × the smallest limit over all snapshots. */
  constant: number | null;
  assumption: string;
}

export const SCHEDULE_ASSUMPTION =
  'Between two snapshots the flow is assumed to vary slowly, so that the smaller limit of the two ends holds in ' +
  'between. A schedule is no guarantee: peaks between snapshots are not seen, and a stable step is necessary, not sufficient.';

export const DEFAULT_SAFETY = 0.9;

function minLimit(a: number | null, b: number | null): number | null {
  if (a === null) return b;
  if (b === null) return a;
  return Math.min(a, b);
}

/**
 * Piecewise-constant steps between consecutive snapshots (in run order): each interval's step is
 * safety × the smaller of the limits at its two ends; with times, the number of steps that
 * cross it and the even step that lands on the next snapshot.
 */
export function stepSchedule(times: (number | null)[], limits: (number | null)[], safety = DEFAULT_SAFETY): Schedule {
  if (!(safety > 0 && safety <= 1)) throw new UsageError(`--safety must be in (0, 1], got ${safety}`);
  const intervals: ScheduleInterval[] = [];
  let all: number | null = null;
  for (const l of limits) all = minLimit(all, l);
  for (let k = 0; k + 1 < limits.length; k++) {
    const lim = minLimit(limits[k]!, limits[k + 1]!);
    const dt = lim === null ? null : safety * lim;
    const t0 = times[k] ?? null, t1 = times[k + 1] ?? null;
    let steps: number | null = null, even: number | null = null;
    if (t0 !== null && t1 !== null && dt !== null && dt > 0 && t1 > t0) {
      // a ratio that is an integer up to rounding needs no extra step
      steps = Math.max(1, Math.ceil((t1 - t0) / dt * (1 - 1e-12)));
      even = (t1 - t0) / steps;
    }
    intervals.push({ from_snapshot: k, to_snapshot: k + 1, from: t0, to: t1, dt, steps, dt_even: even });
  }
  return { safety, intervals, constant: all === null ? null : safety * all, assumption: SCHEDULE_ASSUMPTION };
}

/** Which cells set the global limit, and at which snapshots (in order of first appearance). */
export function limitingCells(snaps: SnapshotSummary[]): { cell: number; snapshots: number[]; times: (number | null)[] }[] {
  const out: { cell: number; snapshots: number[]; times: (number | null)[] }[] = [];
  const at = new Map<number, number>();
  snaps.forEach((s, k) => {
    const c = s.limit.cell;
    if (c === null || s.limit.dt === null) return;
    let j = at.get(c);
    if (j === undefined) { j = out.length; at.set(c, j); out.push({ cell: c, snapshots: [], times: [] }); }
    out[j]!.snapshots.push(k);
    out[j]!.times.push(s.time);
  });
  return out;
}

export interface RunSummary {
  steplens: string;
  ordered_by: 'time' | 'name';
  mesh: AuditSummary['mesh'];
  model: AuditSummary['model'];
  courant: { value: number; source: string };
  snapshots: SnapshotSummary[];
  envelope: { dt: number | null; cell: number | null; snapshot: number | null; time: number | null; centroid: [number, number] | null };
  limiting_cells: { cell: number; snapshots: number[]; times: (number | null)[] }[];
  schedule: Schedule;
  warnings: string[];
  caution: string;
}

/** The JSON summary of a run: per-snapshot limits, the envelope, the limiting cells and the schedule. */
export function runSummary(first: AuditSummary, snaps: SnapshotSummary[], env: Envelope, base: AuditResult, by: 'time' | 'name', safety: number, warnings: string[]): RunSummary {
  const lim = env.limit();
  const k = lim.cell === null ? null : env.snapshot[lim.cell]!;
  const times = snaps.map((s) => (by === 'time' ? s.time : null));
  return {
    steplens: VERSION,
    ordered_by: by,
    mesh: first.mesh,
    model: first.model,
    courant: { value: first.limit.courant, source: first.limit.courant_source },
    snapshots: snaps,
    envelope: {
      dt: lim.dt,
      cell: lim.cell,
      snapshot: k,
      time: k === null ? null : snaps[k]!.time,
      centroid: lim.cell === null ? null : centroidOf(base.geom, lim.cell),
    },
    limiting_cells: limitingCells(snaps),
    schedule: stepSchedule(times, snaps.map((s) => s.limit.dt), safety),
    warnings,
    caution: CAUTION,
  };
}
