/** The `steplens` command: dispatch, exit codes, error printing. Only here do errors become exit codes. */
import { SteplensError } from '../mesh/errors.js';
import { VERSION } from '../audit/audit.js';
import { auditCommand } from './audit-command.js';
import { allocateShared } from '../mesh/alloc.js';
import { schemeCommand } from './scheme-command.js';
import { probeCommand } from './probe-command.js';
import { viewCommand } from './view-command.js';
import { readInput } from './files.js';
import * as fs from 'node:fs';
import type { CliIo } from './io.js';

const HELP = `steplens ${VERSION} — largest stable explicit time step of a 2-D unstructured mesh

usage
  steplens audit FILE [options]     per-cell step limits, the cells that cap the run, tables
  steplens audit A.vtu B.vtu ...    a run: limit per snapshot, envelope, step schedule
  steplens scheme --time T --space S  the largest stable Courant number of a scheme
  steplens probe FILE [options]     measured stability of the upwind operator (power iteration)
  steplens view [FILE] [options]    the mesh coloured by allowed step in the browser (127.0.0.1)
  steplens --help | --version

Run "steplens COMMAND --help" (audit, scheme, probe, view) for the options.
exit codes: 0 ok, 2 bad usage or unreadable file, 3 limit below --fail-below, 1 internal error
`;

export function nodeIo(): CliIo {
  const tty = Boolean(process.stderr.isTTY);
  let shown = false;
  return {
    stdout: (s) => { process.stdout.write(s); },
    stderr: (s) => { process.stderr.write(s); },
    progress: (s) => {
      if (!tty) return;
      process.stderr.write(`\r\x1b[K${s ? `steplens: ${s}…` : ''}`);
      shown = s !== '';
      void shown;
    },
  };
}

export async function main(argv: string[], io: CliIo = nodeIo()): Promise<number> {
  const debug = argv.includes('--debug');
  // every command starts on ordinary memory; audit turns shared memory on for its threads
  allocateShared(false);
  try {
    const [cmd, ...rest] = argv;
    switch (cmd) {
      case undefined:
      case 'help':
      case '--help':
      case '-h':
        io.stdout(HELP);
        return cmd === undefined ? 2 : 0;
      case '--version':
      case '-v':
        io.stdout(`${VERSION}\n`);
        return 0;
      case 'audit':
        return await auditCommand(rest, io);
      case 'view':
        return await viewCommand(rest, io);
      case 'probe':
        return await probeCommand(rest, io);
      case 'scheme':
        return await schemeCommand(rest, {
          stdout: io.stdout,
          stderr: io.stderr,
          readFile: (p) => readInput(p),
          writeFile: (p, d) => fs.writeFileSync(p, d),
        });
      default:
        io.stderr(`steplens: unknown command "${cmd}"; try steplens --help\n`);
        return 2;
    }
  } catch (e) {
    io.progress?.('');
    if (e instanceof SteplensError) {
      io.stderr(`steplens: ${e.message}\n`);
      if (debug && e.stack) io.stderr(e.stack + '\n');
      return 2;
    }
    const err = e as Error;
    io.stderr(`steplens: internal error: ${err?.message ?? String(e)}\n`);
    if (debug && err?.stack) io.stderr(err.stack + '\n');
    else io.stderr('steplens: run again with --debug for details\n');
    return 1;
  }
}
