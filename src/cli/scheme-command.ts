/** `steplens scheme`: the largest stable Courant number of a time integrator × space operator pairing. */
import { SteplensError, UsageError } from '../mesh/errors.js';
import { analyseScheme, builtInTableau, parseTableau, SPACE_OPERATORS, stabilitySvg, TIME_INTEGRATORS, type SchemeResult, type Tableau } from '../stability/index.js';
import { parse } from './args.js';

export interface SchemeIo {
  stdout: (s: string) => void;
  stderr: (s: string) => void;
  readFile: (path: string) => Uint8Array;
  writeFile: (path: string, data: string | Uint8Array) => void;
}

const HELP = `usage
  steplens scheme --time NAME|FILE.json --space NAME [--json] [--svg FILE]
  steplens scheme --list

Von Neumann analysis of u_t + a u_x = 0 on a uniform periodic grid: the largest Courant number
C = |a|·dt/dx for which the pairing does not amplify any Fourier mode.

options
  --time NAME|FILE.json   time integrator: a built-in name (see --list) or a JSON Butcher tableau
                          {"A": [[...]], "b": [...], "c": [...]} (entries may be fractions like "1/6")
  --space NAME            space operator: a finite-difference stencil or dg0 ... dg6 (upwind flux)
  --json                  print the result as JSON
  --svg FILE              write a picture of the stability region and the scaled spectrum
  --list                  list the known names
  --help                  this text
`;

const OPTIONS = {
  time: { type: 'string' },
  space: { type: 'string' },
  json: { type: 'boolean' },
  svg: { type: 'string' },
  list: { type: 'boolean' },
  help: { type: 'boolean', short: 'h' },
} as const;

export async function schemeCommand(args: string[], io: SchemeIo): Promise<number> {
  try {
    return run(args, io);
  } catch (e) {
    if (e instanceof SteplensError) {
      io.stderr(`steplens scheme: ${e.message}\n`);
      return 2;
    }
    throw e;
  }
}

function run(args: string[], io: SchemeIo): number {
  const { values, positionals } = parse(args, { ...OPTIONS });
  if (values.help) {
    io.stdout(HELP);
    return 0;
  }
  if (positionals.length > 0) throw new UsageError(`unexpected argument "${positionals[0]}"; try steplens scheme --help`);
  if (values.list) {
    io.stdout(`time integrators  ${TIME_INTEGRATORS.join(', ')}\nspace operators   ${SPACE_OPERATORS.join(', ')}\n`);
    return 0;
  }
  const timeArg = values.time as string | undefined;
  const spaceArg = values.space as string | undefined;
  if (timeArg === undefined) throw new UsageError(`--time is required: one of ${TIME_INTEGRATORS.join(', ')}, or a tableau .json file`);
  if (spaceArg === undefined) throw new UsageError(`--space is required: one of ${SPACE_OPERATORS.join(', ')}`);

  const time = loadTime(timeArg, io);
  const result = analyseScheme(time.tableau ?? timeArg, spaceArg);
  result.time = time.label;
  const svgPath = values.svg as string | undefined;
  if (svgPath !== undefined) {
    const svg = stabilitySvg(time.tableau ?? timeArg, spaceArg, { timeLabel: time.label });
    try {
      io.writeFile(svgPath, svg);
    } catch (e) {
      throw new UsageError(`cannot write ${svgPath}: ${(e as Error).message}`);
    }
  }
  io.stdout(values.json ? jsonReport(result, svgPath) : humanReport(result, svgPath));
  return 0;
}

function loadTime(arg: string, io: SchemeIo): { label: string; tableau?: Tableau } {
  if (builtInTableau(arg)) return { label: arg.trim().toLowerCase() };
  if (!/\.json$/i.test(arg.trim())) {
    throw new UsageError(`unknown time integrator "${arg}"; known: ${TIME_INTEGRATORS.join(', ')} (or a tableau file ending in .json)`);
  }
  let bytes: Uint8Array;
  try {
    bytes = io.readFile(arg);
  } catch (e) {
    const code = (e as { code?: string }).code;
    throw new UsageError(`cannot read ${arg}${code === 'ENOENT' ? ': no such file' : `: ${(e as Error).message}`}`);
  }
  return { label: arg, tableau: parseTableau(new TextDecoder().decode(bytes), arg) };
}

/** 12 significant digits: drops the ~1e-12 left by the stability tolerance (2.000000000001 → 2). */
const clean = (v: number): number => Number(v.toPrecision(12));
const show = (v: number): string => Number(v.toPrecision(5)).toString();

function jsonReport(r: SchemeResult, svgPath: string | undefined): string {
  const o: Record<string, unknown> = {
    courant: clean(r.courant),
    status: r.status,
    realInterval: clean(r.realInterval),
    imagInterval: clean(r.imagInterval),
    diffusion: clean(r.diffusion),
    time: r.time,
    space: r.space,
  };
  if (r.worstTheta !== undefined) o.worstTheta = clean(r.worstTheta);
  if (svgPath !== undefined) o.svg = svgPath;
  return JSON.stringify(o, null, 2) + '\n';
}

function humanReport(r: SchemeResult, svgPath: string | undefined): string {
  const lines: string[] = [`${r.time} in time, ${r.space} in space`, ''];
  const row = (label: string, value: string, note: string) => lines.push(`  ${label.padEnd(20)}${value.padEnd(10)}${note}`);
  let where = '';
  if (r.worstTheta !== undefined && r.worstTheta > 0) where = `, tightest at θ = ${show(r.worstTheta)} (${show((2 * Math.PI) / r.worstTheta)} cells per wave)`;
  else if (r.worstTheta === 0) where = r.status === 'stable' ? ', tightest at θ = 0' : ', from long waves (θ → 0)';
  row('Courant number', show(r.courant), `${r.status}${where}`);
  row('real interval', show(r.realInterval), `|R(-x)| ≤ 1 for 0 ≤ x ≤ ${show(r.realInterval)}`);
  row('imaginary interval', show(r.imagInterval), r.imagInterval > 0 ? `|R(iy)| ≤ 1 for 0 ≤ y ≤ ${show(r.imagInterval)}` : 'the imaginary axis leaves the region at 0');
  row('diffusion number', show(r.diffusion), 'largest ν·dt/dx² with the 3-point diffusion stencil');
  lines.push('');
  if (r.status === 'stable') {
    lines.push(`  meaning: dt ≤ ${show(r.courant)}·dx/|a| in 1-D; on unstructured meshes steplens uses h = 2A/P in place of dx.`);
  } else if (r.status === 'weakly-unstable') {
    lines.push('  meaning: no dt is stable. Long waves grow a little every step (by O(C^p), p ≥ 2), slowly for small dt;');
    lines.push('  the run needs dissipation from elsewhere or another integrator.');
  } else {
    lines.push('  meaning: the space operator itself amplifies some waves; no dt is stable.');
  }
  if (svgPath !== undefined) lines.push(`  picture: ${svgPath}`);
  return lines.join('\n') + '\n';
}
