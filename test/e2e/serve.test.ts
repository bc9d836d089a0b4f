/**
 * The view's server: 127.0.0.1 only, the app's files and the named meshes only; traversal in
 * every spelling is refused. And `steplens view`, which prints the address and the audit.
 */
import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import * as http from 'node:http';
import { tmpdir } from 'node:os';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { resolveRequest, startServer, type Server } from '../../src/cli/serve.js';
import { viewCommand } from '../../src/cli/view-command.js';
import { UsageError } from '../../src/mesh/errors.js';
import { requireBuilt, ROOT } from './harness.js';

/** A request with the target sent exactly as written (no client-side normalisation). */
function rawGet(port: number, target: string, host = `127.0.0.1:${port}`): Promise<{ status: number; body: string }> {
  return new Promise((resolve, reject) => {
    const req = http.request({ host: '127.0.0.1', port, path: target, method: 'GET', headers: { host } }, (res) => {
      let body = '';
      res.setEncoding('utf8');
      res.on('data', (c: string) => { body += c; });
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body }));
    });
    req.on('error', reject);
    req.end();
  });
}

let dir: string;
let server: Server;

beforeAll(async () => {
  dir = mkdtempSync(`${tmpdir()}/steplens-serve-`);
  mkdirSync(`${dir}/app/assets`, { recursive: true });
  writeFileSync(`${dir}/app/index.html`, '<!doctype html><title>app</title>');
  writeFileSync(`${dir}/app/assets/a.js`, 'export {};');
  writeFileSync(`${dir}/secret.txt`, 'secret');
  writeFileSync(`${dir}/mesh.vtu`, '<VTKFile/>');
  symlinkSync(`${dir}/secret.txt`, `${dir}/app/link.txt`);
  server = await startServer({ root: `${dir}/app`, files: new Map([['/mesh/mesh.vtu', `${dir}/mesh.vtu`]]) });
});

afterAll(async () => {
  await server?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('the view server', () => {
  it('listens on 127.0.0.1 and serves the app and the named mesh', async () => {
    expect(server.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/$/);
    const index = await rawGet(server.port, '/');
    expect(index.status).toBe(200);
    expect(index.body).toContain('<title>app</title>');
    expect((await rawGet(server.port, '/assets/a.js?v=1')).status).toBe(200);
    expect((await rawGet(server.port, '/mesh/mesh.vtu')).body).toBe('<VTKFile/>');
  });

  it('refuses traversal, encoded traversal, absolute paths and symlinks out of the app', async () => {
    const forbidden = [
      '/../secret.txt', '/assets/../../secret.txt', '/%2e%2e/secret.txt', '/%2E%2E%2Fsecret.txt',
      '/assets/..%2f..%2fsecret.txt', '/%252e%252e/secret.txt', '/..\\secret.txt', '/%5c..%5csecret.txt',
      '//etc/passwd', '/C:/Windows/win.ini', '/index.html%00.js', '/./index.html',
    ];
    for (const t of forbidden) {
      const r = await rawGet(server.port, t);
      expect([400, 403], t).toContain(r.status);
      expect(r.body).not.toContain('secret');
    }
    expect((await rawGet(server.port, `${dir}/secret.txt`)).status).toBe(404);
    expect((await rawGet(server.port, 'http://example.org/secret.txt')).status).toBe(403);
    expect((await rawGet(server.port, '/link.txt')).status).toBe(403);
    expect((await rawGet(server.port, '/mesh/other.vtu')).status).toBe(404);
  });

  it('answers only to its own host name (no DNS rebinding)', async () => {
    expect((await rawGet(server.port, '/', 'attacker.example:80')).status).toBe(403);
    expect((await rawGet(server.port, '/', `localhost:${server.port}`)).status).toBe(200);
  });

  it('decides requests without touching anything outside the root', () => {
    const files = new Map<string, string>();
    expect(resolveRequest('POST', '/', `${dir}/app`, files).status).toBe(405);
    expect(resolveRequest('GET', '/%zz', `${dir}/app`, files).status).toBe(400);
    expect(resolveRequest('GET', '/nope.js', `${dir}/app`, files).status).toBe(404);
    expect(resolveRequest('GET', '/assets', `${dir}/app`, files).status).toBe(404);
  });

  it('reports a busy port as a usage error', async () => {
    await expect(startServer({ root: `${dir}/app`, port: server.port })).rejects.toBeInstanceOf(UsageError);
  });
});

describe('steplens view', () => {
  beforeAll(() => requireBuilt());

  async function run(args: string[]): Promise<{ code: number; out: string; url: string; page: string; mesh: number }> {
    let out = '';
    const ac = new AbortController();
    let url = '', page = '', mesh = 0;
    const code = await viewCommand(args, { stdout: (s) => { out += s; }, stderr: (s) => { out += s; } }, {
      signal: ac.signal,
      onListening: (srv, pageUrl) => {
        url = pageUrl;
        void (async () => {
          try {
            const u = new URL(pageUrl);
            page = (await rawGet(srv.port, '/')).body;
            mesh = (await rawGet(srv.port, `/${u.searchParams.get('mesh')}`)).status;
          } finally {
            ac.abort();
          }
        })();
      },
    });
    return { code, out, url, page, mesh };
  }

  it('serves the app and the file, and prints the address and the audit', async () => {
    const r = await run([`${ROOT}meshes/channel.vtu`, '--model', 'advection', '--velocity', 'velocity', '--courant', '0.9']);
    expect(r.code).toBe(0);
    expect(r.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/\?/);
    const q = new URL(r.url).searchParams;
    expect(q.get('mesh')).toBe('mesh/channel.vtu');
    expect(q.get('model')).toBe('advection');
    expect(q.get('courant')).toBe('0.9');
    expect(r.out).toContain(r.url);
    expect(r.out).toMatch(/LARGEST STABLE STEP/);
    expect(r.page).toContain('<div id="app"');
    expect(r.mesh).toBe(200);
  });

  it('shows the harbour demo with its shallow-water settings when no file is given', async () => {
    const r = await run([]);
    const q = new URL(r.url).searchParams;
    expect(q.get('mesh')).toBe('mesh/harbour.vtu');
    expect(q.get('model')).toBe('shallow-water');
    expect(q.get('depth')).toBe('depth');
    expect(r.mesh).toBe(200);
  });

  it('passes a scheme’s Courant number, as the CLI derives it, on to the page', async () => {
    const r = await run([`${ROOT}meshes/channel.vtu`, '--model', 'advection', '--time', 'ssp-rk3', '--space', 'upwind2']);
    const q = new URL(r.url).searchParams;
    expect(Number(q.get('courant'))).toBeGreaterThan(0);
    expect(q.get('courant-source')).toMatch(/ssp-rk3 × upwind2/);
  });

  it('chooses the physics from the arrays when none is given', async () => {
    const r = await run([`${ROOT}meshes/harbour.vtu`]);
    expect(new URL(r.url).searchParams.get('model')).toBe('shallow-water');
  });

  it('rejects a bad port and a second file', async () => {
    await expect(viewCommand(['--port', '70000'], { stdout: () => {}, stderr: () => {} })).rejects.toBeInstanceOf(UsageError);
    await expect(viewCommand(['a.vtu', 'b.vtu'], { stdout: () => {}, stderr: () => {} })).rejects.toBeInstanceOf(UsageError);
  });
});
