/** Running the built CLI as a process in tests. */
import { spawnSync } from 'node:child_process';
import * as fs from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { fileURLToPath } from 'node:url';

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const bin = path.join(root, 'bin/steplens.js');

export function runCli(args: string[]): { code: number | null; out: string; err: string } {
  const r = spawnSync(process.execPath, [bin, ...args], { cwd: root, encoding: 'utf8', timeout: 60000 });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

/** A fresh temporary folder; throws when the CLI has not been built. */
export function cliTempDir(prefix: string): string {
  if (!fs.existsSync(path.join(root, 'dist/cli/main.js'))) throw new Error('run `npm run build:cli` first (npm test does)');
  return fs.mkdtempSync(path.join(os.tmpdir(), prefix));
}
