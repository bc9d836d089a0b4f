/**
 * The audit: per-cell stable step dt = C·h/λ, the global limit, the cells that set it and why.
 *
 * h = 2A/P (inscribed length). For first-order upwind finite volume with forward Euler on any
 * simple polygon, dt ≤ h/|u| is a proven safe bound: with a constant u the outflow is
 * Σ max(u·n, 0)|f| = ½ Σ |u·n||f| ≤ |u|·P/2, so dt·outflow/A ≤ dt·|u|·P/(2A) = dt·|u|/h ≤ 1.
 */
import { cellTypeName, QUAD, type Mesh } from '../mesh/model.js';
import { UsageError } from '../mesh/errors.js';
import { float64s, uint8s } from '../mesh/alloc.js';
import { centroidOf, computeGeometry, shapeAt, FLAG_DEGENERATE, FLAG_INVERTED, FLAG_NONCONVEX, FLAG_REPEATED_NODE, type CellGeometry } from '../geometry/cells.js';
import { cellScalar, cellSpeeds, STANDARD_GRAVITY, type WaveModel } from '../physics/speed.js';
import { buildEdges } from '../geometry/edges.js';
import { diffusionLimit, fluxLimit } from '../physics/faces.js';
import { looksGeographic, type CoordinateSystem } from '../geometry/geographic.js';
import { lengthFactor, velocityFactor } from '../physics/units.js';
import { meshChecks, type MeshChecks } from './mesh-checks.js';
import { quantileOf, quantileSorted, smallestK, sortedFinite } from './stats.js';
import { lowerBound } from './whatif.js';

export const CAUSE_SMALL = 1;
export const CAUSE_SHAPE = 2;
export const CAUSE_FAST = 4;
export const CAUSE_DEGENERATE = 8;
/** The diffusive limit is below the advective one. */
export const CAUSE_DIFFUSION = 16;

export type LengthRule = 'inscribed' | 'flux';

/** A cell is "small" when h ≤ SMALL_FACTOR × the median h (common practice, our threshold). */
export const SMALL_FACTOR = 0.5;
/** A cell is in "fast flow" when λ ≥ FAST_FACTOR × the median λ (common practice, our threshold). */
export const FAST_FACTOR = 2;
/**
 * Upper ends of the acceptable radius-ratio ranges, from Stimpson et al., The Verdict Library
 * Reference Manual, SAND2007-2853P (2007): triangles [1, 3], quadrilaterals [1, 1.3].
 */
export const RADIUS_RATIO_OK_TRIANGLE = 3;
export const RADIUS_RATIO_OK_QUAD = 1.3;

export const CAUTION =
  'A stable time step is necessary, not sufficient, for a correct simulation: accuracy, boundary ' +
  'conditions, wetting and drying, source terms and the solver\'s own stability rules still apply. ' +
  'Safety-relevant studies follow local codes and licensed engineering practice.';

export interface AuditOptions {
  model?: WaveModel;
  velocity?: string | [string, string];
  depth?: string;
  gravity?: number;
  soundSpeed?: string | number;
  /** Courant number C in dt = C·h/λ (default 1: first-order upwind with forward Euler). */
  courant?: number;
  /** Where C came from, for the report (default: "default (first-order upwind, forward Euler)"). */
  courantSource?: string;
  /** The step the run intends to use, seconds. */
  dt?: number;
  /** Advective limit from the inscribed length (default) or the exact face flux. */
  length?: LengthRule;
  /** Kinematic diffusivity ν (m²/s): an array name or a constant. Adds the diffusive limit. */
  diffusivity?: string | number;
  /** D in dt_diff = D·A/Σ(ν|f|/d): 2·d_max of the time integrator (forward Euler: 1). */
  diffusionScale?: number;
  /** Number of worst cells listed (default 10). */
  top?: number;
  /** File name for messages and the summary. */
  file?: string;
  /** planar (default) or geographic (x = longitude, y = latitude, degrees). */
  coords?: CoordinateSystem;
  /** Unit of planar coordinates and of the depth array: m (default), km, ft. */
  lengthUnit?: string;
  /** Unit of the velocity (and of an array sound speed): m/s (default), km/h, kn, ft/s. */
  velocityUnit?: string;
  /** Geometry computed elsewhere (e.g. in parallel); must be computeGeometry's result for this mesh. */
  geometry?: CellGeometry;
  /** Mesh checks computed elsewhere (meshChecks of this mesh, as read). */
  checks?: MeshChecks;
}

export interface WorstCell {
  cell: number;
  dt: number | null;
  type: 'triangle' | 'quad';
  centroid: [number, number];
  area: number;
  inradius: number;
  speed: number;
  radius_ratio: number | null;
  min_angle: number;
  cause: string[];
  why: string;
}

export interface AuditSummary {
  steplens: string;
  file: string | null;
  units: { length: 'm'; time: 's'; speed: 'm/s'; area: 'm2'; coordinates: 'm' | 'degrees' };
  input: { coords: CoordinateSystem; length_unit: string; velocity_unit: string };
  mesh: { cells: number; points: number; types: { triangle: number; quad: number }; format: string };
  model: { name: WaveModel; velocity: string | null; depth: string | null; gravity: number | null; sound_speed: string | null; diffusivity: string | null; diffusion_scale: number | null };
  limit: { dt: number | null; cell: number | null; courant: number; courant_source: string; centroid: [number, number] | null; cause: string[]; why: string | null; length: LengthRule; parts: Record<string, { dt: number | null; cell: number | null }>; piece?: { index: number; file: string | null } };
  worst: WorstCell[];
  quantiles: { min: number | null; p01: number | null; p05: number | null; p25: number | null; median: number | null; p75: number | null; p95: number | null; max: number | null };
  near_limit: { within_2x: number; within_10x: number };
  histogram: { decade: number; from: number; to: number; cells: number }[];
  counts: { degenerate: number; repeated_node: number; inverted: number; non_convex: number; dry: number; unlimited: number; small: number; poor_shape: number; fast: number; diffusion: number; duplicate_points: number; unused_points: number; isolated_cells: number };
  medians: { inradius: number | null; speed: number | null };
  intended: null | { dt: number; ratio_to_limit: number | null; cells_over_courant: number; max_courant: number | null };
  warnings: string[];
  caution: string;
}

export interface AuditResult {
  mesh: Mesh;
  geom: CellGeometry;
  speed: Float64Array;
  /** The step in force per cell (advective, combined with diffusion when given). */
  dt: Float64Array;
  /** C·h/λ with the inscribed length. */
  dtInscribed: Float64Array;
  dtFlux: Float64Array | null;
  dtDiffusion: Float64Array | null;
  /** The finite steps in ascending order (shared by the summary and the plan). */
  sortedDt: Float64Array;
  /** Extra per-cell columns for the CSV/VTU, in order. */
  columns: { name: string; values: Float64Array }[];
  cause: Uint8Array;
  courantAtDt: Float64Array | null;
  summary: AuditSummary;
}

export const VERSION = '0.1.0';

/** Each cause: its bit, its name in the JSON and CSV, its plain words in reports. */
const CAUSES: readonly [number, string, string][] = [
  [CAUSE_DEGENERATE, 'degenerate', 'degenerate cell'],
  [CAUSE_SMALL, 'small', 'small cell'],
  [CAUSE_SHAPE, 'shape', 'poor shape'],
  [CAUSE_FAST, 'fast', 'fast flow'],
  [CAUSE_DIFFUSION, 'diffusion', 'diffusion'],
];

/** Plain words for a cause bit set. */
export function describeCause(bits: number): string {
  const words = CAUSES.filter(([b]) => bits & b).map(([, , w]) => w);
  return words.length ? words.join(' + ') : 'no single cause';
}

/** The names of the causes in a bit set (JSON `cause`, CSV `cause` joined by ';'). */
export function causeList(bits: number): string[] {
  return CAUSES.filter(([b]) => bits & b).map(([, n]) => n);
}

function fmt(x: number): string {
  return Number(x.toPrecision(3)).toString();
}

function explain(i: number, bits: number, g: CellGeometry, speed: Float64Array, medH: number | null, medL: number | null, isQuad: boolean): string {
  if (bits & CAUSE_DEGENERATE) {
    return g.flags[i]! & FLAG_REPEATED_NODE ? 'uses the same node twice: zero area' : `area ${g.area[i]!.toExponential(2)} is zero to working precision`;
  }
  const parts: string[] = [];
  if (medH && medH > 0) parts.push(`h is ${fmt(g.inradius[i]! / medH)}× the median`);
  if (medL && medL > 0) parts.push(`λ is ${fmt(speed[i]! / medL)}× the median`);
  if (bits & CAUSE_SHAPE) parts.push(`radius ratio ${fmt(g.radiusRatio[i]!)} (acceptable ≤ ${isQuad ? RADIUS_RATIO_OK_QUAD : RADIUS_RATIO_OK_TRIANGLE})`);
  return `${describeCause(bits)}: ${parts.join(', ')}`;
}

/** Global minimum and its cell for each partial limit that was computed. */
function partLimits(parts: Record<string, Float64Array | null>): Record<string, { dt: number | null; cell: number | null }> {
  const out: Record<string, { dt: number | null; cell: number | null }> = {};
  for (const [name, a] of Object.entries(parts)) {
    if (!a) continue;
    let best = Infinity, cell = -1;
    for (let i = 0; i < a.length; i++) if (a[i]! < best) { best = a[i]!; cell = i; }
    out[name] = cell < 0 ? { dt: null, cell: null } : { dt: best, cell };
  }
  return out;
}

function finiteOrNull(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

/** An audit without its mesh checks yet: finishAudit completes it. */
export interface PendingAudit {
  result: AuditResult;
  checked: boolean;
}

/**
 * Everything of the audit but the mesh checks (duplicate points, unused points, isolated cells),
 * which need only the mesh and may be computed meanwhile elsewhere; finishAudit adds them.
 * runAudit does both.
 */
export function startAudit(mesh: Mesh, options: AuditOptions = {}): PendingAudit {
  const C = options.courant ?? 1;
  if (!(C > 0) || !Number.isFinite(C)) throw new UsageError(`the Courant number must be a positive number, got ${C}`);
  const top = options.top ?? 10;
  if (!Number.isInteger(top) || top < 0) throw new UsageError(`--top must be a non-negative integer, got ${top}`);
  if (options.dt !== undefined && !(options.dt > 0 && Number.isFinite(options.dt))) throw new UsageError(`--dt must be a positive number of seconds, got ${options.dt}`);
  const model: WaveModel = options.model ?? 'advection';
  const coords: CoordinateSystem = options.coords ?? 'planar';
  if (coords !== 'planar' && coords !== 'geographic') throw new UsageError(`--coords must be planar or geographic; got "${String(coords)}"`);
  const lf = lengthFactor(options.lengthUnit);
  const vf = velocityFactor(options.velocityUnit);
  if (coords === 'geographic' && options.lengthUnit !== undefined && lf !== 1) throw new UsageError('--length-unit applies to planar coordinates; geographic coordinates are in degrees');
  if (lf !== 1) {
    const pts = new Float64Array(mesh.points.length);
    for (let i = 0; i < pts.length; i++) pts[i] = mesh.points[i]! * lf;
    mesh = { ...mesh, points: pts };
  }
  const n = mesh.nCells;
  const geographic = coords === 'geographic';
  const geom = options.geometry ?? computeGeometry(mesh, undefined, coords);
  const sp = cellSpeeds(mesh, {
    model,
    ...(options.velocity !== undefined ? { velocity: options.velocity } : {}),
    ...(options.depth !== undefined ? { depth: options.depth } : {}),
    ...(options.gravity !== undefined ? { gravity: options.gravity } : {}),
    ...(options.soundSpeed !== undefined ? { soundSpeed: options.soundSpeed } : {}),
    ...(options.file !== undefined ? { file: options.file } : {}),
    velocityScale: vf,
    depthScale: lf,
  });
  const speed = sp.speed;
  const h = geom.inradius;
  const flags = geom.flags;
  const dtInscribed = float64s(n);
  let unlimited = 0;
  for (let i = 0; i < n; i++) {
    if (flags[i]! & FLAG_DEGENERATE) { dtInscribed[i] = 0; continue; }
    const l = speed[i]!;
    dtInscribed[i] = l > 0 ? (C * h[i]!) / l : Infinity;
  }
  const lengthRule: LengthRule = options.length ?? 'inscribed';
  if (lengthRule !== 'inscribed' && lengthRule !== 'flux') throw new UsageError(`--length must be inscribed or flux, got "${String(lengthRule)}"`);
  const dtFlux = lengthRule === 'flux' ? fluxLimit(mesh, geom, sp.velocity, sp.wave, C, geographic) : null;
  let dtDiffusion: Float64Array | null = null;
  let diffusivitySource: string | null = null;
  const D = options.diffusionScale ?? 1;
  if (options.diffusivity !== undefined) {
    if (!(D > 0) || !Number.isFinite(D)) throw new UsageError(`the diffusion scale must be positive, got ${D}`);
    const nu = cellScalar(mesh, options.diffusivity, 'the diffusivity', options.file);
    diffusivitySource = nu.source;
    dtDiffusion = diffusionLimit(mesh, geom, buildEdges(mesh, options.file), nu.values, D, geographic);
  }
  const dtAdvective = dtFlux ?? dtInscribed;
  let dt = dtAdvective;
  if (dtDiffusion) {
    dt = float64s(n);
    for (let i = 0; i < n; i++) {
      const a = dtAdvective[i]!, d = dtDiffusion[i]!;
      // 1/dt = 1/dt_adv + 1/dt_diff (exact for 1-D upwind with FTCS diffusion: c + 2d ≤ 1)
      dt[i] = a === 0 || d === 0 ? 0 : a === Infinity ? d : d === Infinity ? a : 1 / (1 / a + 1 / d);
    }
  }
  for (let i = 0; i < n; i++) if (dt[i] === Infinity) unlimited++;
  const columns: AuditResult['columns'] = [];
  if (dtFlux) columns.push({ name: 'dt_inscribed', values: dtInscribed }, { name: 'dt_flux', values: dtFlux });
  if (dtDiffusion) {
    if (!dtFlux) columns.push({ name: 'dt_advective', values: dtAdvective });
    columns.push({ name: 'dt_diffusion', values: dtDiffusion });
  }

  const medH = quantileOf(h, 0.5);
  const medL = quantileOf(speed, 0.5, 0);

  const cause = uint8s(n);
  const counts = { degenerate: 0, repeated_node: 0, inverted: 0, non_convex: 0, dry: sp.dry, unlimited, small: 0, poor_shape: 0, fast: 0, diffusion: 0, duplicate_points: 0, unused_points: 0, isolated_cells: 0 };
  let nTri = 0, nQuad = 0;
  for (let i = 0; i < n; i++) {
    const f = flags[i]!;
    const isQuad = mesh.cellTypes[i] === QUAD;
    if (isQuad) nQuad++; else nTri++;
    let b = 0;
    if (f & FLAG_DEGENERATE) { b |= CAUSE_DEGENERATE; counts.degenerate++; }
    if (f & FLAG_REPEATED_NODE) counts.repeated_node++;
    if (f & FLAG_INVERTED) counts.inverted++;
    if (f & FLAG_NONCONVEX) counts.non_convex++;
    if (!(f & FLAG_DEGENERATE)) {
      if (medH !== null && h[i]! <= SMALL_FACTOR * medH) { b |= CAUSE_SMALL; counts.small++; }
      if (geom.radiusRatio[i]! > (isQuad ? RADIUS_RATIO_OK_QUAD : RADIUS_RATIO_OK_TRIANGLE)) { b |= CAUSE_SHAPE; counts.poor_shape++; }
      if (medL !== null && speed[i]! >= FAST_FACTOR * medL) { b |= CAUSE_FAST; counts.fast++; }
      if (dtDiffusion && dtDiffusion[i]! < dtAdvective[i]!) { b |= CAUSE_DIFFUSION; counts.diffusion++; }
    }
    cause[i] = b;
  }

  const worstIdx = smallestK(dt, top);
  const worst: WorstCell[] = [];
  for (let k = 0; k < worstIdx.length; k++) {
    const i = worstIdx[k]!;
    const isQuad = mesh.cellTypes[i] === QUAD;
    const shape = shapeAt(geom, i);
    worst.push({
      cell: i,
      dt: finiteOrNull(dt[i]!),
      type: cellTypeName(mesh.cellTypes[i]!),
      centroid: [shape.centroidX, shape.centroidY],
      area: geom.area[i]!,
      inradius: h[i]!,
      speed: speed[i]!,
      radius_ratio: finiteOrNull(geom.radiusRatio[i]!),
      min_angle: shape.minAngle,
      cause: causeList(cause[i]!),
      why: explain(i, cause[i]!, geom, speed, medH, medL, isQuad),
    });
  }

  // the global limit: the smallest dt (a degenerate cell, dt = 0, caps it at zero)
  const limitCell = n === 0 ? -1 : worstIdx.length > 0 ? worstIdx[0]! : smallestK(dt, 1)[0]!;
  const limitDt = limitCell >= 0 && dt[limitCell]! < Infinity ? dt[limitCell]! : null;

  const sorted = sortedFinite(dt);
  let within2 = 0, within10 = 0;
  if (limitDt !== null) {
    for (let i = 0; i < sorted.length; i++) {
      const v = sorted[i]!;
      if (v <= 2 * limitDt) within2++;
      if (v <= 10 * limitDt) within10++; else break;
    }
  }
  // decade d holds the steps v > 0 with 10^d ≤ v < 10^(d+1): counted by binary search in the sorted steps
  const histogram: AuditSummary['histogram'] = [];
  {
    const first = lowerBound(sorted, Number.MIN_VALUE);
    if (first < sorted.length) {
      const decadeOf = (v: number): number => {
        let d = Math.floor(Math.log10(v));
        if (10 ** (d + 1) <= v) d++;
        else if (10 ** d > v) d--;
        return d;
      };
      const last = decadeOf(sorted[sorted.length - 1]!);
      let from = first;
      for (let d = decadeOf(sorted[first]!); d <= last; d++) {
        const to = d === last ? sorted.length : lowerBound(sorted, 10 ** (d + 1), from);
        histogram.push({ decade: d, from: 10 ** d, to: 10 ** (d + 1), cells: to - from });
        from = to;
      }
    }
  }

  let courantAtDt: Float64Array | null = null;
  let intended: AuditSummary['intended'] = null;
  if (options.dt !== undefined) {
    const X = options.dt;
    courantAtDt = new Float64Array(n);
    let over = 0;
    let maxC = 0;
    for (let i = 0; i < n; i++) {
      const l = speed[i]!;
      const c = l === 0 ? 0 : h[i]! > 0 && !(flags[i]! & FLAG_DEGENERATE) ? (X * l) / h[i]! : Infinity;
      courantAtDt[i] = c;
      if (c > maxC) maxC = c;
      if (X > dt[i]!) over++;
    }
    intended = { dt: X, ratio_to_limit: limitDt !== null && limitDt > 0 ? X / limitDt : null, cells_over_courant: over, max_courant: finiteOrNull(maxC) };
  }

  const warnings = [...mesh.warnings, ...sp.warnings];
  if (options.coords === undefined && looksGeographic(mesh.points, medL)) {
    warnings.push('coordinates look like degrees of longitude/latitude; pass --coords geographic or --coords planar');
  }

  const q = (p: number) => quantileSorted(sorted, p);
  const lim = limitCell >= 0 ? limitCell : null;
  const summary: AuditSummary = {
    steplens: VERSION,
    file: options.file ?? null,
    units: { length: 'm', time: 's', speed: 'm/s', area: 'm2', coordinates: geographic ? 'degrees' : 'm' },
    input: { coords, length_unit: options.lengthUnit ?? 'm', velocity_unit: options.velocityUnit ?? 'm/s' },
    mesh: { cells: n, points: mesh.nPoints, types: { triangle: nTri, quad: nQuad }, format: mesh.format },
    model: {
      name: model,
      velocity: sp.velocitySource,
      depth: sp.depthSource,
      gravity: model === 'shallow-water' ? options.gravity ?? STANDARD_GRAVITY : null,
      sound_speed: sp.soundSource,
      diffusivity: diffusivitySource,
      diffusion_scale: dtDiffusion ? D : null,
    },
    limit: {
      dt: limitDt,
      cell: limitDt === null ? null : lim,
      courant: C,
      courant_source: options.courantSource ?? (options.courant === undefined ? 'default: first-order upwind with forward Euler' : 'given with --courant'),
      centroid: limitDt === null || lim === null ? null : centroidOf(geom, lim),
      cause: limitDt === null || lim === null ? [] : causeList(cause[lim]!),
      why: limitDt === null || lim === null ? null : explain(lim, cause[lim]!, geom, speed, medH, medL, mesh.cellTypes[lim] === QUAD),
      length: lengthRule,
      parts: partLimits({ inscribed: dtInscribed, flux: dtFlux, advective: dtAdvective, diffusion: dtDiffusion }),
    },
    worst,
    quantiles: { min: q(0), p01: q(0.01), p05: q(0.05), p25: q(0.25), median: q(0.5), p75: q(0.75), p95: q(0.95), max: q(1) },
    near_limit: { within_2x: within2, within_10x: within10 },
    histogram,
    counts,
    medians: { inradius: medH, speed: medL },
    intended,
    warnings,
    caution: CAUTION,
  };
  return { result: { mesh, geom, speed, dt, dtInscribed, dtFlux, dtDiffusion, sortedDt: sorted, columns, cause, courantAtDt, summary }, checked: false };
}

/**
 * The summary's mesh-hygiene counts and its cell-level warnings, once the mesh checks are in
 * (they may run on another thread meanwhile: see startAudit).
 */
export function finishAudit(pending: PendingAudit, checks: MeshChecks): AuditResult {
  if (pending.checked) throw new Error('finishAudit: this audit is finished already');
  pending.checked = true;
  const r = pending.result;
  const { counts, warnings } = r.summary;
  const n = r.mesh.nCells;
  counts.duplicate_points = checks.duplicatePoints;
  counts.unused_points = checks.unusedPoints;
  counts.isolated_cells = checks.isolatedCells;
  if (counts.degenerate > 0) warnings.push(`${counts.degenerate} degenerate cell(s) (zero area or a repeated node): their step is 0 and they cap the run until fixed`);
  if (counts.inverted > 0) warnings.push(`${counts.inverted} cell(s) are inverted (node order opposite to the rest of the mesh)`);
  if (counts.non_convex > 0) warnings.push(`${counts.non_convex} quad(s) are non-convex or self-intersecting`);
  if (counts.duplicate_points > 0) warnings.push(`${counts.duplicate_points} point(s) repeat the coordinates of another point: cells on either side may not be connected`);
  if (counts.isolated_cells > 0 && n > 1) warnings.push(`${counts.isolated_cells} cell(s) share no edge with any other cell`);
  if (n > 0 && counts.unlimited === n) warnings.push('the flow is at rest everywhere: no cell limits the step');
  return r;
}

export function runAudit(mesh: Mesh, options: AuditOptions = {}): AuditResult {
  return finishAudit(startAudit(mesh, options), options.checks ?? meshChecks(mesh));
}
