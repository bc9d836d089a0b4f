/**
 * `steplens view [FILE] [audit options] [--port N]`: audits the file like `steplens audit`, then
 * serves the built browser view and that file on 127.0.0.1 and prints the address. Without a
 * file, the shipped harbour demo is shown with its shallow-water settings.
 */
import * as fs from 'node:fs';
import * as path from 'node:path';
import { fileURLToPath } from 'node:url';
import { runAudit, type AuditOptions } from '../audit/audit.js';
import { UsageError } from '../mesh/errors.js';
import { autoOptions, DEMO, queryFromOptions } from '../view/options.js';
import { numberOption, parse, type OptionSpec } from './args.js';
import { auditOptionsFrom, loadMesh } from './audit-command.js';
import type { CliIo } from './io.js';
import { renderReport } from './report.js';
import { startServer, type Server } from './serve.js';

export const VIEW_HELP = `steplens view [FILE] [options]

Audits FILE and opens it in the browser view, served on http://127.0.0.1 only (nothing else on
the machine is served). Without FILE the harbour demo loads. Stop with Ctrl+C.

  --port N              port to listen on (default: any free port)
  --model, --velocity, --depth, --gravity, --sound-speed, --courant, --time, --space,
  --coords, --length-unit, --velocity-unit, --dt, --length, --diffusivity, --top
                        as for steplens audit; without physics options they are chosen from
                        the arrays the file holds (depth → shallow water, ...)
`;

const SPEC: OptionSpec = {
  model: { type: 'string' }, velocity: { type: 'string' }, depth: { type: 'string' }, gravity: { type: 'string' },
  'sound-speed': { type: 'string' }, courant: { type: 'string' }, dt: { type: 'string' }, top: { type: 'string' },
  length: { type: 'string' }, diffusivity: { type: 'string' }, coords: { type: 'string' }, 'length-unit': { type: 'string' },
  'velocity-unit': { type: 'string' }, time: { type: 'string' }, space: { type: 'string' }, port: { type: 'string' }, debug: { type: 'boolean' }, help: { type: 'boolean', short: 'h' },
};

const PHYSICS = ['model', 'velocity', 'depth', 'gravity', 'sound-speed'];

const packageRoot = fileURLToPath(new URL('../../', import.meta.url));

export interface ViewControl {
  /** Stops serving when aborted (default: Ctrl+C / SIGTERM). */
  signal?: AbortSignal;
  /** Called with the server once it listens (tests). */
  onListening?: (server: Server, pageUrl: string) => void;
}

function siblingOf(file: string): string | null {
  const ext = path.extname(file).toLowerCase();
  if (ext !== '.node' && ext !== '.ele') return null;
  return file.slice(0, -ext.length) + (ext === '.node' ? '.ele' : '.node');
}

function waitForStop(signal: AbortSignal | undefined): Promise<void> {
  return new Promise((resolve) => {
    if (signal) {
      if (signal.aborted) resolve();
      else signal.addEventListener('abort', () => resolve(), { once: true });
      return;
    }
    const stop = () => {
      process.off('SIGINT', stop);
      process.off('SIGTERM', stop);
      resolve();
    };
    process.on('SIGINT', stop);
    process.on('SIGTERM', stop);
  });
}

export async function viewCommand(args: string[], io: CliIo, control: ViewControl = {}): Promise<number> {
  const { values, positionals } = parse(args, SPEC);
  if (values.help) { io.stdout(VIEW_HELP); return 0; }
  if (positionals.length > 1) throw new UsageError(`view takes one mesh file; got ${positionals.length}: ${positionals.join(' ')}`);
  const port = numberOption(values.port, 'port');
  if (port !== undefined && !(Number.isInteger(port) && port >= 0 && port <= 65535)) throw new UsageError(`--port must be an integer in 0..65535, got ${port}`);
  const appRoot = path.join(packageRoot, 'dist-view');
  if (!fs.existsSync(path.join(appRoot, 'index.html'))) throw new UsageError(`the browser view is not built (${appRoot} is missing): run npm run build`);

  const demo = positionals.length === 0;
  const file = demo ? path.join(packageRoot, 'meshes', DEMO.name) : positionals[0]!;
  const label = demo ? DEMO.name : file;
  let options: AuditOptions = auditOptionsFrom(values, label);
  io.progress?.(`reading ${label}`);
  const mesh = loadMesh(file);
  if (demo) options = { ...DEMO.options, ...options };
  else if (!PHYSICS.some((k) => values[k] !== undefined)) {
    const auto = autoOptions([...mesh.pointData, ...mesh.cellData]);
    options = { ...options, ...auto.options };
    if (auto.note) io.stderr(`steplens: ${auto.note}\n`);
  }
  io.progress?.(`auditing ${mesh.nCells} cells`);
  const result = runAudit(mesh, options);
  io.progress?.('');

  const base = path.basename(file);
  const files = new Map<string, string>([[`/mesh/${base}`, path.resolve(file)]]);
  const sib = siblingOf(file);
  if (sib && fs.existsSync(sib)) files.set(`/mesh/${path.basename(sib)}`, path.resolve(sib));
  const server = await startServer({ root: appRoot, files, ...(port !== undefined ? { port } : {}) });
  const q = queryFromOptions(options);
  q.set('mesh', `mesh/${encodeURIComponent(base)}`);
  q.set('file', label);
  const pageUrl = `${server.url}?${q.toString()}`;
  io.stdout(renderReport(result.summary));
  io.stdout(`\nview: ${pageUrl}\n(serving on 127.0.0.1 only; Ctrl+C stops)\n`);
  control.onListening?.(server, pageUrl);
  await waitForStop(control.signal);
  await server.close();
  return 0;
}
