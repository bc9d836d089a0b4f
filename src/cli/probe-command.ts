/** `steplens probe FILE [options]`: the measured stability of the discrete upwind operator beside the predicted limits. */
import { CAUTION, runAudit, VERSION, type AuditResult } from '../audit/audit.js';
import { integrator, PROBE_INTEGRATORS, PROBE_ITERATIONS, PROBE_PRECISION, PROBE_TOLERANCE, probeLimit, upwindOperator, type ProbeResult } from '../audit/probe.js';
import { buildEdges } from '../geometry/edges.js';
import { UsageError } from '../mesh/errors.js';
import { velocityField } from '../physics/speed.js';
import { velocityFactor } from '../physics/units.js';
import { toJson } from '../io/format.js';
import { numberOption, parse, type OptionSpec } from './args.js';
import { auditOptionsFrom, loadMesh } from './audit-command.js';
import type { CliIo } from './io.js';
import { formatCount, formatNumber, formatSeconds } from './units.js';

export const PROBE_HELP = `steplens probe FILE [options]

Builds the discrete operator of first-order upwind finite volume (advective form) on this
mesh and velocity,
  dq_i/dt = (1/A_i) Σ over inflow faces |u_f·n_f|·|f|·(q_j − q_i),
u_f = the mean of the face's two node velocities (point data) or of its two cells'
velocities (cell data). Boundary faces contribute nothing: inflow through the boundary is
zero-gradient (q_j = q_i). It then measures the largest stable step of the time integrator
by power iteration on the amplification operator R(dt·L), with a bisection on dt, and
prints it beside the predicted limits:
  guaranteed   C·h/|u| with the inscribed length h = 2A/P (the audit's default; proven for
               a uniform flow)
  face flux    C·A / Σ max(u·n, 0)|f| (steplens audit --length flux)
  measured     the largest dt at which a seeded random start does not grow: the mean
               growth per step of max|q| over steps K/4+1 … K (K = ${PROBE_ITERATIONS}) is
               ≤ 1 + ${PROBE_TOLERANCE.toExponential(0)}; bisection to ${PROBE_PRECISION * 100} %

What "measured" means: the asymptotic growth of the linear operator (its spectral radius as
K grows). It is an estimate, not a bound. Transient growth of a non-normal operator (a
disturbance that grows for a while before it decays or leaves the mesh) is not covered; nor
are nonlinear fluxes, limiters, source terms or boundary conditions other than the one above.
Up to 1 / (the largest sum of a cell's inflow coefficients) the update is monotone and
nothing grows (this is the face-flux limit when the discrete flow is divergence-free, e.g. a
uniform flow); beyond it, cells overshoot.
When the flow has no recirculation the operator is nearly triangular in flow order, its
eigenvalues sit near its diagonal, and the measured step approaches the integrator's real
stability interval (2 for forward Euler) times the face-flux step of the worst cell.
Near an open boundary, disturbances that would leave the mesh within K steps are still
seen, so K (--iterations) shapes what is measured on long, open domains.

options
  --time NAME           integrator: ${PROBE_INTEGRATORS.join(', ')} (default euler; rkS = any S-stage
                        method of order S, whose stability polynomial is Σ_{k≤S} z^k/k!) or a
                        built-in of steplens scheme --list
  --velocity NAME|X,Y   velocity vector array, or two scalar arrays (default: found by name)
  --courant C           Courant number of the predicted limits (default 1)
  --coords SYSTEM       planar (default) or geographic (degrees)
  --length-unit U       m (default), km, ft
  --velocity-unit U     m/s (default), km/h, kn, ft/s
  --iterations K        steps per trial (default ${PROBE_ITERATIONS}; more is slower and closer to
                        the asymptotic growth)
  --json                print only the JSON result on stdout
  --debug               show stack traces of unexpected errors

Progress goes to stderr. A stable step is necessary, not sufficient, for a correct simulation.
`;

const SPEC: OptionSpec = {
  time: { type: 'string' }, velocity: { type: 'string' }, courant: { type: 'string' }, coords: { type: 'string' },
  'length-unit': { type: 'string' }, 'velocity-unit': { type: 'string' }, model: { type: 'string' },
  iterations: { type: 'string' }, json: { type: 'boolean' }, debug: { type: 'boolean' }, help: { type: 'boolean', short: 'h' },
};

const OPERATOR_TEXT = 'first-order upwind finite volume, advective form';
const BOUNDARY_TEXT = 'boundary faces contribute nothing (zero-gradient inflow)';
const MEASURED_NOTE =
  'measured = the largest dt at which a seeded random start does not grow over the last three quarters of the ' +
  'iterations: an estimate of the asymptotic growth (spectral radius) of the linear operator; transient growth ' +
  'of non-normal operators is not covered.';

export interface ProbeReport {
  steplens: string;
  file: string;
  mesh: { cells: number; points: number; faces_with_flow: number };
  velocity: string | null;
  operator: string;
  boundary: string;
  integrator: { name: string; r: number[] };
  predicted: { courant: number; inscribed: { dt: number | null; cell: number | null }; flux: { dt: number | null; cell: number | null } };
  measured: {
    dt: number | null;
    ratio_to_flux: number | null;
    start: number | null;
    bracket: [number, number | null] | null;
    iterations: number;
    burn_in: number;
    tolerance: number;
    precision: number;
    seed: number;
    trials: { dt: number; growth: number; stable: boolean }[];
  };
  degenerate_cells: number;
  warnings: string[];
  note: string;
  caution: string;
}

function limitOf(r: AuditResult): { dt: number | null; cell: number | null } {
  return { dt: r.summary.limit.dt, cell: r.summary.limit.cell };
}

function report(file: string, a: AuditResult, f: AuditResult, name: string, r: Float64Array, p: ProbeResult, faces: number, degenerate: number): ProbeReport {
  const flux = f.summary.limit.dt;
  const warnings = [...a.summary.warnings];
  if (degenerate > 0) warnings.push(`${degenerate} degenerate cell(s) receive flow: left out of the operator (their step is 0)`);
  if (p.bracket && p.bracket[1] === null) warnings.push('no unstable step was found up to the largest one tried: the measured step is a lower bound');
  return {
    steplens: VERSION,
    file,
    mesh: { cells: a.mesh.nCells, points: a.mesh.nPoints, faces_with_flow: faces },
    velocity: a.summary.model.velocity,
    operator: OPERATOR_TEXT,
    boundary: BOUNDARY_TEXT,
    integrator: { name, r: Array.from(r) },
    predicted: { courant: a.summary.limit.courant, inscribed: limitOf(a), flux: limitOf(f) },
    measured: {
      dt: p.dt,
      ratio_to_flux: p.dt !== null && flux !== null && flux > 0 ? p.dt / flux : null,
      start: p.start,
      bracket: p.bracket,
      iterations: p.iterations,
      burn_in: p.burnIn,
      tolerance: p.tolerance,
      precision: p.precision,
      seed: p.seed,
      trials: p.trials,
    },
    degenerate_cells: degenerate,
    warnings,
    note: MEASURED_NOTE,
    caution: CAUTION,
  };
}

function polynomialText(r: number[]): string {
  const terms = r.map((c, k) => (k === 0 ? formatNumber(c, 6) : `${c === 1 ? '' : `${formatNumber(c, 6)}·`}z${k === 1 ? '' : `^${k}`}`));
  return terms.join(' + ');
}

function limitLine(label: string, l: { dt: number | null; cell: number | null }, tail = ''): string {
  return `  ${label.padEnd(42)}${formatSeconds(l.dt).padStart(11)}${l.cell === null ? '' : `   cell ${l.cell}`}${tail}`;
}

export function renderProbe(s: ProbeReport): string {
  const m = s.measured;
  const out = [
    `steplens ${s.steplens} probe · ${s.file}`,
    `  mesh        ${formatCount(s.mesh.cells)} cells, ${formatCount(s.mesh.points)} points; ${formatCount(s.mesh.faces_with_flow)} interior faces carry flow`,
    `  velocity    ${s.velocity ?? '—'}`,
    `  operator    ${s.operator}; ${s.boundary}`,
    `  integrator  ${s.integrator.name}, R(z) = ${polynomialText(s.integrator.r)}`,
    '',
    'largest stable step',
    limitLine(`guaranteed (inscribed length, C = ${formatNumber(s.predicted.courant, 6)})`, s.predicted.inscribed),
    limitLine('face flux (A / Σ max(u·n, 0)|f|)', s.predicted.flux),
    limitLine('measured (power iteration)', { dt: m.dt, cell: null }, m.ratio_to_flux === null ? '' : `   ${formatNumber(m.ratio_to_flux, 3)}× face flux`),
    '',
    `  criterion   mean growth per step of max|q| over steps ${m.burn_in + 1}–${m.iterations} ≤ 1 + ${m.tolerance.toExponential(0)}; ` +
      `bisection to ${m.precision * 100} %; ${m.trials.length} trials; seed ${m.seed}`,
  ];
  if (m.start !== null) out.push(`  monotone    up to ${formatSeconds(m.start)} (1 / the largest sum of a cell's inflow coefficients; the search starts there)`);
  if (m.bracket && m.bracket[1] !== null) out.push(`  bracket     stable at ${m.bracket[0]} s, growing at ${m.bracket[1]} s`);
  if (s.warnings.length) {
    out.push('', 'warnings');
    for (const w of s.warnings) out.push(`  - ${w}`);
  }
  out.push('', `note: ${s.note}`, `note: ${s.caution}`);
  return out.join('\n') + '\n';
}

export async function probeCommand(args: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parse(args, SPEC);
  if (values.help) { io.stdout(PROBE_HELP); return 0; }
  if (positionals.length !== 1) throw new UsageError(`probe takes one mesh file: steplens probe FILE [options] (see steplens probe --help); got ${positionals.length}`);
  const file = positionals[0]!;
  if (values.model !== undefined && values.model !== 'advection') {
    throw new UsageError(`probe measures the scalar advection operator; --model ${String(values.model)} is not covered (use advection)`);
  }
  const integ = integrator(values.time === undefined ? 'euler' : String(values.time));
  const iterations = numberOption(values.iterations, 'iterations') ?? PROBE_ITERATIONS;
  if (!Number.isInteger(iterations) || iterations < 8) throw new UsageError(`--iterations must be an integer ≥ 8, got ${iterations}`);
  const options = auditOptionsFrom({ ...values, time: undefined, model: undefined }, file);
  io.progress?.(`reading ${file}`);
  const mesh = loadMesh(file);
  io.progress?.(`predicted limits of ${formatCount(mesh.nCells)} cells`);
  const inscribed = runAudit(mesh, { ...options, length: 'inscribed', top: 0 });
  const flux = runAudit(mesh, { ...options, length: 'flux', top: 0, geometry: inscribed.geom });
  const vel = velocityField(inscribed.mesh, { ...(options.velocity !== undefined ? { velocity: options.velocity } : {}), file }, []);
  if (!vel) throw new UsageError('probe needs a velocity: pass --velocity NAME or --velocity X,Y');
  const vf = velocityFactor(options.velocityUnit);
  if (vf !== 1) for (let i = 0; i < vel.vx.length; i++) { vel.vx[i] = vel.vx[i]! * vf; vel.vy[i] = vel.vy[i]! * vf; }
  io.progress?.('building the upwind operator');
  const op = upwindOperator(inscribed.mesh, inscribed.geom, buildEdges(inscribed.mesh, file), vel, options.coords === 'geographic');
  const result = probeLimit(op, integ.r, {
    iterations,
    onTrial: (t, k) => io.progress?.(`trial ${k + 1}: dt = ${formatSeconds(t.dt)}, growth per step ${t.growth.toFixed(6)} (${t.stable ? 'stable' : 'growing'})`),
  });
  io.progress?.('');
  const rep = report(file, inscribed, flux, integ.name, integ.r, result, op.nFaces, op.degenerate);
  io.stdout(values.json ? toJson(rep) : renderProbe(rep));
  return 0;
}
