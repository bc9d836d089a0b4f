/** `steplens audit FILE [options]` */
import { readMesh } from '../mesh/read.js';
import type { DataArray } from '../mesh/model.js';
import { finishAudit, runAudit, startAudit, type AuditOptions, type AuditResult } from '../audit/audit.js';
import { UsageError } from '../mesh/errors.js';
import { WAVE_MODELS, type WaveModel } from '../physics/speed.js';
import { toJson } from '../io/format.js';
import { csvColumnSet } from '../io/csv.js';
import { allocateShared, meshArrays, recycleSpent } from '../mesh/alloc.js';
import { writeVtu } from '../io/vtu.js';
import { parse, numberOption, type OptionSpec } from './args.js';
import { analyseScheme, builtInTableau, parseTableau, TIME_INTEGRATORS, type Tableau } from '../stability/index.js';
import { readInput, writeOutput, writeBytes, writeText } from './files.js';
import { readMeshFile } from './large-vtu.js';
import { meshChecksOnWorker, MIN_CELLS_PER_THREAD, parallelGeometry, readMeshParallel, threadsOption } from './parallel.js';
import { writeCellsCsv } from './parallel-csv.js';
import { pieceOfCell } from '../mesh/vtkxml/pvtu.js';
import { renderReport } from './report.js';
import { buildPlan, checkPlanOptions, type Plan, type PlanOptions } from '../audit/plan.js';
import { sizeFieldCsvChunks } from '../audit/sizefield.js';
import { isSnapshotInput, snapshotAudit } from './snapshots.js';
import type { CliIo } from './io.js';

export const AUDIT_HELP = `steplens audit FILE [options]

Reads a 2-D triangle/quad mesh (VTK XML .vtu/.vtp, legacy .vtk, Gmsh .msh 2.2/4.1,
Triangle .node/.ele) and reports the largest stable explicit time step, dt = C·h/λ per
cell with h = 2·area/perimeter, the cells that set it and why.

physics
  --model NAME          advection (λ = |u|, default), shallow-water (λ = |u| + √(gH)),
                        acoustic (λ = |u| + c)
  --velocity NAME|X,Y   velocity vector array, or two scalar arrays (default: found by name)
  --depth NAME          water depth array (shallow-water)
  --gravity G           m/s² (default 9.80665)
  --sound-speed NAME|V  sound speed array or value in m/s (acoustic)
  --courant C           Courant number the scheme tolerates (default 1)
  --time NAME|FILE.json time integrator (see steplens scheme --list) ┐ C from von Neumann
  --space NAME          space operator                               ┘ analysis; --courant
                        still overrides; --time also scales the diffusive limit
  --coords SYSTEM       planar (default) or geographic (x = longitude, y = latitude in
                        degrees; each cell projected on its local tangent plane)
  --length-unit U       unit of planar coordinates and of the depth: m (default), km, ft
  --velocity-unit U     unit of the velocity: m/s (default), km/h, kn, ft/s
                        (outputs are always SI: m, s, m/s)
  --dt X                the step the run intends to use: Courant numbers at X
  --length RULE         inscribed (h = 2A/P, default) or flux (exact face-flux limit of
                        cell-centred finite volume: C·A / Σ max(u·n, 0)|f|)
  --diffusivity NAME|V  kinematic diffusivity ν in m²/s: adds dt_diff = A / Σ ν|f|/d_f and
                        combines 1/dt = 1/dt_adv + 1/dt_diff
outputs
  --json                print only the JSON summary on stdout
  --cells FILE.csv      per-cell table: cell, type, area, perimeter, inradius, speed, dt,
                        radius_ratio, min_angle, centroid, flags, cause
  --cell-columns SET    standard (default) or all: adds circumradius, max_angle,
                        aspect_ratio, scaled_jacobian, condition, edge_ratio
  --vtu FILE.vtu        the mesh with every per-cell result as cell data
  --top N               number of worst cells listed (default 10)
  --fail-below DT       exit 3 when the largest stable step is below DT seconds
  --safety S            with several files (a run): step schedule = S × limit (default 0.9)
  --threads N           worker threads for reading large arrays and .pvtu pieces, the
                        geometry, the mesh checks and the CSV (default: the available cores;
                        results are identical for every N)
  --debug               show stack traces of unexpected errors
decision
  --gains F,F,...       remeshing table: how many worst cells must stop limiting the step
                        for each gain (default 1.5,2,4,10); regions of those cells
  --target-dt T         size field for the step T: per cell h* = T·λ/C and the edge 2√3·h*
                        of the equilateral triangle (--cells, --vtu)
  --size-field FILE.csv node,x,y,size for a mesher's background field (needs --target-dt):
                        size = max(largest target edge of the node's cells, current edge)
  --lts                 local time stepping: level ℓ = ⌊log₂(dt/dt_min)⌋ per cell, cells
                        sharing an edge at most one level apart; speed-up
  --lts-levels L        highest level (default 4; implies --lts)
  --duration T          simulated seconds: steps and cell updates, global and local
  --cell-step-cost S    measured seconds per cell update of your solver: wall times
  --courant-min CMIN    with --dt: the moving cells whose Courant number is below CMIN
  --suggest-dt          with --courant-min: the step range keeping Courant numbers in [CMIN, C]
  --band-share S        share of moving cells that range keeps in the band (default 1)

A stable step is necessary, not sufficient, for a correct simulation.
`;

const SPEC: OptionSpec = {
  model: { type: 'string' }, velocity: { type: 'string' }, depth: { type: 'string' }, gravity: { type: 'string' },
  'sound-speed': { type: 'string' }, courant: { type: 'string' }, dt: { type: 'string' }, json: { type: 'boolean' },
  cells: { type: 'string' }, vtu: { type: 'string' }, top: { type: 'string' }, 'fail-below': { type: 'string' },
  debug: { type: 'boolean' }, help: { type: 'boolean', short: 'h' }, length: { type: 'string' },
  diffusivity: { type: 'string' }, coords: { type: 'string' }, 'length-unit': { type: 'string' },
  'velocity-unit': { type: 'string' }, time: { type: 'string' }, space: { type: 'string' },
  gains: { type: 'string' }, 'target-dt': { type: 'string' }, 'size-field': { type: 'string' }, lts: { type: 'boolean' },
  'lts-levels': { type: 'string' }, duration: { type: 'string' }, 'cell-step-cost': { type: 'string' },
  'courant-min': { type: 'string' }, 'suggest-dt': { type: 'boolean' }, 'band-share': { type: 'string' }, safety: { type: 'string' }, threads: { type: 'string' },
  'cell-columns': { type: 'string' },
};

/** The decision options (remeshing, size field, local time stepping, run cost, Courant band). */
export function planOptionsFrom(values: Record<string, unknown>): PlanOptions {
  const o: PlanOptions = {};
  const num = (flag: string, set: (x: number) => void): void => {
    const x = numberOption(values[flag], flag);
    if (x !== undefined) set(x);
  };
  if (values.gains !== undefined) o.gains = String(values.gains).split(',').map((g) => numberOption(g, 'gains')!);
  num('target-dt', (x) => { o.targetDt = x; });
  if (values.lts) o.lts = true;
  num('lts-levels', (x) => { o.ltsLevels = x; });
  num('duration', (x) => { o.duration = x; });
  num('cell-step-cost', (x) => { o.cellStepCost = x; });
  num('courant-min', (x) => { o.courantMin = x; });
  if (values['suggest-dt']) o.suggestDt = true;
  num('band-share', (x) => { o.bandShare = x; });
  if (values['size-field'] !== undefined && o.targetDt === undefined) throw new UsageError('--size-field needs --target-dt T: the size field is for a target step');
  checkPlanOptions(o, values.dt !== undefined);
  return o;
}

export function auditOptionsFrom(values: Record<string, unknown>, file: string): AuditOptions {
  const o: AuditOptions = { file };
  if (values.model !== undefined) {
    const m = String(values.model) as WaveModel;
    if (!WAVE_MODELS.includes(m)) throw new UsageError(`--model must be one of ${WAVE_MODELS.join(', ')}; got "${m}"`);
    o.model = m;
  }
  if (values.velocity !== undefined) {
    const v = String(values.velocity);
    if (v.includes(',')) {
      const parts = v.split(',').map((p) => p.trim());
      if (parts.length !== 2 || !parts[0] || !parts[1]) throw new UsageError(`--velocity X,Y takes exactly two array names, got "${v}"`);
      o.velocity = [parts[0], parts[1]];
    } else o.velocity = v;
  }
  if (values.depth !== undefined) o.depth = String(values.depth);
  const g = numberOption(values.gravity, 'gravity');
  if (g !== undefined) o.gravity = g;
  if (values['sound-speed'] !== undefined) {
    const s = String(values['sound-speed']);
    const x = Number(s);
    o.soundSpeed = s.trim() !== '' && Number.isFinite(x) ? x : s;
  }
  if (values.length !== undefined) {
    const l = String(values.length);
    if (l !== 'inscribed' && l !== 'flux') throw new UsageError(`--length must be inscribed or flux; got "${l}"`);
    o.length = l;
  }
  if (values.diffusivity !== undefined) {
    const s = String(values.diffusivity);
    const x = Number(s);
    o.diffusivity = s.trim() !== '' && Number.isFinite(x) ? x : s;
  }
  if (values.coords !== undefined) {
    const cs = String(values.coords);
    if (cs !== 'planar' && cs !== 'geographic') throw new UsageError(`--coords must be planar or geographic; got "${cs}"`);
    o.coords = cs;
  }
  if (values['length-unit'] !== undefined) o.lengthUnit = String(values['length-unit']);
  if (values['velocity-unit'] !== undefined) o.velocityUnit = String(values['velocity-unit']);
  const c = numberOption(values.courant, 'courant');
  if (values.time !== undefined || values.space !== undefined) applyScheme(o, values, c !== undefined);
  if (c !== undefined) {
    o.courant = c;
    o.courantSource = values.time !== undefined ? `given with --courant (overrides the scheme's ${o.courant})` : 'given with --courant';
  }
  const dt = numberOption(values.dt, 'dt');
  if (dt !== undefined) o.dt = dt;
  const top = numberOption(values.top, 'top');
  if (top !== undefined) o.top = top;
  return o;
}

function loadTableau(arg: string): Tableau | string {
  if (builtInTableau(arg)) return arg;
  if (!/\.json$/i.test(arg.trim())) throw new UsageError(`unknown time integrator "${arg}"; known: ${TIME_INTEGRATORS.join(', ')} (or a tableau file ending in .json)`);
  return parseTableau(new TextDecoder().decode(readInput(arg)), arg);
}

/** --time/--space: the Courant number and the diffusion scale from von Neumann analysis. */
function applyScheme(o: AuditOptions, values: Record<string, unknown>, overridden: boolean): void {
  if (values.time === undefined || values.space === undefined) throw new UsageError('--time and --space go together: the Courant number depends on both');
  const t = String(values.time), sp = String(values.space);
  const r = analyseScheme(loadTableau(t), sp);
  if (r.diffusion > 0) o.diffusionScale = 2 * r.diffusion;
  if (r.status !== 'stable' || !(r.courant > 0)) {
    if (overridden) return;
    throw new UsageError(`${t} × ${sp} is ${r.status === 'unstable' ? 'unstable for every step' : 'weakly unstable (growth at every step size)'}: no Courant number makes it stable; choose another pairing or pass --courant`);
  }
  o.courant = Number(r.courant.toPrecision(12));
  o.courantSource = `von Neumann analysis of ${r.time} × ${r.space}`;
}

/**
 * Read a mesh (files over one buffer are read array by array; a .pvtu reads its pieces); every
 * file read for it (the file, a Triangle sibling, the pieces) is added to `inputs`, which
 * outputs must never overwrite.
 */
export function loadMesh(file: string, inputs: string[] = []) {
  return readMeshFile(file, { onFile: (f) => inputs.push(f) });
}

/** Input arrays whose names our results take are kept as NAME_input. */
function keepInputArrays(input: DataArray[], ours: DataArray[]): DataArray[] {
  const taken = new Set(ours.map((a) => a.name));
  return input.map((a) => (taken.has(a.name) ? { ...a, name: `${a.name}_input` } : a));
}

export function writeResults(r: AuditResult, values: Record<string, unknown>, inputs: string[], plan?: Plan, threads = 1): void {
  if (values.cells !== undefined) {
    const out = String(values.cells);
    const set = csvColumnSet(values['cell-columns']);
    writeOutput(out, inputs, (fd) => writeCellsCsv(fd, r, plan?.cellColumns ?? [], threads, {}, set));
  }
  if (values['size-field'] !== undefined && plan?.nodeSize) {
    const sizes = plan.nodeSize;
    writeOutput(String(values['size-field']), inputs, (fd) => { for (const chunk of sizeFieldCsvChunks(r.mesh, sizes)) writeText(fd, chunk); });
  }
  if (values.vtu !== undefined) {
    const out = String(values.vtu);
    const g = r.geom;
    const cellData = [
      { name: 'dt', components: 1, values: r.dt },
      { name: 'speed', components: 1, values: r.speed },
      { name: 'inradius', components: 1, values: g.inradius },
      { name: 'area', components: 1, values: g.area },
      { name: 'perimeter', components: 1, values: g.perimeter },
      { name: 'radius_ratio', components: 1, values: g.radiusRatio },
      { name: 'min_angle', components: 1, values: g.minAngle },
      { name: 'max_angle', components: 1, values: g.maxAngle },
      { name: 'aspect_ratio', components: 1, values: g.aspectRatio },
      { name: 'scaled_jacobian', components: 1, values: g.scaledJacobian },
      { name: 'cause', components: 1, values: Float64Array.from(r.cause) },
      { name: 'flags', components: 1, values: Float64Array.from(g.flags) },
      ...(r.courantAtDt ? [{ name: 'courant', components: 1, values: r.courantAtDt }] : []),
      ...r.columns.map((c) => ({ name: c.name, components: 1, values: c.values })),
      ...(plan?.cellColumns ?? []).map((c) => ({ name: c.name, components: 1, values: c.values instanceof Float64Array ? c.values : Float64Array.from(c.values) })),
    ];
    const pointData = plan?.pointData ?? [];
    const mesh = { ...r.mesh, cellData: keepInputArrays(r.mesh.cellData, cellData), pointData: keepInputArrays(r.mesh.pointData, pointData) };
    const bytes = writeVtu(mesh, { cellData, pointData }, { encoding: 'appended-raw' });
    writeOutput(out, inputs, (fd) => writeBytes(fd, bytes));
  }
}

export async function auditCommand(args: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parse(args, SPEC);
  if (values.help) { io.stdout(AUDIT_HELP); return 0; }
  if (positionals.length === 0) throw new UsageError('audit needs a mesh file: steplens audit FILE [options] (see steplens audit --help)');
  // snapshots are read one after another on this thread: ordinary memory, nothing kept for recycling
  allocateShared(false);
  if (isSnapshotInput(positionals)) return snapshotAudit(positionals, values, io);
  const file = positionals[0]!;
  const failBelow = numberOption(values['fail-below'], 'fail-below');
  const options = auditOptionsFrom(values, file);
  const planOptions = planOptionsFrom(values);
  const threads = threadsOption(values.threads);
  csvColumnSet(values['cell-columns']);
  // threads read the mesh and the per-cell results where they are, without copies
  allocateShared(threads > 1);
  io.progress?.(`reading ${file}`);
  const inputs: string[] = [];
  const mesh = threads > 1 ? await readMeshParallel(file, threads, { onFile: (f) => inputs.push(f) }) : loadMesh(file, inputs);
  io.progress?.(`auditing ${mesh.nCells} cells`);
  // the raw bytes the reader has converted are memory for the arrays to come
  recycleSpent(meshArrays(mesh));
  let result: AuditResult;
  if (threads > 1 && mesh.nCells >= 2 * MIN_CELLS_PER_THREAD) {
    options.geometry = await parallelGeometry(mesh, threads, {
      ...(options.coords !== undefined ? { coords: options.coords } : {}),
      ...(options.lengthUnit !== undefined ? { lengthUnit: options.lengthUnit } : {}),
    });
    // the mesh checks on another thread while this one works out the steps
    const checks = meshChecksOnWorker(mesh);
    const pending = startAudit(mesh, options);
    result = finishAudit(pending, await checks);
  } else {
    result = runAudit(mesh, options);
  }
  if (/\.p(vtu|vtp)$/i.test(file) && result.summary.limit.cell !== null) {
    const piece = pieceOfCell(result.mesh, result.summary.limit.cell);
    // inputs: the .pvtu first, then its pieces in order
    if (piece !== null) result.summary.limit.piece = { index: piece, file: inputs[1 + piece] ?? null };
  }
  const plan = buildPlan(result, planOptions);
  io.progress?.('writing');
  writeResults(result, values, inputs, plan, threads);
  io.progress?.('');
  if (values.json) io.stdout(toJson({ ...result.summary, plan: plan.summary }));
  else io.stdout(renderReport(result.summary, plan.summary));
  if (failBelow !== undefined) {
    const lim = result.summary.limit.dt;
    if (lim !== null && lim < failBelow) {
      io.stderr(`steplens: the largest stable step ${lim} s is below --fail-below ${failBelow} s\n`);
      return 3;
    }
  }
  return 0;
}
