/** Runs the built command as a process (STEPLENS_BIN may point at another entry script). */
import { spawnSync } from 'node:child_process';
import * as fs from 'node:fs';
import * as path from 'node:path';
import { fileURLToPath } from 'node:url';

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const bin = process.env.STEPLENS_BIN ?? path.join(root, 'bin/steplens.js');

export function run(args: string[]): { code: number | null; out: string; err: string } {
  const r = spawnSync(process.execPath, [bin, ...args], { cwd: root, encoding: 'utf8', timeout: 120000 });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

export function requireBuild(): void {
  if (!fs.existsSync(path.join(root, 'dist/cli/main.js'))) throw new Error('run `npm run build:cli` first (npm test does)');
}
