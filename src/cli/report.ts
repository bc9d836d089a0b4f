/** The human report of an audit (our own layout). */
import type { AuditSummary } from '../audit/audit.js';
import type { PlanSummary } from '../audit/plan.js';
import { lpad, pad, renderPlan } from './plan-report.js';
import { formatCount, formatLength, formatNumber, formatSeconds } from './units.js';

const MODEL_FORMULA: Record<string, string> = {
  advection: 'advection, λ = |u|',
  'shallow-water': 'shallow water, λ = |u| + √(g·H)',
  acoustic: 'acoustic, λ = |u| + c',
};


export function renderReport(s: AuditSummary, plan?: PlanSummary): string {
  const out: string[] = [];
  const push = (line = '') => out.push(line);
  push(`steplens ${s.steplens} · ${s.file ?? 'mesh'}`);
  push(`  mesh      ${formatCount(s.mesh.cells)} cells (${formatCount(s.mesh.types.triangle)} triangles, ${formatCount(s.mesh.types.quad)} quads), ${formatCount(s.mesh.points)} points [${s.mesh.format}]`);
  push(`  physics   ${MODEL_FORMULA[s.model.name] ?? s.model.name}`);
  if (s.model.velocity) push(`            velocity: ${s.model.velocity}`);
  if (s.model.depth) push(`            depth: ${s.model.depth}`);
  if (s.model.sound_speed) push(`            sound speed: ${s.model.sound_speed}`);
  if (s.input.coords === 'geographic') push('  coords    longitude/latitude in degrees; lengths on the local tangent plane of each cell (R = 6 371 008.8 m)');
  if (s.input.length_unit !== 'm' || s.input.velocity_unit !== 'm/s') push(`  units     input lengths in ${s.input.length_unit}, velocities in ${s.input.velocity_unit}; results in SI`);
  push(`  Courant   C = ${formatNumber(s.limit.courant, 6)} (${s.limit.courant_source})`);
  push(s.limit.length === 'flux'
    ? '  step      dt = C·A / Σ max(u·n, 0)|f| per cell (exact face flux; inscribed length shown beside it)'
    : '  step      dt = C·h/λ per cell, h = 2·area/perimeter');
  if (s.model.diffusivity) push(`  diffusion ν: ${s.model.diffusivity}; dt_diff = ${s.model.diffusion_scale === 1 ? '' : `${formatNumber(s.model.diffusion_scale)}·`}A / Σ ν|f|/d_f, 1/dt = 1/dt_adv + 1/dt_diff`);
  push();
  if (s.limit.dt === null) {
    push('LARGEST STABLE STEP  no limit: no cell has a nonzero wave speed');
  } else {
    const c = s.limit.centroid;
    push(`LARGEST STABLE STEP  ${formatSeconds(s.limit.dt)}  (${s.limit.dt} s)`);
    const xy = s.input.coords === 'geographic' ? ['lon', 'lat'] : ['x', 'y'];
    push(`  set by cell ${s.limit.cell} at ${xy[0]} = ${c ? formatNumber(c[0], 10) : '?'}, ${xy[1]} = ${c ? formatNumber(c[1], 10) : '?'}`);
    if (s.limit.piece) push(`  in piece  ${s.limit.piece.index}${s.limit.piece.file ? ` (${s.limit.piece.file})` : ''}`);
    if (s.limit.why) push(`  because   ${s.limit.why}`);
    const parts = Object.entries(s.limit.parts).filter(([k]) => k !== 'advective');
    if (parts.length > 1) {
      push(`  parts     ${parts.map(([k, v]) => `${k} ${formatSeconds(v.dt)}${v.cell === null ? '' : ` (cell ${v.cell})`}`).join(' · ')}`);
    }
    push(`  near it   ${formatCount(s.near_limit.within_2x)} cells within 2×, ${formatCount(s.near_limit.within_10x)} within 10× of the limit`);
  }
  if (s.intended) {
    const it = s.intended;
    push();
    push(`INTENDED STEP  ${formatSeconds(it.dt)}: ${it.ratio_to_limit === null ? '' : `${formatNumber(it.ratio_to_limit)}× the limit, `}` +
      `${formatCount(it.cells_over_courant)} cells over C = ${formatNumber(s.limit.courant, 6)}, largest Courant number ${formatNumber(it.max_courant)}`);
  }
  const q = s.quantiles;
  push();
  push(`step spread  min ${formatSeconds(q.min)} · 5% ${formatSeconds(q.p05)} · median ${formatSeconds(q.median)} · 95% ${formatSeconds(q.p95)} · max ${formatSeconds(q.max)}`);
  if (s.worst.length) {
    push();
    push(`worst ${s.worst.length} cells`);
    push(`  ${pad('#', 4)}${pad('cell', 10)}${pad('type', 10)}${lpad('dt', 12)}${lpad('h', 12)}${lpad('λ [m/s]', 11)}${lpad('r. ratio', 10)}${lpad('min ∠', 8)}  cause`);
    s.worst.forEach((w, k) => {
      push(`  ${pad(String(k + 1), 4)}${pad(String(w.cell), 10)}${pad(w.type, 10)}${lpad(formatSeconds(w.dt), 12)}${lpad(formatLength(w.inradius), 12)}` +
        `${lpad(formatNumber(w.speed), 11)}${lpad(formatNumber(w.radius_ratio), 10)}${lpad(formatNumber(w.min_angle, 3) + '°', 8)}  ${w.cause.join(', ') || '—'}`);
    });
  }
  if (s.histogram.length) {
    push();
    push('cells per decade of dt');
    const max = Math.max(...s.histogram.map((h) => h.cells));
    for (const h of s.histogram) {
      const bar = h.cells === 0 ? '' : '█'.repeat(Math.max(1, Math.round((40 * h.cells) / max)));
      push(`  ${lpad(formatSeconds(h.from), 10)} – ${pad(formatSeconds(h.to), 10)} ${pad(bar, 40)} ${formatCount(h.cells)}`);
    }
  }
  const c = s.counts;
  push();
  push(`cells  degenerate ${formatCount(c.degenerate)} · inverted ${formatCount(c.inverted)} · non-convex ${formatCount(c.non_convex)} · dry ${formatCount(c.dry)} · no limit ${formatCount(c.unlimited)}`);
  push(`       duplicate points ${formatCount(c.duplicate_points)} · unused points ${formatCount(c.unused_points)} · isolated cells ${formatCount(c.isolated_cells)}`);
  push(`       small ${formatCount(c.small)} · poor shape ${formatCount(c.poor_shape)} · fast flow ${formatCount(c.fast)}  (small: h ≤ ½ median; fast: λ ≥ 2× median)`);
  if (plan) for (const line of renderPlan(s, plan)) push(line);
  if (s.warnings.length) {
    push();
    push('warnings');
    for (const w of s.warnings) push(`  - ${w}`);
  }
  push();
  push(`note: ${s.caution}`);
  return out.join('\n') + '\n';
}
