/** The decision sections of the human report: remeshing, size field, local time stepping, run cost, Courant band. */
import type { AuditSummary } from '../audit/audit.js';
import type { BandCell } from '../audit/band.js';
import type { LtsSummary, PlanSummary, RemeshPlan } from '../audit/plan.js';
import type { RunCost, RunCostLine } from '../audit/cost.js';
import { formatCount, formatLength, formatNumber, formatSeconds } from './units.js';

/** Regions listed in the report (the JSON has them all). */
const REGIONS_SHOWN = 8;
/** Cells listed per band list. */
const BAND_CELLS_SHOWN = 5;

export function pad(s: string, n: number): string {
  return s.length >= n ? s : s + ' '.repeat(n - s.length);
}

export function lpad(s: string, n: number): string {
  return s.length >= n ? s : ' '.repeat(n - s.length) + s;
}

function gain(x: number | null): string {
  return x === null ? 'no limit left' : `×${formatNumber(x, 3)}`;
}

function percent(x: number): string {
  return `${formatNumber(100 * x, 3)}%`;
}

/** Wall and simulated times: the report's seconds/minutes/hours, with days beside long ones. */
function longTime(t: number | null): string {
  if (t === null) return '—';
  return t >= 2 * 86400 ? `${formatSeconds(t)} (${formatNumber(t / 86400, 3)} days)` : formatSeconds(t);
}

function remeshLines(s: AuditSummary, p: RemeshPlan): string[] {
  const out = ['', 'REMESHING  the limit once the k worst cells no longer limit the step (remeshed or improved)'];
  out.push(`  ${pad('gain', 8)}${lpad('cells k', 10)}  limit`);
  for (const g of p.gains) {
    out.push(`  ${pad(`×${formatNumber(g.gain)}`, 8)}${lpad(g.cells === null ? '—' : formatCount(g.cells), 10)}  ` +
      (g.dt === null ? 'not reachable: fewer cells than that limit the step' : formatSeconds(g.dt)));
  }
  if (p.zero_cells > 0) out.push(`  (${formatCount(p.zero_cells)} degenerate cells with dt = 0 come first; gains are against ${formatSeconds(p.reference_dt)}, the limit without them)`);
  const n = p.regions.length;
  out.push(`  ${n} region${n === 1 ? '' : 's'} hold${n === 1 ? 's' : ''} the ${formatCount(p.grouped.cells)} worst cells (grouped: ${p.grouped.rule})`);
  if (n === 0) return out;
  const [xl, yl] = s.input.coords === 'geographic' ? ['lon', 'lat'] : ['x', 'y'];
  out.push(`  ${pad('region', 8)}${lpad('cells', 7)}${lpad('worst dt', 12)}   ${pad(`${xl} from … to`, 24)}${pad(`${yl} from … to`, 24)}then the limit (this region and those above remeshed)`);
  for (const r of p.regions.slice(0, REGIONS_SHOWN)) {
    const b = r.bbox;
    out.push(`  ${pad(String(r.region), 8)}${lpad(formatCount(r.cells), 7)}${lpad(formatSeconds(r.worst_dt), 12)}   ` +
      `${pad(`${formatNumber(b[0], 8)} … ${formatNumber(b[2], 8)}`, 24)}${pad(`${formatNumber(b[1], 8)} … ${formatNumber(b[3], 8)}`, 24)}` +
      `${formatSeconds(r.dt_after)} (${gain(r.gain_after)})`);
  }
  if (n > REGIONS_SHOWN) out.push(`  … and ${n - REGIONS_SHOWN} more regions (all in the JSON summary)`);
  return out;
}

function sizeFieldLines(s: AuditSummary, sf: NonNullable<PlanSummary['size_field']>): string[] {
  const out = ['', `SIZE FIELD  for dt = ${formatSeconds(sf.target_dt)}: per cell h* = T·λ/C, target edge 2√3·h* (equilateral triangle)`];
  out.push(`  to change  ${formatCount(sf.cells_to_change)} of ${formatCount(s.mesh.cells)} cells (h < h*: grow or improve in shape), ${percent(sf.area_share_to_change)} of the area` +
    (sf.largest_growth !== null && sf.cells_to_change > 0 ? `; the worst must grow ×${formatNumber(sf.largest_growth, 3)}` : ''));
  out.push(`  node size  max(largest target edge of the node's cells, their current mean edge): ${formatCount(sf.nodes_raised)} nodes raised`);
  if (sf.note) out.push(`  note       ${sf.note}`);
  return out;
}

function ltsLines(l: LtsSummary): string[] {
  const out = ['', `LOCAL TIME STEPPING  level ℓ = ⌊log₂(dt/dt_min)⌋ ≤ ${l.max_level}, step dt_min·2^ℓ` + (l.base_dt === null ? '' : ` with dt_min = ${formatSeconds(l.base_dt)}`)];
  if (l.note) { out.push(`  ${l.note}`); return out; }
  out.push(`  ${pad('level', 7)}${lpad('step', 12)}${lpad('cells', 12)}${lpad('neighbour rule', 16)}`);
  for (const r of l.levels) out.push(`  ${pad(String(r.level), 7)}${lpad(formatSeconds(r.dt), 12)}${lpad(formatCount(r.before), 12)}${lpad(formatCount(r.after), 16)}`);
  out.push(`  speed-up over global stepping, N / Σ N_ℓ·2^−ℓ: ×${formatNumber(l.speedup_before, 3)} from the levels alone, ` +
    `×${formatNumber(l.speedup_after, 3)} with cells sharing an edge at most one level apart (${formatCount(l.lowered)} cells lowered)`);
  return out;
}

function costRow(label: string, l: RunCostLine, note = ''): string {
  return `  ${pad(label, 10)}dt ${pad(formatSeconds(l.dt), 12)}${lpad(formatCount(l.steps), 14)} steps${lpad(formatCount(l.cell_updates), 20)} cell updates` +
    `${l.wall_time === null ? '' : `   wall ${longTime(l.wall_time)}`}${note}`;
}

function costLines(c: RunCost): string[] {
  const out = ['', `RUN COST  ${longTime(c.duration)} of simulated time` + (c.cell_step_cost === null ? '' : `, ${formatNumber(c.cell_step_cost)} s per cell update`)];
  out.push(c.global ? costRow('global', c.global) : '  global    no positive limit: no step count');
  if (c.intended) out.push(costRow('--dt', c.intended, c.intended.stable ? '' : '   (above the limit: unstable)'));
  if (c.lts) {
    out.push(costRow('local', c.lts));
    out.push(`  ${' '.repeat(10)}(${formatCount(c.lts.macro_steps)} macro steps of ${formatSeconds(c.lts.macro_dt)}; ×${formatNumber(c.lts_saving, 3)} fewer cell updates than global stepping)`);
  }
  return out;
}

function bandCell(b: BandCell, xy: [string, string]): string {
  return `cell ${b.cell} (C = ${formatNumber(b.courant, 3)}, h ${formatLength(b.inradius)}, λ ${formatNumber(b.speed, 3)} m/s, ${xy[0]} ${formatNumber(b.centroid[0], 8)}, ${xy[1]} ${formatNumber(b.centroid[1], 8)})`;
}

function bandLines(s: AuditSummary, p: PlanSummary): string[] {
  const xy: [string, string] = s.input.coords === 'geographic' ? ['lon', 'lat'] : ['x', 'y'];
  const cmin = p.courant_min?.courant_min ?? p.band!.courant_min;
  const out = ['', `COURANT BAND  C_min = ${formatNumber(cmin)} … C = ${formatNumber(s.limit.courant, 6)} for the Courant number X·λ/h of moving cells`];
  const below = p.courant_min;
  if (below) {
    out.push(`  at dt = ${formatSeconds(below.dt)}  ${formatCount(below.below)} of ${formatCount(below.moving_cells)} moving cells below C_min` + (below.worst.length ? '; lowest:' : ''));
    for (const w of below.worst.slice(0, BAND_CELLS_SHOWN)) out.push(`    ${bandCell(w, xy)}`);
  }
  const b = p.band;
  if (!b) return out;
  const share = b.share === 1 ? 'every moving cell' : `${percent(b.share)} of moving cells (${formatCount(b.needed)} of ${formatCount(b.moving_cells)})`;
  if (b.status === 'no-limit') out.push('  step range  no moving cell limits the step: any step keeps the band');
  else if (b.status === 'degenerate') out.push('  step range  none: degenerate cells cap the step at 0');
  else if (b.status === 'ok') {
    out.push(`  step range  ${formatSeconds(b.lo)} … ${formatSeconds(b.hi)} keeps ${share} inside the band (${b.lo} … ${b.hi} s)`);
    if (b.below_at_hi) out.push(`              at ${formatSeconds(b.hi)} ${formatCount(b.below_at_hi)} moving cells stay below C_min`);
  } else {
    const bl = b.blocking!;
    out.push(`  step range  none keeps ${share} inside: ${formatCount(bl.cells)} cells stay below C_min even at the largest stable step ${formatSeconds(b.hi)} (at most ${formatCount(bl.allowed)} may)`);
    out.push('              they are too large or too slow for the step the smallest cells allow: the mesh needs grading between them; largest steps:');
    for (const w of bl.worst.slice(0, BAND_CELLS_SHOWN)) out.push(`    ${bandCell(w, xy)}`);
  }
  return out;
}

export function renderPlan(s: AuditSummary, p: PlanSummary): string[] {
  const out: string[] = [];
  if (p.remesh) out.push(...remeshLines(s, p.remesh));
  if (p.size_field) out.push(...sizeFieldLines(s, p.size_field));
  if (p.lts) out.push(...ltsLines(p.lts));
  if (p.cost) out.push(...costLines(p.cost));
  if (p.courant_min || p.band) out.push(...bandLines(s, p));
  return out;
}
