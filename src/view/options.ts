/**
 * Audit settings for the view: a sensible first choice from the arrays a file holds, and the
 * URL query form (the same names as the CLI's options). No DOM: the view command uses it too.
 */
import type { AuditOptions } from '../audit/audit.js';
import type { WaveModel } from '../physics/speed.js';

export interface ArrayRef {
  name: string;
  components: number;
}

const VELOCITY_WORDS = ['velocity', 'velocities', 'vel', 'u', 'uv', 'flow_velocity', 'current', 'flow'];
const PAIRS: [string, string][] = [['u', 'v'], ['vx', 'vy'], ['ux', 'uy'], ['velocity_x', 'velocity_y'], ['u_x', 'u_y'], ['vel_x', 'vel_y']];

function byName(arrays: ArrayRef[], want: string): ArrayRef | undefined {
  return arrays.find((a) => a.name.toLowerCase() === want);
}

export function vectorArrays(arrays: ArrayRef[]): string[] {
  return unique(arrays.filter((a) => a.components === 2 || a.components === 3).map((a) => a.name));
}

export function scalarArrays(arrays: ArrayRef[]): string[] {
  return unique(arrays.filter((a) => a.components === 1).map((a) => a.name));
}

function unique(names: string[]): string[] {
  return [...new Set(names)];
}

/** Pairs of scalar arrays that look like the x and y velocity components. */
export function velocityPairs(arrays: ArrayRef[]): [string, string][] {
  const out: [string, string][] = [];
  for (const [x, y] of PAIRS) {
    const ax = byName(arrays, x), ay = byName(arrays, y);
    if (ax && ay && ax.components === 1 && ay.components === 1) out.push([ax.name, ay.name]);
  }
  return out;
}

export function guessVelocity(arrays: ArrayRef[]): string | [string, string] | undefined {
  for (const w of VELOCITY_WORDS) {
    const a = byName(arrays, w);
    if (a && (a.components === 2 || a.components === 3)) return a.name;
  }
  const vectors = vectorArrays(arrays);
  const named = vectors.find((n) => /vel|flow|current/i.test(n));
  if (named) return named;
  const pair = velocityPairs(arrays)[0];
  if (pair) return pair;
  return vectors[0];
}

export function guessDepth(arrays: ArrayRef[]): string | undefined {
  const s = scalarArrays(arrays);
  return s.find((n) => /^(depth|water_?depth|h|total_?depth)$/i.test(n)) ?? s.find((n) => /depth/i.test(n));
}

export function guessSoundSpeed(arrays: ArrayRef[]): string | undefined {
  return scalarArrays(arrays).find((n) => /sound|^c$|^c0$/i.test(n));
}

/** Stand-in speed for a file with no flow fields: the steps then read as h in seconds. */
export const UNIT_SPEED = 1;

/**
 * First settings for a file: shallow water when a depth is found, acoustic with a sound speed,
 * advection with a velocity; with none of them a unit speed so the view still shows the mesh
 * (`note` says so).
 */
export function autoOptions(arrays: ArrayRef[]): { options: AuditOptions; note: string | null } {
  const velocity = guessVelocity(arrays);
  const depth = guessDepth(arrays);
  const sound = guessSoundSpeed(arrays);
  const o: AuditOptions = {};
  if (velocity !== undefined) o.velocity = velocity;
  if (depth !== undefined) {
    o.model = 'shallow-water';
    o.depth = depth;
  } else if (sound !== undefined) {
    o.model = 'acoustic';
    o.soundSpeed = sound;
  } else if (velocity !== undefined) {
    o.model = 'advection';
  } else {
    o.model = 'acoustic';
    o.soundSpeed = UNIT_SPEED;
    return { options: o, note: `No velocity, depth or sound-speed array in the file: λ = ${UNIT_SPEED} m/s is assumed, so each step equals h in seconds. Set the physics in Settings.` };
  }
  return { options: o, note: null };
}

const MODELS: readonly WaveModel[] = ['advection', 'shallow-water', 'acoustic'];

function finite(s: string | null): number | undefined {
  if (s === null || s.trim() === '') return undefined;
  const x = Number(s);
  return Number.isFinite(x) ? x : undefined;
}

/**
 * Settings from a query string (names as the CLI options; courant-source and diffusion-scale
 * carry what the CLI derived from --time/--space), or null when none are given.
 */
export function optionsFromQuery(q: URLSearchParams): AuditOptions | null {
  const o: AuditOptions = {};
  let any = false;
  const model = q.get('model');
  if (model !== null && (MODELS as readonly string[]).includes(model)) { o.model = model as WaveModel; any = true; }
  const vel = q.get('velocity');
  if (vel) {
    const parts = vel.split(',').map((p) => p.trim());
    o.velocity = parts.length === 2 && parts[0] && parts[1] ? [parts[0], parts[1]] : vel;
    any = true;
  }
  const depth = q.get('depth');
  if (depth) { o.depth = depth; any = true; }
  const sound = q.get('sound-speed');
  if (sound) { o.soundSpeed = finite(sound) ?? sound; any = true; }
  const length = q.get('length');
  if (length === 'inscribed' || length === 'flux') { o.length = length; any = true; }
  const nu = q.get('diffusivity');
  if (nu) { o.diffusivity = finite(nu) ?? nu; any = true; }
  const coords = q.get('coords');
  if (coords === 'planar' || coords === 'geographic') { o.coords = coords; any = true; }
  const texts: [string, 'lengthUnit' | 'velocityUnit' | 'courantSource'][] = [['length-unit', 'lengthUnit'], ['velocity-unit', 'velocityUnit'], ['courant-source', 'courantSource']];
  for (const [key, prop] of texts) {
    const v = q.get(key);
    if (v) { o[prop] = v; any = true; }
  }
  const nums: [string, 'gravity' | 'courant' | 'dt' | 'top' | 'diffusionScale'][] = [
    ['gravity', 'gravity'], ['courant', 'courant'], ['dt', 'dt'], ['top', 'top'], ['diffusion-scale', 'diffusionScale'],
  ];
  for (const [key, prop] of nums) {
    const v = finite(q.get(key));
    if (v !== undefined) { o[prop] = v; any = true; }
  }
  return any ? o : null;
}

/** The query form of settings (inverse of optionsFromQuery). */
export function queryFromOptions(o: AuditOptions): URLSearchParams {
  const q = new URLSearchParams();
  if (o.model) q.set('model', o.model);
  if (o.velocity !== undefined) q.set('velocity', Array.isArray(o.velocity) ? o.velocity.join(',') : o.velocity);
  if (o.depth !== undefined) q.set('depth', o.depth);
  if (o.soundSpeed !== undefined) q.set('sound-speed', String(o.soundSpeed));
  if (o.gravity !== undefined) q.set('gravity', String(o.gravity));
  if (o.length !== undefined) q.set('length', o.length);
  if (o.diffusivity !== undefined) q.set('diffusivity', String(o.diffusivity));
  if (o.coords !== undefined) q.set('coords', o.coords);
  if (o.lengthUnit !== undefined) q.set('length-unit', o.lengthUnit);
  if (o.velocityUnit !== undefined) q.set('velocity-unit', o.velocityUnit);
  if (o.courant !== undefined) q.set('courant', String(o.courant));
  if (o.courantSource !== undefined) q.set('courant-source', o.courantSource);
  if (o.diffusionScale !== undefined) q.set('diffusion-scale', String(o.diffusionScale));
  if (o.dt !== undefined) q.set('dt', String(o.dt));
  if (o.top !== undefined) q.set('top', String(o.top));
  return q;
}

/** The demo that loads when no mesh is named: our harbour, with its shallow-water settings. */
export const DEMO = {
  url: 'demo/harbour.vtu',
  name: 'harbour.vtu',
  options: { model: 'shallow-water', depth: 'depth', velocity: 'velocity' } as AuditOptions,
};
