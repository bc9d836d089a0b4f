/**
 * Fastest local wave speed λ per cell.
 *
 *   advection      λ = |u|
 *   shallow-water  λ = |u| + √(g·H)   (dry, H ≤ 0: λ = |u|)
 *   acoustic       λ = |u| + c
 *
 * Point data reaches a cell as the maximum over its nodes (the condition must hold for every
 * speed in the cell); cell data is used as is. When every input is point data, λ is evaluated
 * per node and the maximum taken; otherwise the maxima of the two terms are added (never less).
 */
import { float64s } from '../mesh/alloc.js';
import { UsageError, MeshInputError } from '../mesh/errors.js';
import { findArray, type DataArray, type Mesh } from '../mesh/model.js';

export type WaveModel = 'advection' | 'shallow-water' | 'acoustic';
export const WAVE_MODELS: WaveModel[] = ['advection', 'shallow-water', 'acoustic'];

/** Standard acceleration of gravity, m/s² (CGPM 1901; SI Brochure). */
export const STANDARD_GRAVITY = 9.80665;

export interface SpeedOptions {
  model?: WaveModel;
  /** A vector array name, or two scalar array names [x, y]. Default: found by name. */
  velocity?: string | [string, string];
  depth?: string;
  gravity?: number;
  soundSpeed?: string | number;
  /** File name for error messages. */
  file?: string;
  /** Factor to m/s applied to the velocity (and an array sound speed). */
  velocityScale?: number;
  /** Factor to m applied to the depth array. */
  depthScale?: number;
}

export interface SpeedResult {
  speed: Float64Array;
  /** The velocity used (components per tuple), for face-based limits. */
  velocity: VelocityField | null;
  wave: WaveTerm | null;
  /** Cells whose wave term vanished because the water depth is ≤ 0 at every node. */
  dry: number;
  /** Human description of what was used, e.g. "velocity (point data, 2 components)". */
  velocitySource: string | null;
  depthSource: string | null;
  soundSource: string | null;
  warnings: string[];
}

/** Names tried, in order, when no velocity is named (case-insensitive). */
const VELOCITY_NAMES = ['velocity', 'velocities', 'vel', 'u', 'v', 'uv', 'flow_velocity', 'flow velocity', 'current', 'momentum_velocity'];

interface Located { array: DataArray; onPoints: boolean }

function listArrays(mesh: Mesh): string {
  const items = [
    ...mesh.pointData.map((a) => `${a.name} (point, ${a.components})`),
    ...mesh.cellData.map((a) => `${a.name} (cell, ${a.components})`),
  ];
  return items.length ? items.join(', ') : 'none';
}

function locate(mesh: Mesh, name: string, what: string): Located {
  const p = findArray(mesh.pointData, name);
  if (p) return { array: p, onPoints: true };
  const c = findArray(mesh.cellData, name);
  if (c) return { array: c, onPoints: false };
  throw new UsageError(`no array named "${name}" for ${what}; arrays in the file: ${listArrays(mesh)}`);
}

function findVelocity(mesh: Mesh): Located | null {
  for (const want of VELOCITY_NAMES) {
    for (const onPoints of [true, false]) {
      for (const a of onPoints ? mesh.pointData : mesh.cellData) {
        if (a.name.toLowerCase() === want && (a.components === 2 || a.components === 3)) return { array: a, onPoints };
      }
    }
  }
  return null;
}

function checkFinite(a: DataArray, file: string | undefined): void {
  const v = a.values;
  for (let i = 0; i < v.length; i++) {
    const x = v[i]!;
    if (x - x !== 0) {
      const loc = file === undefined ? {} : { file };
      throw new MeshInputError(`array "${a.name}" holds ${x} at tuple ${Math.floor(i / a.components)} (component ${i % a.components})`, loc);
    }
  }
}

export interface VelocityField {
  vx: Float64Array;
  vy: Float64Array;
  onPoints: boolean;
  source: string;
}

/** Where the velocity comes from: two scalar arrays, or the first two components of a vector array. */
interface VelocityInput {
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  /** Values per tuple in x and y, and the offsets of the two components. */
  stride: number;
  ox: number;
  oy: number;
  /** The vector array when it has a z component (3), for the warning. */
  z: DataArray | null;
  n: number;
  onPoints: boolean;
  source: string;
}

/** The velocity arrays (checked finite), or null when none is found. */
function velocityInput(mesh: Mesh, opts: SpeedOptions): VelocityInput | null {
  const file = opts.file;
  if (Array.isArray(opts.velocity)) {
    const [nx, ny] = opts.velocity;
    const ax = locate(mesh, nx, 'the x velocity');
    const ay = locate(mesh, ny, 'the y velocity');
    if (ax.onPoints !== ay.onPoints) throw new UsageError(`velocity components "${nx}" and "${ny}" must both be point data or both cell data`);
    if (ax.array.components !== 1 || ay.array.components !== 1) throw new UsageError(`--velocity X,Y takes two scalar arrays; "${nx}" has ${ax.array.components} components, "${ny}" has ${ay.array.components}`);
    checkFinite(ax.array, file);
    checkFinite(ay.array, file);
    const n = Math.min(ax.array.values.length, ay.array.values.length);
    return { x: ax.array.values, y: ay.array.values, stride: 1, ox: 0, oy: 0, z: null, n, onPoints: ax.onPoints, source: `${nx}, ${ny} (${ax.onPoints ? 'point' : 'cell'} data)` };
  }
  let loc: Located | null;
  if (typeof opts.velocity === 'string') {
    loc = locate(mesh, opts.velocity, 'the velocity');
    if (loc.array.components < 2 || loc.array.components > 3) {
      throw new UsageError(`velocity "${opts.velocity}" has ${loc.array.components} component(s); pass a 2- or 3-component array, or two scalar arrays as --velocity X,Y`);
    }
  } else {
    loc = findVelocity(mesh);
    if (!loc) return null;
  }
  const a = loc.array;
  checkFinite(a, file);
  const m = a.components;
  return { x: a.values, y: a.values, stride: m, ox: 0, oy: 1, z: m === 3 ? a : null, n: a.values.length / m, onPoints: loc.onPoints, source: `${a.name} (${loc.onPoints ? 'point' : 'cell'} data, ${m} components)` };
}

/** The largest |z| of a 3-component array (0 when it has none). */
function largestZ(a: DataArray | null): number {
  if (!a) return 0;
  const v = a.values;
  let zmax = 0;
  for (let i = 2; i < v.length; i += 3) {
    const z = Math.abs(v[i]!);
    if (z > zmax) zmax = z;
  }
  return zmax;
}

/** The velocity as x and y components per tuple, scaled to m/s. */
function velocityComponents(u: VelocityInput, scale: number): VelocityField {
  const vx = new Float64Array(u.n), vy = new Float64Array(u.n);
  const { x, y, stride, ox, oy } = u;
  for (let i = 0; i < u.n; i++) {
    vx[i] = x[i * stride + ox]!;
    vy[i] = y[i * stride + oy]!;
  }
  if (scale !== 1) for (let i = 0; i < u.n; i++) { vx[i] = vx[i]! * scale; vy[i] = vy[i]! * scale; }
  return { vx, vy, onPoints: u.onPoints, source: u.source };
}

/** Velocity components per tuple (a vector array or two scalar arrays), or null when none is found. */
export function velocityField(mesh: Mesh, opts: SpeedOptions, warnings: string[]): VelocityField | null {
  const u = velocityInput(mesh, opts);
  if (!u) return null;
  const zmax = largestZ(u.z);
  if (zmax > 0) warnings.push(`velocity "${u.z!.name}" has a nonzero z component (up to ${zmax}); only the x-y components are used`);
  return velocityComponents(u, opts.velocityScale ?? 1);
}

/**
 * |(x, y)| by the square root (correctly rounded everywhere, and many times faster than
 * Math.hypot); hypot only where the squares would overflow or underflow.
 */
export function norm(x: number, y: number): number {
  const s = x * x + y * y;
  return s < 1e300 && s > 1e-300 ? Math.sqrt(s) : Math.hypot(x, y);
}

/** |u| per tuple, the components scaled to m/s first. */
function speedOfInput(u: VelocityInput, scale: number): Float64Array {
  const mag = new Float64Array(u.n);
  const { x, y, stride, ox, oy } = u;
  if (scale === 1) for (let i = 0; i < u.n; i++) mag[i] = norm(x[i * stride + ox]!, y[i * stride + oy]!);
  else for (let i = 0; i < u.n; i++) mag[i] = norm(x[i * stride + ox]! * scale, y[i * stride + oy]! * scale);
  return mag;
}

function scalarArray(mesh: Mesh, name: string, what: string, file: string | undefined): Located {
  const loc = locate(mesh, name, what);
  if (loc.array.components !== 1) throw new UsageError(`${what} "${name}" must be a scalar array; it has ${loc.array.components} components`);
  checkFinite(loc.array, file);
  return loc;
}

export interface WaveTerm {
  /** √(gH) or c per tuple, or one constant. */
  term: Float64Array | number;
  onPoints: boolean;
  source: string;
  wet: Uint8Array | null;
}

/** Per-tuple wave term (√(gH) or c), or null for plain advection. */
export function waveTerm(mesh: Mesh, opts: SpeedOptions, model: WaveModel): WaveTerm | null {
  if (model === 'shallow-water') {
    if (!opts.depth) throw new UsageError(`--model shallow-water needs --depth NAME; arrays in the file: ${listArrays(mesh)}`);
    const g = opts.gravity ?? STANDARD_GRAVITY;
    if (!(g > 0) || !Number.isFinite(g)) throw new UsageError(`--gravity must be a positive number, got ${g}`);
    const loc = scalarArray(mesh, opts.depth, 'the depth', opts.file);
    const h = loc.array.values;
    const term = new Float64Array(h.length);
    const wet = new Uint8Array(h.length);
    const ds = opts.depthScale ?? 1;
    for (let i = 0; i < h.length; i++) {
      const d = h[i]! * ds;
      if (d > 0) { term[i] = Math.sqrt(g * d); wet[i] = 1; }
    }
    return { term, onPoints: loc.onPoints, source: `${opts.depth} (${loc.onPoints ? 'point' : 'cell'} data), g = ${g} m/s²`, wet };
  }
  if (model === 'acoustic') {
    const c = opts.soundSpeed;
    if (c === undefined) throw new UsageError('--model acoustic needs --sound-speed NAME|VALUE');
    if (typeof c === 'number') {
      if (!(c >= 0) || !Number.isFinite(c)) throw new UsageError(`--sound-speed must be a non-negative number, got ${c}`);
      return { term: c, onPoints: false, source: `${c} m/s (constant)`, wet: null };
    }
    const loc = scalarArray(mesh, c, 'the sound speed', opts.file);
    const v = loc.array.values;
    const term = new Float64Array(v.length);
    for (let i = 0; i < v.length; i++) {
      if (v[i]! < 0) throw new MeshInputError(`sound speed "${c}" is negative (${v[i]}) at tuple ${i}`, opts.file === undefined ? {} : { file: opts.file });
      term[i] = v[i]! * (opts.velocityScale ?? 1);
    }
    return { term, onPoints: loc.onPoints, source: `${c} (${loc.onPoints ? 'point' : 'cell'} data)`, wet: null };
  }
  return null;
}

/** Maximum over each cell's nodes of a per-point array. */
function cellMaxOfPoints(mesh: Mesh, values: Float64Array): Float64Array {
  const n = mesh.nCells;
  const off = mesh.cellOffsets;
  const nodes = mesh.cellNodes;
  const out = float64s(n);
  for (let i = 0; i < n; i++) {
    let m = 0;
    for (let k = off[i]!, e = off[i + 1]!; k < e; k++) {
      const v = values[nodes[k]!]!;
      if (v > m) m = v;
    }
    out[i] = m;
  }
  return out;
}

function toCells(mesh: Mesh, values: Float64Array, onPoints: boolean): Float64Array {
  return onPoints ? cellMaxOfPoints(mesh, values) : values;
}

export function cellSpeeds(mesh: Mesh, opts: SpeedOptions = {}): SpeedResult {
  const model = opts.model ?? 'advection';
  if (!WAVE_MODELS.includes(model)) throw new UsageError(`unknown model "${model}"; use one of ${WAVE_MODELS.join(', ')}`);
  const warnings: string[] = [];
  const input = velocityInput(mesh, opts);
  const vs = opts.velocityScale ?? 1;
  const zmax = input ? largestZ(input.z) : 0;
  if (zmax > 0) warnings.push(`velocity "${input!.z!.name}" has a nonzero z component (up to ${zmax}); only the x-y components are used`);
  const vel = input ? { mag: speedOfInput(input, vs), onPoints: input.onPoints, source: input.source } : null;
  if (!vel && model === 'advection') {
    throw new UsageError(`no velocity array found (tried ${VELOCITY_NAMES.join(', ')}); pass --velocity NAME or --velocity X,Y; arrays in the file: ${listArrays(mesh)}`);
  }
  if (!vel) warnings.push('no velocity array found: the flow is taken as at rest (λ is the wave speed alone)');
  const wave = waveTerm(mesh, opts, model);
  const n = mesh.nCells;
  let speed: Float64Array;
  let dry = 0;
  if (wave && typeof wave.term !== 'number' && wave.onPoints && (!vel || vel.onPoints)) {
    // every input on points: λ per node, then the maximum over the cell's nodes
    const t = wave.term;
    const perNode = vel ? new Float64Array(vel.mag) : new Float64Array(t.length);
    for (let i = 0; i < t.length; i++) perNode[i] = perNode[i]! + t[i]!;
    speed = cellMaxOfPoints(mesh, perNode);
  } else {
    speed = vel ? toCells(mesh, vel.mag, vel.onPoints) : float64s(n);
    if (speed === vel?.mag) { speed = float64s(n); speed.set(vel.mag); }
    if (wave) {
      if (typeof wave.term === 'number') {
        for (let i = 0; i < n; i++) speed[i] = speed[i]! + (wave.term as number);
      } else {
        const t = toCells(mesh, wave.term, wave.onPoints);
        for (let i = 0; i < n; i++) speed[i] = speed[i]! + t[i]!;
      }
    }
  }
  if (wave?.wet) {
    const wet = wave.wet;
    if (wave.onPoints) {
      const off = mesh.cellOffsets, nodes = mesh.cellNodes;
      for (let i = 0; i < n; i++) {
        let anyWet = 0;
        for (let k = off[i]!, e = off[i + 1]!; k < e; k++) anyWet |= wet[nodes[k]!]!;
        if (!anyWet) dry++;
      }
    } else {
      for (let i = 0; i < n; i++) if (!wet[i]) dry++;
    }
  }
  let field: VelocityField | null | undefined;
  return {
    speed,
    // the components, made on first use (face-based limits need them; the step does not)
    get velocity(): VelocityField | null {
      if (field === undefined) field = input ? velocityComponents(input, vs) : null;
      return field;
    },
    wave,
    dry,
    velocitySource: vel ? vel.source : null,
    depthSource: model === 'shallow-water' && wave ? wave.source : null,
    soundSource: model === 'acoustic' && wave ? wave.source : null,
    warnings,
  };
}

/**
 * A per-cell scalar from a constant or an array name (point data: the maximum over the cell's
 * nodes; cell data as is); values must be finite and ≥ 0.
 */
export function cellScalar(mesh: Mesh, spec: string | number, what: string, file?: string): { values: Float64Array; source: string } {
  if (typeof spec === 'number') {
    if (!(spec >= 0) || !Number.isFinite(spec)) throw new UsageError(`${what} must be a non-negative number, got ${spec}`);
    return { values: new Float64Array(mesh.nCells).fill(spec), source: `${spec} (constant)` };
  }
  const loc = scalarArray(mesh, spec, what, file);
  const v = loc.array.values;
  const vals = new Float64Array(v.length);
  for (let i = 0; i < v.length; i++) {
    if (v[i]! < 0) throw new MeshInputError(`${what} "${spec}" is negative (${v[i]}) at tuple ${i}`, file === undefined ? {} : { file });
    vals[i] = v[i]!;
  }
  return { values: toCells(mesh, vals, loc.onPoints), source: `${spec} (${loc.onPoints ? 'point' : 'cell'} data)` };
}
