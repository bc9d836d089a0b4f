/**
 * Shared pieces of the browser tests: the built app served by our own server, one headless
 * Chromium (Debian's, software WebGL), the CLI as a process, and canvas pixels.
 */
import { execFile } from 'node:child_process';
import { existsSync, mkdirSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { chromium, type Browser, type Page } from 'playwright-core';
import { startServer, type Server } from '../../src/cli/serve.js';
import { decodePng, type Image } from './png.js';

export const ROOT = fileURLToPath(new URL('../../', import.meta.url));
export const OUTPUT = `${ROOT}test-output/`;
export const CHROMIUM = process.env.STEPLENS_CHROMIUM ?? '/usr/bin/chromium';

export function requireBuilt(): void {
  const missing = ['dist-view/index.html', 'dist/cli/main.js'].filter((f) => !existsSync(ROOT + f));
  if (missing.length) throw new Error(`missing ${missing.join(', ')}: run npm run build before the browser tests`);
  if (!existsSync(CHROMIUM)) throw new Error(`no Chromium at ${CHROMIUM} (apt-get install chromium, or set STEPLENS_CHROMIUM)`);
  mkdirSync(OUTPUT, { recursive: true });
}

export function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: CHROMIUM,
    args: ['--use-angle=swiftshader', '--enable-unsafe-swiftshader', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic'],
  });
}

/** The built app plus the demo meshes under /mesh/. */
export function serveApp(extra: [string, string][] = []): Promise<Server> {
  const files = new Map<string, string>([
    ['/mesh/harbour.vtu', `${ROOT}meshes/harbour.vtu`],
    ['/mesh/channel.vtu', `${ROOT}meshes/channel.vtu`],
    ...extra,
  ]);
  return startServer({ root: `${ROOT}dist-view`, files });
}

export function runCli(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    execFile(process.execPath, [`${ROOT}bin/steplens.js`, ...args], { cwd: ROOT, maxBuffer: 1 << 28 }, (err, stdout, stderr) => {
      const code = err ? (typeof err.code === 'number' ? err.code : 1) : 0;
      resolve({ code, stdout, stderr });
    });
  });
}

/** Wait until the root element reports `ready` (or fail with what the error panel says). */
export async function waitReady(page: Page, timeout = 60000): Promise<void> {
  await page.waitForSelector('#app[data-state="ready"], #app[data-state="error"]', { timeout });
  const state = await page.getAttribute('#app', 'data-state');
  if (state !== 'ready') throw new Error(`view is in state ${state}: ${await page.textContent('#error-panel')}`);
}

/** Let the page draw: two animation frames (the view renders on the next one after a change). */
export async function frames(page: Page): Promise<void> {
  await page.evaluate(() => new Promise<void>((done) => requestAnimationFrame(() => requestAnimationFrame(() => done()))));
}

export async function globalLimit(page: Page): Promise<number> {
  const v = await page.getAttribute('[data-role="global-limit"]', 'data-value');
  return Number(v);
}

export async function canvasImage(page: Page, file?: string): Promise<Image> {
  const png = await page.locator('#view').screenshot(file ? { path: OUTPUT + file } : {});
  return decodePng(new Uint8Array(png));
}

/** Fraction of pixels within `tol` (per channel) of any colour in the list. */
export function fractionNear(img: Image, colours: [number, number, number][], tol: number): number {
  const near = new Uint8Array(1 << 24);
  for (const [r0, g0, b0] of colours) {
    for (let r = Math.max(0, r0 - tol); r <= Math.min(255, r0 + tol); r++) {
      for (let g = Math.max(0, g0 - tol); g <= Math.min(255, g0 + tol); g++) {
        for (let b = Math.max(0, b0 - tol); b <= Math.min(255, b0 + tol); b++) near[(r << 16) | (g << 8) | b] = 1;
      }
    }
  }
  let hit = 0;
  const n = img.width * img.height;
  const d = img.data;
  for (let p = 0; p < n; p++) hit += near[(d[4 * p]! << 16) | (d[4 * p + 1]! << 8) | d[4 * p + 2]!]!;
  return hit / n;
}
