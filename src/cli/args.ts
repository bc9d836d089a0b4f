/** Command-line parsing on Node's util.parseArgs, with our own error messages. */
import { parseArgs } from 'node:util';
import { UsageError } from '../mesh/errors.js';

export type OptionSpec = Record<string, { type: 'string' | 'boolean'; short?: string; multiple?: boolean }>;

export function parse(args: string[], spec: OptionSpec): { values: Record<string, string | boolean | string[] | undefined>; positionals: string[] } {
  try {
    const r = parseArgs({ args, options: spec, allowPositionals: true, strict: true });
    return { values: r.values as Record<string, string | boolean | string[] | undefined>, positionals: r.positionals };
  } catch (e) {
    const msg = (e as Error).message.replace(/\. To specify a positional argument.*$/s, '');
    throw new UsageError(msg);
  }
}

export function numberOption(v: unknown, name: string): number | undefined {
  if (v === undefined) return undefined;
  const s = String(v).trim();
  const x = Number(s);
  if (s === '' || !Number.isFinite(x)) throw new UsageError(`--${name} expects a number, got "${s}"`);
  return x;
}
