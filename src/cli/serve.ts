/**
 * A small static server for the view: binds 127.0.0.1 only, serves the built app's files and
 * the meshes it is told about, nothing else. Traversal attempts (../, encoded forms, backslashes,
 * drive letters, NUL) get 403; anything else outside the app folder is simply not there (404).
 */
import * as fs from 'node:fs';
import * as http from 'node:http';
import type { AddressInfo } from 'node:net';
import * as path from 'node:path';
import { UsageError } from '../mesh/errors.js';

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.wasm': 'application/wasm',
  '.map': 'application/json',
};

export interface ServeOptions {
  /** Folder of the built app (dist-view/). */
  root: string;
  /** Extra files by URL path (e.g. "/mesh/harbour.vtu" → its path on disk). */
  files?: Map<string, string>;
  /** 0 or absent: any free port. */
  port?: number;
}

export interface Server {
  url: string;
  port: number;
  close(): Promise<void>;
}

export type Verdict = { status: 200; file: string } | { status: 400 | 403 | 404 | 405; reason: string };

function isInside(root: string, file: string): boolean {
  const rel = path.relative(root, file);
  return rel !== '' && !rel.startsWith('..') && !path.isAbsolute(rel);
}

/** Decide what a request target maps to. Pure apart from file-system lookups. */
export function resolveRequest(method: string, target: string, root: string, files: Map<string, string>): Verdict {
  if (method !== 'GET' && method !== 'HEAD') return { status: 405, reason: 'only GET and HEAD' };
  if (!target.startsWith('/') || target.startsWith('//')) return { status: 403, reason: 'absolute or scheme-relative target' };
  const rawPath = target.split(/[?#]/, 1)[0]!;
  let p: string;
  try {
    p = decodeURIComponent(rawPath);
  } catch {
    return { status: 400, reason: 'bad percent-encoding' };
  }
  // decode twice to catch double-encoded dots and slashes as well
  let twice = p;
  try { twice = decodeURIComponent(p); } catch { /* a literal % is fine */ }
  for (const s of [p, twice]) {
    if (s.includes('\0') || s.includes('\\')) return { status: 403, reason: 'forbidden character' };
    const segs = s.split('/');
    if (segs.some((g) => g === '..' || g === '.' || /^[a-zA-Z]:/.test(g))) return { status: 403, reason: 'path traversal' };
    if (s.slice(1).includes('//')) return { status: 403, reason: 'empty path segment' };
  }
  const mapped = files.get(p);
  if (mapped !== undefined) return { status: 200, file: mapped };
  const rel = p === '/' ? 'index.html' : p.slice(1);
  const rootAbs = path.resolve(root);
  const file = path.resolve(rootAbs, rel);
  if (!isInside(rootAbs, file)) return { status: 403, reason: 'outside the app folder' };
  let real: string;
  try {
    real = fs.realpathSync(file);
  } catch {
    return { status: 404, reason: 'not found' };
  }
  if (!isInside(fs.realpathSync(rootAbs), real)) return { status: 403, reason: 'outside the app folder' };
  if (!fs.statSync(real).isFile()) return { status: 404, reason: 'not a file' };
  return { status: 200, file: real };
}

function hostAllowed(host: string | undefined, port: number): boolean {
  return host === `127.0.0.1:${port}` || host === `localhost:${port}`;
}

export function startServer(opts: ServeOptions): Promise<Server> {
  const files = opts.files ?? new Map<string, string>();
  let port = 0;
  const server = http.createServer((req, res) => {
    const send = (status: number, text: string) => {
      res.writeHead(status, { 'Content-Type': 'text/plain; charset=utf-8', 'Cache-Control': 'no-store', 'X-Content-Type-Options': 'nosniff' });
      res.end(req.method === 'HEAD' ? undefined : `${status} ${text}\n`);
    };
    // a page on another name that resolves to 127.0.0.1 must not read our files
    if (!hostAllowed(req.headers.host, port)) { send(403, 'unexpected Host header'); return; }
    const v = resolveRequest(req.method ?? 'GET', req.url ?? '/', opts.root, files);
    if (v.status !== 200) { send(v.status, v.reason); return; }
    let size: number;
    try {
      size = fs.statSync(v.file).size;
    } catch {
      send(404, 'not found');
      return;
    }
    res.writeHead(200, {
      'Content-Type': TYPES[path.extname(v.file).toLowerCase()] ?? 'application/octet-stream',
      'Content-Length': size,
      'Cache-Control': 'no-store',
      'X-Content-Type-Options': 'nosniff',
    });
    if (req.method === 'HEAD') { res.end(); return; }
    const stream = fs.createReadStream(v.file, { highWaterMark: 1 << 20 });
    stream.on('error', () => res.destroy());
    stream.pipe(res);
  });
  return new Promise((resolve, reject) => {
    server.once('error', (e: NodeJS.ErrnoException) => {
      reject(e.code === 'EADDRINUSE' ? new UsageError(`port ${opts.port} is already in use; pick another with --port`) : e);
    });
    server.listen(opts.port ?? 0, '127.0.0.1', () => {
      port = (server.address() as AddressInfo).port;
      resolve({
        url: `http://127.0.0.1:${port}/`,
        port,
        close: () => new Promise<void>((done) => {
          server.closeAllConnections();
          server.close(() => done());
        }),
      });
    });
  });
}
