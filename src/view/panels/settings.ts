/**
 * Settings: the physics, the arrays to use, the Courant number (typed, or from a time
 * integrator × space operator pair when the scheme analysis is available) and the intended step.
 * Any change re-runs the audit.
 */
import type { AuditOptions } from '../../audit/audit.js';
import { clear, el } from '../dom.js';
import { LENGTH_UNITS, VELOCITY_UNITS } from '../../physics/units.js';
import { scalarArrays, vectorArrays, velocityPairs, type ArrayRef } from '../options.js';

/** A source of Courant numbers for scheme pairs (absent when the analysis module is not there). */
export interface SchemeCatalogue {
  integrators: { id: string; label: string }[];
  spaces: { id: string; label: string }[];
  /** As the CLI's --time/--space: C, where it came from, and the diffusion scale (when any). */
  courant(integrator: string, space: string): SchemeChoice;
}

export interface SchemeChoice {
  courant: number | null;
  note: string;
  source?: string;
  diffusionScale?: number;
}

const MODEL_LABELS: [string, string][] = [
  ['advection', 'Advection (λ = |u|)'],
  ['shallow-water', 'Shallow water (λ = |u| + √gH)'],
  ['acoustic', 'Acoustic (λ = |u| + c)'],
];

function select(name: string, options: [string, string][], value: string): HTMLSelectElement {
  const s = el('select', { name });
  for (const [v, label] of options) s.append(el('option', { value: v, text: label }));
  s.value = options.some(([v]) => v === value) ? value : options[0]?.[0] ?? '';
  return s;
}

function field(label: string, control: HTMLElement, hint?: string): HTMLLabelElement {
  return el('label', { class: 'field' }, el('span', { text: label }), control, hint ? el('small', { text: hint }) : null);
}

function numberInput(name: string, value: number | undefined, placeholder: string): HTMLInputElement {
  return el('input', { name, type: 'text', inputmode: 'decimal', value: value === undefined ? '' : String(value), placeholder });
}

/** A number from a text box: undefined when empty, NaN when not a number. */
function readNumber(input: HTMLInputElement): number | undefined {
  const s = input.value.trim();
  if (s === '') return undefined;
  const x = Number(s);
  return Number.isFinite(x) ? x : NaN;
}

export class SettingsPanel {
  private schemeChoice: { integrator: string; space: string } | null = null;
  /** The options last handed on, so that an Enter and the change event after it apply once. */
  private lastApplied = '';

  constructor(private readonly form: HTMLFormElement, private readonly catalogue: SchemeCatalogue | null, private readonly onApply: (o: AuditOptions) => void) {
    form.addEventListener('submit', (e) => e.preventDefault());
  }

  render(arrays: ArrayRef[], o: AuditOptions): void {
    const f = this.form;
    clear(f);
    this.lastApplied = JSON.stringify(o, (k, v: unknown) => (k === 'file' ? undefined : v));
    const vectors = vectorArrays(arrays);
    const scalars = scalarArrays(arrays);
    const velOptions: [string, string][] = [['', 'found by name (or at rest)']];
    for (const v of vectors) velOptions.push([v, v]);
    for (const [x, y] of velocityPairs(arrays)) velOptions.push([`${x},${y}`, `${x}, ${y}`]);
    const velValue = o.velocity === undefined ? '' : Array.isArray(o.velocity) ? o.velocity.join(',') : o.velocity;
    const model = select('model', MODEL_LABELS, o.model ?? 'advection');
    const velocity = select('velocity', velOptions, velValue);
    const depth = select('depth', scalars.length ? scalars.map((s) => [s, s]) : [['', 'no scalar array']], o.depth ?? '');
    const gravity = numberInput('gravity', o.gravity, '9.80665');
    const soundKind = select('sound-kind', [['value', 'constant'], ...scalars.map((s): [string, string] => [s, s])],
      typeof o.soundSpeed === 'string' ? o.soundSpeed : 'value');
    const soundValue = numberInput('sound-speed', typeof o.soundSpeed === 'number' ? o.soundSpeed : undefined, '343');
    const length = select('length', [['inscribed', 'inscribed, h = 2A/P'], ['flux', 'exact face flux']], o.length ?? 'inscribed');
    const nuKind = select('diffusivity-kind', [['', 'none'], ['value', 'constant'], ...scalars.map((s): [string, string] => [s, s])],
      o.diffusivity === undefined ? '' : typeof o.diffusivity === 'number' ? 'value' : o.diffusivity);
    const nuValue = numberInput('diffusivity', typeof o.diffusivity === 'number' ? o.diffusivity : undefined, 'ν');
    const courant = numberInput('courant', o.courant, '1 (default)');
    const coords = select('coords', [['planar', 'planar x, y'], ['geographic', 'longitude, latitude (degrees)']], o.coords ?? 'planar');
    const unitOptions = (units: Record<string, number>): [string, string][] => Object.keys(units).map((u) => [u, u]);
    const lengthUnit = select('length-unit', unitOptions(LENGTH_UNITS), o.lengthUnit ?? 'm');
    const velocityUnit = select('velocity-unit', unitOptions(VELOCITY_UNITS), o.velocityUnit ?? 'm/s');
    const dt = numberInput('dt', o.dt, 'none');
    const top = numberInput('top', o.top, '10');

    const swRows = [field('Depth array', depth), field('Gravity g [m/s²]', gravity)];
    const acRows = [field('Sound speed', soundKind), field('constant c [m/s]', soundValue)];
    const nuValueRow = field('constant ν [m²/s]', nuValue);
    const lengthUnitRow = field('Length unit', lengthUnit);
    f.append(field('Model', model), field('Velocity', velocity), ...swRows, ...acRows, field('Advective length', length),
      field('Diffusivity', nuKind), nuValueRow, field('Coordinates', coords), lengthUnitRow, field('Velocity unit', velocityUnit));

    let schemeRow: HTMLElement | null = null;
    let schemeNote: HTMLElement | null = null;
    let integrator: HTMLSelectElement | null = null;
    let space: HTMLSelectElement | null = null;
    if (this.catalogue) {
      const cat = this.catalogue;
      integrator = select('integrator', [['', 'typed number'], ...cat.integrators.map((i): [string, string] => [i.id, i.label])], this.schemeChoice?.integrator ?? '');
      space = select('space', cat.spaces.map((s): [string, string] => [s.id, s.label]), this.schemeChoice?.space ?? cat.spaces[0]?.id ?? '');
      schemeNote = el('small', { class: 'scheme-note' });
      schemeRow = el('div', { class: 'scheme' }, field('Time integrator', integrator), field('× space operator', space), schemeNote);
      f.append(schemeRow);
    }
    f.append(field('Courant number C', courant), field('Intended step Δt [s]', dt, 'optional: Courant numbers at this step'), field('Cells listed', top));

    const sync = () => {
      const m = model.value;
      for (const r of swRows) r.hidden = m !== 'shallow-water';
      for (const r of acRows) r.hidden = m !== 'acoustic';
      acRows[1]!.hidden = m !== 'acoustic' || soundKind.value !== 'value';
      nuValueRow.hidden = nuKind.value !== 'value';
      lengthUnitRow.hidden = coords.value === 'geographic';
      if (integrator && space && schemeNote && this.catalogue) {
        const useScheme = integrator.value !== '';
        space.disabled = !useScheme;
        courant.readOnly = useScheme;
        if (useScheme) {
          const r = this.catalogue.courant(integrator.value, space.value);
          schemeNote.textContent = r.note;
          courant.value = r.courant === null ? '' : String(r.courant);
        } else schemeNote.textContent = '';
      }
    };
    sync();

    const apply = () => {
      sync();
      const out: AuditOptions = { model: model.value as AuditOptions['model'] };
      let ok = true;
      const num = (input: HTMLInputElement): number | undefined => {
        const v = readNumber(input);
        input.classList.toggle('invalid', Number.isNaN(v));
        if (Number.isNaN(v)) ok = false;
        return v;
      };
      if (velocity.value) {
        const parts = velocity.value.split(',');
        out.velocity = parts.length === 2 ? [parts[0]!, parts[1]!] : velocity.value;
      }
      if (out.model === 'shallow-water') {
        if (depth.value) out.depth = depth.value;
        const g = num(gravity);
        if (g !== undefined) out.gravity = g;
      }
      if (out.model === 'acoustic') {
        if (soundKind.value === 'value') {
          const c = num(soundValue);
          if (c !== undefined) out.soundSpeed = c;
        } else out.soundSpeed = soundKind.value;
      }
      if (length.value === 'flux') out.length = 'flux';
      if (coords.value === 'geographic') out.coords = 'geographic';
      else if (lengthUnit.value !== 'm') out.lengthUnit = lengthUnit.value;
      if (velocityUnit.value !== 'm/s') out.velocityUnit = velocityUnit.value;
      if (nuKind.value === 'value') {
        const nu = num(nuValue);
        if (nu !== undefined) out.diffusivity = nu;
      } else if (nuKind.value) out.diffusivity = nuKind.value;
      const c = num(courant);
      if (c !== undefined) out.courant = c;
      if (integrator && space && integrator.value) {
        this.schemeChoice = { integrator: integrator.value, space: space.value };
        const r = this.catalogue!.courant(integrator.value, space.value);
        if (r.courant === null) ok = false;
        else {
          out.courant = r.courant;
          if (r.source !== undefined) out.courantSource = r.source;
          if (r.diffusionScale !== undefined) out.diffusionScale = r.diffusionScale;
        }
      } else this.schemeChoice = null;
      const step = num(dt);
      if (step !== undefined) out.dt = step;
      const t = num(top);
      if (t !== undefined) out.top = t;
      const key = JSON.stringify(out);
      if (ok && key !== this.lastApplied) {
        this.lastApplied = key;
        this.onApply(out);
      }
    };
    for (const c of [model, velocity, depth, soundKind, length, nuKind, coords, lengthUnit, velocityUnit, integrator, space]) c?.addEventListener('change', apply);
    for (const c of [gravity, soundValue, nuValue, courant, dt, top]) {
      c.addEventListener('change', apply);
      c.addEventListener('keydown', (e) => { if (e.key === 'Enter') { e.preventDefault(); apply(); } });
    }
  }
}
