/** The built command, run as a process (built first when dist/ is missing). */
import { execFile, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import * as path from 'node:path';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const bin = path.join(root, 'bin/steplens.js');
const execFileAsync = promisify(execFile);

export function ensureCli(): void {
  if (existsSync(path.join(root, 'dist/cli/main.js'))) return;
  // tsc emits even when files under edit elsewhere fail to typecheck; main.js is what we need
  spawnSync('npm', ['run', 'build:cli'], { cwd: root, stdio: 'ignore', timeout: 120000 });
}

export interface CliRun {
  code: number;
  out: string;
  err: string;
}

export async function steplens(args: string[], cwd = root): Promise<CliRun> {
  try {
    const r = await execFileAsync(process.execPath, [bin, ...args], { cwd, timeout: 30000 });
    return { code: 0, out: r.stdout, err: r.stderr };
  } catch (e) {
    const x = e as { code?: number; stdout?: string; stderr?: string };
    return { code: typeof x.code === 'number' ? x.code : -1, out: x.stdout ?? '', err: x.stderr ?? '' };
  }
}
