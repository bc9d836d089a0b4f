/** Readable numbers for the human report: a fitting unit and 3–4 significant digits. */

function sig(x: number, digits = 4): string {
  if (x === 0) return '0';
  const s = x.toPrecision(digits);
  return s.includes('e') ? s : String(Number(s));
}

export function formatSeconds(t: number | null): string {
  if (t === null || !Number.isFinite(t)) return 'no limit';
  if (t === 0) return '0 s';
  const a = Math.abs(t);
  if (a < 1e-6) return `${sig(t * 1e9)} ns`;
  if (a < 1e-3) return `${sig(t * 1e6)} µs`;
  if (a < 1) return `${sig(t * 1e3)} ms`;
  if (a < 120) return `${sig(t)} s`;
  if (a < 7200) return `${sig(t / 60)} min`;
  return `${sig(t / 3600)} h`;
}

export function formatLength(l: number): string {
  if (!Number.isFinite(l)) return String(l);
  const a = Math.abs(l);
  if (a === 0) return '0 m';
  if (a < 1e-3) return `${sig(l * 1e6)} µm`;
  if (a < 1) return `${sig(l * 1e3)} mm`;
  if (a < 1e4) return `${sig(l)} m`;
  return `${sig(l / 1e3)} km`;
}

export function formatNumber(x: number | null, digits = 4): string {
  if (x === null) return '—';
  if (!Number.isFinite(x)) return x > 0 ? 'inf' : String(x);
  return sig(x, digits);
}

export function formatCount(n: number): string {
  return n.toLocaleString('en-US');
}
