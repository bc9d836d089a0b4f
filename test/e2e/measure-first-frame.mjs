// Measures the time from a mesh URL to the first coloured frame of the built view in headless
// Chromium (software WebGL), for a jittered grid of about N triangles (default 1,000,000).
// Not a test: run by hand after `npm run build`:  node test/e2e/measure-first-frame.mjs [N]
import { mkdirSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { chromium } from 'playwright-core';
import { writeVtu } from '../../dist/io/vtu.js';
import { startServer } from '../../dist/cli/serve.js';

const root = fileURLToPath(new URL('../../', import.meta.url));
const target = Number(process.argv[2] ?? 1e6);
const n = Math.round(Math.sqrt(target / 2));
const np = (n + 1) * (n + 1);
const points = new Float64Array(2 * np);
const vel = new Float64Array(2 * np);
const depth = new Float64Array(np);
let seed = 1;
const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647);
for (let j = 0; j <= n; j++) {
  for (let i = 0; i <= n; i++) {
    const k = j * (n + 1) + i;
    const inner = i > 0 && i < n && j > 0 && j < n ? 0.3 : 0;
    points[2 * k] = 5e5 + 2 * (i + (rnd() - 0.5) * inner); // projected map coordinates
    points[2 * k + 1] = 4e6 + 2 * (j + (rnd() - 0.5) * inner);
    vel[2 * k] = 1 + i / n;
    vel[2 * k + 1] = 0.2;
    depth[k] = 2 + j / n * 10;
  }
}
const nc = 2 * n * n;
const nodes = new Int32Array(3 * nc);
const offsets = new Int32Array(nc + 1);
for (let j = 0, c = 0; j < n; j++) {
  for (let i = 0; i < n; i++) {
    const a = j * (n + 1) + i, b = a + 1, d = a + n + 1, e = d + 1;
    nodes.set([a, b, e, a, e, d], 3 * c);
    offsets[c + 1] = 3 * c + 3;
    offsets[c + 2] = 3 * c + 6;
    c += 2;
  }
}
const mesh = {
  points, nPoints: np, cellOffsets: offsets, cellNodes: nodes, cellTypes: new Uint8Array(nc).fill(5), nCells: nc,
  pointData: [{ name: 'velocity', components: 2, values: vel }, { name: 'depth', components: 1, values: depth }],
  cellData: [], format: 'generated', warnings: [],
};
mkdirSync(`${root}test-output`, { recursive: true });
const file = `${root}test-output/measure-${nc}.vtu`;
writeFileSync(file, writeVtu(mesh, {}, { encoding: 'appended-raw' }));

const server = await startServer({ root: `${root}dist-view`, files: new Map([['/mesh/big.vtu', file]]) });
const browser = await chromium.launch({
  executablePath: process.env.STEPLENS_CHROMIUM ?? '/usr/bin/chromium',
  args: ['--use-angle=swiftshader', '--enable-unsafe-swiftshader', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic'],
});
const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
const t0 = Date.now();
await page.goto(`${server.url}?mesh=mesh/big.vtu&model=shallow-water&depth=depth&velocity=velocity`);
await page.waitForSelector('#app[data-state="ready"], #app[data-state="error"]', { timeout: 300000 });
const wall = Date.now() - t0;
const timings = await page.evaluate(() => window.steplens.timings);
await page.screenshot({ path: `${root}test-output/measure-${nc}.png` });
console.log(`${nc} triangles: state ${await page.getAttribute('#app', 'data-state')}`);
console.log(`first coloured frame ${Math.round(timings.firstFrame)} ms after the load began (${wall} ms after navigation)`);
console.log('stages (ms):', Object.fromEntries(Object.entries(timings.stages).map(([k, v]) => [k, Math.round(v)])));
console.log(`worker, from the request to its reply: ${Math.round(timings.workerMs)} ms`);
await browser.close();
await server.close();
