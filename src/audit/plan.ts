/**
 * From diagnosis to decision: what remeshing would buy, a size field for a target step, local
 * time stepping, the cost of the run and a Courant band, built from an audit result. The JSON
 * summary carries it as `plan`; the per-cell and per-node arrays go to the CSV and VTU.
 */
import { UsageError } from '../mesh/errors.js';
import type { DataArray } from '../mesh/model.js';
import { buildEdges } from '../geometry/edges.js';
import type { AuditResult } from './audit.js';
import { smallestK } from './stats.js';
import { DEFAULT_GAINS, lowerBound, remeshCurve, type RemeshCurve } from './whatif.js';
import { groupRegions, REGION_CELL_CAP, type Region } from './regions.js';
import { sizeField, type SizeFieldSummary } from './sizefield.js';
import { DEFAULT_LTS_LEVELS, levelCounts, ltsLevels, ltsSpeedup, MAX_LTS_LEVEL, neighbourRule } from './lts.js';
import { runCost, type RunCost } from './cost.js';
import { courantBelow, suggestBand, type BandSuggestion, type CourantBelow } from './band.js';

export interface PlanOptions {
  /** Gains of the remeshing table (default 1.5, 2, 4, 10). */
  gains?: number[];
  /** --target-dt: the size field for this step. */
  targetDt?: number;
  /** Compute local-time-stepping levels (also implied by ltsLevels and duration). */
  lts?: boolean;
  /** Highest level L (default 4). */
  ltsLevels?: number;
  /** Simulated duration, seconds. */
  duration?: number;
  /** Measured cost of one cell update, seconds. */
  cellStepCost?: number;
  /** --courant-min: lower bound of the Courant band. */
  courantMin?: number;
  /** Report the step range inside the band. */
  suggestDt?: boolean;
  /** Share of moving cells the range keeps inside the band (default 1). */
  bandShare?: number;
}

export interface RemeshPlan extends RemeshCurve {
  grouped: { cells: number; rule: string };
  regions: Region[];
}

export interface LtsLevelRow { level: number; dt: number | null; before: number; after: number }

export interface LtsSummary {
  max_level: number;
  /** dt_min: the step of level 0 (the global limit). */
  base_dt: number | null;
  levels: LtsLevelRow[];
  speedup_before: number | null;
  speedup_after: number | null;
  /** Cells lowered by the neighbour rule. */
  lowered: number;
  note: string | null;
}

export interface PlanSummary {
  remesh: RemeshPlan | null;
  size_field?: SizeFieldSummary & { note: string | null };
  lts?: LtsSummary;
  cost?: RunCost;
  courant_min?: CourantBelow;
  band?: BandSuggestion;
}

export interface Plan {
  summary: PlanSummary;
  /** Per-cell columns for the CSV and the VTU cell data, in order. */
  cellColumns: { name: string; values: Float64Array | Int32Array }[];
  /** Per-node arrays for the VTU point data. */
  pointData: DataArray[];
  /** Node size for --size-field (null without --target-dt). */
  nodeSize: Float64Array | null;
}

const isPositive = (x: number | undefined): x is number => x !== undefined && x > 0 && Number.isFinite(x);

/** Refuses options that cannot work (before any mesh is read); `hasDt`: the audit has an intended step (--dt). */
export function checkPlanOptions(o: PlanOptions, hasDt: boolean): void {
  const positive: [keyof PlanOptions, string][] = [['targetDt', 'target-dt'], ['duration', 'duration'], ['cellStepCost', 'cell-step-cost'], ['courantMin', 'courant-min']];
  for (const [k, flag] of positive) {
    const v = o[k];
    if (v !== undefined && !isPositive(v as number)) throw new UsageError(`--${flag} must be a positive number, got ${String(v)}`);
  }
  if (o.ltsLevels !== undefined && !(Number.isInteger(o.ltsLevels) && o.ltsLevels >= 0 && o.ltsLevels <= MAX_LTS_LEVEL)) {
    throw new UsageError(`--lts-levels must be an integer from 0 to ${MAX_LTS_LEVEL}, got ${o.ltsLevels}`);
  }
  if (o.bandShare !== undefined && !(o.bandShare > 0 && o.bandShare <= 1)) throw new UsageError(`--band-share must be in (0, 1], got ${o.bandShare}`);
  if (o.gains !== undefined) {
    if (o.gains.length === 0 || o.gains.length > 12) throw new UsageError(`--gains takes 1 to 12 factors, got ${o.gains.length}`);
    for (const g of o.gains) if (!(g > 1 && Number.isFinite(g))) throw new UsageError(`--gains: every factor must be a number above 1, got ${g}`);
  }
  if (o.cellStepCost !== undefined && o.duration === undefined) throw new UsageError('--cell-step-cost needs --duration: the cost is per cell update over the run');
  if (o.suggestDt && o.courantMin === undefined) throw new UsageError('--suggest-dt needs --courant-min (the lower end of the band)');
  if (o.bandShare !== undefined && !o.suggestDt) throw new UsageError('--band-share applies to --suggest-dt');
  if (o.courantMin !== undefined && !o.suggestDt && !hasDt) throw new UsageError('--courant-min needs --dt X (flag the cells below it at X) or --suggest-dt (the step range inside the band)');
}

function remeshPlan(r: AuditResult, gains: number[], top: number): RemeshPlan | null {
  const sorted = r.sortedDt;
  const curve = remeshCurve(sorted, gains);
  if (!curve) return null;
  const k2 = lowerBound(sorted, 2 * curve.reference_dt, curve.zero_cells);
  const reach = k2 < sorted.length;
  const G = Math.min(REGION_CELL_CAP, Math.max(reach ? k2 : 0, top), sorted.length);
  const group = smallestK(r.dt, G);
  const next = G < sorted.length ? sorted[G]! : Infinity;
  const rule = (reach ? `the ${k2} cells needed to reach ×2 or the ${top} worst (--top), whichever is larger` : `×2 is out of reach: the ${top} worst (--top)`) +
    `, at most ${REGION_CELL_CAP}; cells sharing a node form one region`;
  return { ...curve, grouped: { cells: G, rule }, regions: groupRegions(r.mesh, r.dt, group, next, curve.reference_dt) };
}

function ltsPlan(r: AuditResult, L: number, file: string | undefined): { summary: LtsSummary; levels: Uint8Array | null } {
  const base = r.summary.limit.dt;
  if (base === null || !(base > 0)) {
    const note = base === null ? 'no cell limits the step: nothing to level' : 'degenerate cells cap the step at 0: fix them first';
    return { summary: { max_level: L, base_dt: base, levels: [], speedup_before: null, speedup_after: null, lowered: 0, note }, levels: null };
  }
  const raw = ltsLevels(r.dt, base, L);
  const ruled = neighbourRule(raw, r.mesh, buildEdges(r.mesh, file), L);
  const before = levelCounts(raw, L), after = levelCounts(ruled.levels, L);
  const levels = before.map((b, l) => ({ level: l, dt: base * 2 ** l, before: b, after: after[l]! }));
  return {
    summary: { max_level: L, base_dt: base, levels, speedup_before: ltsSpeedup(before), speedup_after: ltsSpeedup(after), lowered: ruled.lowered, note: null },
    levels: ruled.levels,
  };
}

export function buildPlan(r: AuditResult, o: PlanOptions = {}): Plan {
  checkPlanOptions(o, r.courantAtDt !== null);
  const top = r.summary.worst.length;
  const summary: PlanSummary = { remesh: remeshPlan(r, o.gains ?? [...DEFAULT_GAINS], top) };
  const cellColumns: Plan['cellColumns'] = [];
  const pointData: DataArray[] = [];
  let nodeSize: Float64Array | null = null;
  const C = r.summary.limit.courant;

  if (o.targetDt !== undefined) {
    const sf = sizeField(r.mesh, r.geom, r.speed, C, o.targetDt);
    const note = r.dtFlux || r.dtDiffusion
      ? 'the size field follows the inscribed-length rule C·h/λ; the face-flux and diffusive limits in force are not part of it'
      : null;
    summary.size_field = { ...sf.summary, note };
    cellColumns.push({ name: 'target_inradius', values: sf.targetInradius }, { name: 'target_edge', values: sf.targetEdge });
    pointData.push({ name: 'node_target_edge', components: 1, values: sf.nodeFloor }, { name: 'size', components: 1, values: sf.nodeSize });
    nodeSize = sf.nodeSize;
  }

  const wantLts = o.lts === true || o.ltsLevels !== undefined;
  let counts: number[] | null = null;
  if (wantLts || o.duration !== undefined) {
    const lts = ltsPlan(r, o.ltsLevels ?? DEFAULT_LTS_LEVELS, r.summary.file ?? undefined);
    summary.lts = lts.summary;
    if (lts.levels) {
      counts = lts.summary.levels.map((l) => l.after);
      if (wantLts) cellColumns.push({ name: 'lts_level', values: Int32Array.from(lts.levels) });
    }
  }

  if (o.duration !== undefined) {
    summary.cost = runCost(o.duration, r.mesh.nCells, r.summary.limit.dt, o.cellStepCost ?? null, r.summary.intended?.dt ?? null, counts);
  }

  if (o.courantMin !== undefined) {
    if (r.courantAtDt && r.summary.intended) {
      const below = courantBelow(r.courantAtDt, r.speed, r.summary.intended.dt, o.courantMin, r.geom, top);
      summary.courant_min = below.summary;
      cellColumns.push({ name: 'below_courant_min', values: Int32Array.from(below.flags) });
    }
    if (o.suggestDt) {
      if (!(o.courantMin < C)) throw new UsageError(`--courant-min ${o.courantMin} must be below the Courant number C = ${C}: the band would be empty`);
      summary.band = suggestBand(r.dtInscribed, r.speed, r.summary.limit.dt, C, o.courantMin, o.bandShare ?? 1, r.geom, top);
    }
  }
  return { summary, cellColumns, pointData, nodeSize };
}
