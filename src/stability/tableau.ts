/**
 * Explicit Runge–Kutta methods as Butcher tableaux: the built-in ones, conversions from the
 * Shu–Osher and 2N-storage forms in which some methods are published, and validation of
 * tableaux given by the user as JSON.
 */
import { UsageError } from '../mesh/errors.js';

export interface Tableau {
  A: number[][];
  b: number[];
  c: number[];
}

/** Consistency tolerance for user tableaux: Σb = 1 and c_i = Σ_j a_ij. */
export const TABLEAU_TOLERANCE = 1e-10;
const MAX_STAGES = 64;

/**
 * Shu–Osher form: u⁽⁰⁾ = uⁿ, u⁽ⁱ⁾ = Σ_{k<i} (alpha[i-1][k] u⁽ᵏ⁾ + dt·beta[i-1][k] L(u⁽ᵏ⁾)), uⁿ⁺¹ = u⁽ˢ⁾.
 * Rows are ragged: row i-1 has i entries (missing entries are 0).
 */
export function fromShuOsher(alpha: number[][], beta: number[][]): Tableau {
  const s = alpha.length;
  // w[i][j]: u⁽ⁱ⁾ = uⁿ + dt Σ_j w[i][j] L(u⁽ʲ⁾)
  const w: number[][] = [new Array<number>(s).fill(0)];
  for (let i = 1; i <= s; i++) {
    const row = new Array<number>(s).fill(0);
    const a = alpha[i - 1]!;
    const bt = beta[i - 1]!;
    for (let k = 0; k < i; k++) {
      const ak = a[k] ?? 0;
      if (ak !== 0) for (let j = 0; j < s; j++) row[j]! += ak * w[k]![j]!;
      row[k]! += bt[k] ?? 0;
    }
    w.push(row);
  }
  return fromStageRows(w.slice(0, s), w[s]!);
}

/**
 * Williamson 2N-storage form: dU ← A_i dU + dt L(U), U ← U + B_i dU, i = 1..s.
 */
export function fromTwoRegister(A: number[], B: number[]): Tableau {
  const s = A.length;
  let d = new Array<number>(s).fill(0);
  let u = new Array<number>(s).fill(0);
  const stages: number[][] = [u.slice()];
  for (let i = 0; i < s; i++) {
    d = d.map((x) => A[i]! * x);
    d[i]! += 1;
    u = u.map((x, j) => x + B[i]! * d[j]!);
    stages.push(u.slice());
  }
  return fromStageRows(stages.slice(0, s), stages[s]!);
}

function fromStageRows(rows: number[][], b: number[]): Tableau {
  const A = rows.map((r) => r.slice());
  return { A, b: b.slice(), c: A.map((r) => r.reduce((x, y) => x + y, 0)) };
}

function butcher(A: number[][], b: number[]): Tableau {
  return fromStageRows(A, b);
}

const BUILT_IN: Record<string, () => Tableau> = {
  euler: () => butcher([[0]], [1]),
  heun: () => butcher([[0, 0], [1, 0]], [0.5, 0.5]),
  // Shu & Osher, J. Comput. Phys. 77 (1988): u1 = u + dt L(u); u2 = ½u + ½u1 + ½dt L(u1).
  'ssp-rk2': () => fromShuOsher([[1], [0.5, 0.5]], [[1], [0, 0.5]]),
  // Shu & Osher (1988): u1 = u + dt L(u); u2 = ¾u + ¼u1 + ¼dt L(u1); u3 = ⅓u + ⅔u2 + ⅔dt L(u2).
  'ssp-rk3': () => fromShuOsher([[1], [0.75, 0.25], [1 / 3, 0, 2 / 3]], [[1], [0, 0.25], [0, 0, 2 / 3]]),
  rk4: () => butcher([[0, 0, 0, 0], [0.5, 0, 0, 0], [0, 0.5, 0, 0], [0, 0, 1, 0]], [1 / 6, 1 / 3, 1 / 3, 1 / 6]),
  // Spiteri & Ruuth, SIAM J. Numer. Anal. 40(2):469–491 (2002), SSP-RK(5,4) in Shu–Osher form
  // (coefficients as printed there and reproduced in public solver codes).
  'ssp-rk54': () =>
    fromShuOsher(
      [
        [1],
        [0.444370493651235, 0.555629506348765],
        [0.620101851488403, 0, 0.379898148511597],
        [0.178079954393132, 0, 0, 0.821920045606868],
        [0, 0, 0.517231671970585, 0.096059710526147, 0.386708617503269],
      ],
      [
        [0.39175222657189],
        [0, 0.368410593050371],
        [0, 0, 0.251891774271694],
        [0, 0, 0, 0.544974750228521],
        [0, 0, 0, 0.06369246866629, 0.226007483236906],
      ],
    ),
  // Carpenter & Kennedy, Fourth-order 2N-storage Runge–Kutta schemes, NASA TM-109112 (1994), RK4(3)5[2R+]C.
  lsrk54: () =>
    fromTwoRegister(
      [0, -567301805773 / 1357537059087, -2404267990393 / 2016746695238, -3550918686646 / 2091501179385, -1275806237668 / 842570457699],
      [1432997174477 / 9575080441755, 5161836677717 / 13612068292357, 1720146321549 / 2090206949498, 3134564353537 / 4481467310338, 2277821191437 / 14882151754819],
    ),
};

export const TIME_INTEGRATORS: string[] = Object.keys(BUILT_IN);

/** A built-in tableau by name (case-insensitive), or undefined. */
export function builtInTableau(name: string): Tableau | undefined {
  const make = BUILT_IN[name.trim().toLowerCase()];
  return make ? make() : undefined;
}

/** Checks that a tableau describes an explicit, consistent method; throws UsageError otherwise. */
export function validateTableau(t: Tableau, file = 'tableau'): Tableau {
  const fail = (what: string): never => {
    throw new UsageError(`${file}: ${what}`);
  };
  if (!Array.isArray(t.A) || !Array.isArray(t.b)) fail('needs "A" (a square matrix) and "b" (a vector)');
  const s = t.A.length;
  if (s === 0) fail('"A" is empty');
  if (s > MAX_STAGES) fail(`${s} stages is more than the ${MAX_STAGES} supported`);
  t.A.forEach((row, i) => {
    if (!Array.isArray(row) || row.length !== s) fail(`"A" must be square: row ${i + 1} has ${Array.isArray(row) ? row.length : 'no'} entries, expected ${s}`);
  });
  if (t.b.length !== s) fail(`"b" has ${t.b.length} entries but "A" has ${s} stages`);
  if (t.c.length !== s) fail(`"c" has ${t.c.length} entries but "A" has ${s} stages`);
  const finite = (x: number, where: string) => {
    if (typeof x !== 'number' || !Number.isFinite(x)) fail(`${where} is not a finite number`);
  };
  for (let i = 0; i < s; i++) {
    for (let j = 0; j < s; j++) {
      finite(t.A[i]![j]!, `A[${i + 1}][${j + 1}]`);
      if (j >= i && t.A[i]![j] !== 0) fail(`A[${i + 1}][${j + 1}] = ${t.A[i]![j]} is on or above the diagonal: only explicit methods (strictly lower triangular A) are supported`);
    }
    finite(t.b[i]!, `b[${i + 1}]`);
    finite(t.c[i]!, `c[${i + 1}]`);
  }
  const sumB = t.b.reduce((x, y) => x + y, 0);
  if (Math.abs(sumB - 1) > TABLEAU_TOLERANCE) fail(`the weights b add up to ${sumB}, not 1 (the method would not be consistent)`);
  for (let i = 0; i < s; i++) {
    const row = t.A[i]!.reduce((x, y) => x + y, 0);
    if (Math.abs(t.c[i]! - row) > TABLEAU_TOLERANCE) fail(`c[${i + 1}] = ${t.c[i]} but row ${i + 1} of A adds up to ${row}`);
  }
  return t;
}

/**
 * Reads a tableau from JSON text: {"A": [[...]], "b": [...], "c": [...]}. Entries are numbers or
 * fractions written as strings ("1/6"); "c" may be left out and is then taken as the row sums of A.
 */
export function parseTableau(text: string, file: string): Tableau {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (e) {
    throw new UsageError(`${file}: not valid JSON (${(e as Error).message})`);
  }
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc)) throw new UsageError(`${file}: expected a JSON object with "A", "b" and "c"`);
  const o = doc as Record<string, unknown>;
  const vector = (v: unknown, name: string): number[] => {
    if (!Array.isArray(v)) throw new UsageError(`${file}: "${name}" must be an array`);
    return v.map((x, i) => entry(x, `${name}[${i + 1}]`, file));
  };
  if (!Array.isArray(o.A)) throw new UsageError(`${file}: "A" must be an array of rows`);
  const A = o.A.map((row, i) => vector(row, `A[${i + 1}]`));
  const b = vector(o.b, 'b');
  const c = o.c === undefined ? A.map((r) => r.reduce((x, y) => x + y, 0)) : vector(o.c, 'c');
  return validateTableau({ A, b, c }, file);
}

function entry(x: unknown, where: string, file: string): number {
  if (typeof x === 'number') return x;
  if (typeof x === 'string') {
    const m = /^\s*([+-]?\d+(?:\.\d*)?(?:[eE][+-]?\d+)?)\s*(?:\/\s*(\d+(?:\.\d*)?(?:[eE][+-]?\d+)?))?\s*$/.exec(x);
    if (m) {
      const v = m[2] === undefined ? Number(m[1]) : Number(m[1]) / Number(m[2]);
      if (Number.isFinite(v)) return v;
    }
  }
  throw new UsageError(`${file}: ${where} must be a number or a fraction such as "1/6", got ${JSON.stringify(x)}`);
}
