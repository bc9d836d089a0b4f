/** `steplens audit FILE [options]` */
import { readMesh } from '../mesh/read.js';
import { runAudit, type AuditOptions, type AuditResult } from '../audit/audit.js';
import { UsageError } from '../mesh/errors.js';
import { WAVE_MODELS, type WaveModel } from '../physics/speed.js';
import { cellsCsvChunks } from '../io/csv.js';
import { summaryJson } from '../io/summary.js';
import { writeVtu } from '../io/vtu.js';
import { parse, numberOption, type OptionSpec } from './args.js';
import { readInput, siblingLoader, writeOutput, writeText, writeBytes } from './files.js';
import { renderReport } from './report.js';
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
  --cells FILE.csv      per-cell table
  --vtu FILE.vtu        the mesh with every per-cell result as cell data
  --top N               number of worst cells listed (default 10)
  --fail-below DT       exit 3 when the largest stable step is below DT seconds
  --debug               show stack traces of unexpected errors

A stable step is necessary, not sufficient, for a correct simulation.
`;

const SPEC: OptionSpec = {
  model: { type: 'string' }, velocity: { type: 'string' }, depth: { type: 'string' }, gravity: { type: 'string' },
  'sound-speed': { type: 'string' }, courant: { type: 'string' }, dt: { type: 'string' }, json: { type: 'boolean' },
  cells: { type: 'string' }, vtu: { type: 'string' }, top: { type: 'string' }, 'fail-below': { type: 'string' },
  debug: { type: 'boolean' }, help: { type: 'boolean', short: 'h' }, length: { type: 'string' },
  diffusivity: { type: 'string' }, coords: { type: 'string' }, 'length-unit': { type: 'string' },
  'velocity-unit': { type: 'string' },
};

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
  if (c !== undefined) o.courant = c;
  const dt = numberOption(values.dt, 'dt');
  if (dt !== undefined) o.dt = dt;
  const top = numberOption(values.top, 'top');
  if (top !== undefined) o.top = top;
  return o;
}

export function loadMesh(file: string) {
  const bytes = readInput(file);
  return readMesh(bytes, file, { loadSibling: siblingLoader });
}

export function writeResults(r: AuditResult, values: Record<string, unknown>, inputs: string[]): void {
  if (values.cells !== undefined) {
    const out = String(values.cells);
    writeOutput(out, inputs, (fd) => { for (const chunk of cellsCsvChunks(r)) writeText(fd, chunk); });
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
    ];
    const taken = new Set(cellData.map((a) => a.name));
    const clash = r.mesh.cellData.filter((a) => taken.has(a.name));
    const mesh = clash.length ? { ...r.mesh, cellData: r.mesh.cellData.map((a) => (taken.has(a.name) ? { ...a, name: `${a.name}_input` } : a)) } : r.mesh;
    const bytes = writeVtu(mesh, { cellData }, { encoding: 'appended-raw' });
    writeOutput(out, inputs, (fd) => writeBytes(fd, bytes));
  }
}

export async function auditCommand(args: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parse(args, SPEC);
  if (values.help) { io.stdout(AUDIT_HELP); return 0; }
  if (positionals.length === 0) throw new UsageError('audit needs a mesh file: steplens audit FILE [options] (see steplens audit --help)');
  if (positionals.length > 1) throw new UsageError(`audit takes one mesh file; got ${positionals.length}: ${positionals.join(' ')}`);
  const file = positionals[0]!;
  const failBelow = numberOption(values['fail-below'], 'fail-below');
  const options = auditOptionsFrom(values, file);
  io.progress?.(`reading ${file}`);
  const mesh = loadMesh(file);
  io.progress?.(`auditing ${mesh.nCells} cells`);
  const result = runAudit(mesh, options);
  writeResults(result, values, [file]);
  io.progress?.('');
  if (values.json) io.stdout(summaryJson(result));
  else io.stdout(renderReport(result.summary));
  if (failBelow !== undefined) {
    const lim = result.summary.limit.dt;
    if (lim !== null && lim < failBelow) {
      io.stderr(`steplens: the largest stable step ${lim} s is below --fail-below ${failBelow} s\n`);
      return 3;
    }
  }
  return 0;
}
