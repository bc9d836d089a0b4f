/**
 * The built view in headless Chromium (software WebGL): demo meshes load, the numbers agree with
 * the CLI's, the canvas is coloured with the palette, the worst list, threshold, settings,
 * exports and the error panel behave. One browser for the whole file.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { interpolateViridis } from 'd3-scale-chromatic';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Server } from '../../src/cli/serve.js';
import { FIELDS } from '../../src/view/fields.js';
import { decodePng } from './png.js';
import { canvasImage, fractionNear, frames, globalLimit, launch, OUTPUT, requireBuilt, runCli, serveApp, waitReady } from './harness.js';

interface CliSummary {
  limit: { dt: number; cell: number };
  worst: { cell: number }[];
  quantiles: { median: number };
}

const HARBOUR = ['meshes/harbour.vtu', '--model', 'shallow-water', '--depth', 'depth', '--velocity', 'velocity'];
const HARBOUR_QUERY = '?mesh=mesh/harbour.vtu&file=meshes/harbour.vtu&model=shallow-water&depth=depth&velocity=velocity';
const CHANNEL = ['meshes/channel.vtu', '--model', 'advection', '--velocity', 'velocity'];
const CHANNEL_QUERY = '?mesh=mesh/channel.vtu&file=meshes/channel.vtu&model=advection&velocity=velocity';

/** Viridis sampled finely, straight from d3-scale-chromatic (not from our palette code). */
const VIRIDIS: [number, number, number][] = Array.from({ length: 512 }, (_, i) => {
  const hex = interpolateViridis(i / 511);
  const n = parseInt(hex.slice(1), 16);
  return [Math.floor(n / 65536) % 256, Math.floor(n / 256) % 256, n % 256];
});
/** The grey of cells above the threshold: #3c4047, our own choice in src/view/colour.ts. */
const GREY: [number, number, number][] = [[0x3c, 0x40, 0x47]];

let browser: Browser;
let server: Server;
let page: Page;
let harbourCli: CliSummary;
let channelCli: CliSummary;
let harbourCsv: string;
let harbourJson: string;

beforeAll(async () => {
  requireBuilt();
  const csvPath = `${OUTPUT}harbour-cli-cells.csv`;
  const [h, c] = await Promise.all([
    runCli(['audit', ...HARBOUR, '--json', '--cells', csvPath]),
    runCli(['audit', ...CHANNEL, '--json']),
  ]);
  expect(h.code, h.stderr).toBe(0);
  expect(c.code, c.stderr).toBe(0);
  harbourJson = h.stdout;
  harbourCli = JSON.parse(h.stdout) as CliSummary;
  channelCli = JSON.parse(c.stdout) as CliSummary;
  harbourCsv = readFileSync(csvPath, 'utf8');
  server = await serveApp();
  browser = await launch();
  page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
});

afterAll(async () => {
  await browser?.close();
  await server?.close();
});

async function download(p: Page, button: string): Promise<string> {
  const [dl] = await Promise.all([p.waitForEvent('download'), p.click(button)]);
  return readFileSync((await dl.path())!, 'utf8');
}

describe('steplens view in headless Chromium', () => {
  it('loads the harbour demo when no mesh is named, with its shallow-water settings', async () => {
    await page.goto(server.url);
    await waitReady(page);
    expect(await page.textContent('#file-name')).toBe('harbour.vtu');
    // same physics as the CLI run with --model shallow-water --depth depth --velocity velocity
    expect(await globalLimit(page)).toBe(harbourCli.limit.dt);
  });

  it('shows the same global limit as the CLI JSON and the caution', async () => {
    await page.goto(server.url + HARBOUR_QUERY);
    await waitReady(page);
    expect(await globalLimit(page)).toBe(harbourCli.limit.dt);
    expect(await page.textContent('[data-role="caution"]')).toMatch(/necessary, not sufficient/);
    const rows = await page.locator('[data-role="worst-row"]').evaluateAll((els) => els.map((e) => Number(e.getAttribute('data-cell'))));
    expect(rows).toEqual(harbourCli.worst.map((w) => w.cell));
    await page.screenshot({ path: `${OUTPUT}view-harbour.png` });
  });

  it('draws a coloured mesh: the canvas is not blank and holds palette colours', async () => {
    const img = await canvasImage(page, 'canvas-harbour.png');
    const onPalette = fractionNear(img, VIRIDIS, 3);
    expect(onPalette).toBeGreaterThan(0.3);
    // not one flat colour: many distinct palette entries are used
    const used = new Set<number>();
    for (let p = 0; p < img.width * img.height; p += 7) used.add((img.data[4 * p]! << 16) | (img.data[4 * p + 1]! << 8) | img.data[4 * p + 2]!);
    expect(used.size).toBeGreaterThan(50);
  });

  it('clicking the first worst row selects the limiting cell; arrow keys move along the list', async () => {
    await page.locator('[data-role="worst-row"]').first().click();
    await expect.poll(() => page.textContent('[data-role="selected-cell"]')).toBe(String(harbourCli.limit.cell));
    await expect.poll(() => page.locator('#cell-body').textContent()).toMatch(/allowed step/);
    await page.screenshot({ path: `${OUTPUT}view-selected.png` });
    await page.keyboard.press('ArrowDown');
    await expect.poll(() => page.textContent('[data-role="selected-cell"]')).toBe(String(harbourCli.worst[1]!.cell));
  });

  it('hovering a cell shows its read-out', async () => {
    await page.click('#fit-button');
    const box = (await page.locator('#view').boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.55, box.y + box.height * 0.45);
    await page.mouse.move(box.x + box.width * 0.56, box.y + box.height * 0.46);
    await expect.poll(() => page.locator('#tooltip').isVisible()).toBe(true);
    expect(await page.textContent('#tooltip')).toMatch(/cell \d+[\s\S]*h = 2A\/P[\s\S]*allowed step/);
    await page.mouse.move(box.x - 50, box.y + 10);
  });

  it('zooms with the wheel about the pointer and fits back with the F key', async () => {
    await page.click('#fit-button');
    await frames(page);
    const fitted = await canvasImage(page);
    const box = (await page.locator('#view').boundingBox())!;
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    await page.mouse.wheel(0, -600);
    await frames(page);
    const zoomed = await canvasImage(page, 'canvas-zoomed.png');
    let changed = 0;
    for (let i = 0; i < zoomed.data.length; i += 4) if (zoomed.data[i] !== fitted.data[i] || zoomed.data[i + 1] !== fitted.data[i + 1]) changed++;
    expect(changed / (zoomed.width * zoomed.height)).toBeGreaterThan(0.2);
    await page.mouse.move(box.x - 40, box.y + 10); // away, so no read-out covers the view
    await page.focus('#view');
    await page.keyboard.press('f');
    await frames(page);
    const again = await canvasImage(page);
    let same = 0;
    for (let i = 0; i < again.data.length; i += 4) if (again.data[i] === fitted.data[i] && again.data[i + 1] === fitted.data[i + 1]) same++;
    expect(same / (again.width * again.height)).toBeGreaterThan(0.98);
  });

  it('colours the mesh by every field, with a legend for each', async () => {
    await page.click('#fit-button');
    for (const f of FIELDS) {
      await page.selectOption('#field-select', f.id);
      await waitReady(page);
      await frames(page);
      const img = await canvasImage(page, f.id === 'cause' || f.id === 'courant' ? `canvas-field-${f.id}.png` : undefined);
      const background = fractionNear(img, [[0x15, 0x17, 0x1b]], 1);
      expect(background, f.id).toBeLessThan(0.6);
      expect(await page.inputValue('#field-select')).toBe(f.id);
    }
    // the Courant field needed an intended step: the global limit was taken, so the largest is C = 1
    expect(await page.inputValue('#settings-form input[name="dt"]')).toBe(String(harbourCli.limit.dt));
    await page.selectOption('#field-select', 'dt');
    await waitReady(page);
    await page.fill('#settings-form input[name="dt"]', '');
    await page.press('#settings-form input[name="dt"]', 'Enter');
    await waitReady(page);
  });

  it('a threshold greys out the cells whose step is above it', async () => {
    await page.click('#fit-button');
    await frames(page);
    const before = fractionNear(await canvasImage(page), GREY, 2);
    await page.fill('#threshold-input', String(harbourCli.quantiles.median));
    await page.press('#threshold-input', 'Enter');
    await frames(page);
    const img = await canvasImage(page, 'canvas-threshold.png');
    const after = fractionNear(img, GREY, 2);
    expect(before).toBeLessThan(0.01);
    // about half the cells are above the median step; they cover much of the drawing
    expect(after).toBeGreaterThan(0.15);
    await page.screenshot({ path: `${OUTPUT}view-threshold.png` });
    await page.click('#threshold-clear');
    await frames(page);
    expect(fractionNear(await canvasImage(page), GREY, 2)).toBeLessThan(0.01);
  });

  it('exports the same CSV and JSON as the CLI', async () => {
    const csv = await download(page, '#export-csv');
    const json = await download(page, '#export-json');
    writeFileSync(`${OUTPUT}harbour-view-cells.csv`, csv);
    writeFileSync(`${OUTPUT}harbour-view-summary.json`, json);
    // byte for byte: the core computes angles with + − × ÷ only (src/geometry/angle.ts)
    expect(csv === harbourCsv).toBe(true);
    expect(json === harbourJson).toBe(true);
  });

  it('exports a PNG of the view with its legend', async () => {
    const [dl] = await Promise.all([page.waitForEvent('download'), page.click('#export-png')]);
    expect(dl.suggestedFilename()).toBe('harbour-view.png');
    const img = decodePng(new Uint8Array(readFileSync((await dl.path())!)));
    const size = await page.locator('#view').evaluate((c: HTMLCanvasElement) => [c.width, c.height]);
    expect([img.width, img.height]).toEqual(size);
    expect(fractionNear(img, VIRIDIS, 3)).toBeGreaterThan(0.2);
    writeFileSync(`${OUTPUT}export-harbour.png`, readFileSync((await dl.path())!));
    // the legend's colour bar sits in the lower left: a row there runs through the palette
    const row = img.height - 1 - Math.round((12 + 75) * img.width / size[0]!);
    const seen = new Set<number>();
    for (let x = 0; x < Math.min(img.width, 400); x++) {
      const p = 4 * (row * img.width + x);
      const c: [number, number, number] = [img.data[p]!, img.data[p + 1]!, img.data[p + 2]!];
      if (fractionNear({ width: 1, height: 1, data: Uint8Array.from([...c, 255]) }, VIRIDIS, 3) === 1) seen.add(Math.round(c[1] / 16));
    }
    expect(seen.size).toBeGreaterThan(6);
  });

  it('re-runs the audit when the Courant number changes', async () => {
    await page.fill('#settings-form input[name="courant"]', '0.5');
    await page.press('#settings-form input[name="courant"]', 'Enter');
    // dt = C·h/λ is proportional to C
    await expect.poll(() => globalLimit(page)).toBeCloseTo(harbourCli.limit.dt * 0.5, 12);
    await waitReady(page);
    await page.fill('#settings-form input[name="courant"]', '');
    await page.press('#settings-form input[name="courant"]', 'Enter');
    await expect.poll(() => globalLimit(page)).toBe(harbourCli.limit.dt);
  });

  it('takes the Courant number from a time integrator × space operator pair, as the CLI does', async () => {
    const cli = await runCli(['audit', ...HARBOUR, '--time', 'ssp-rk3', '--space', 'upwind2', '--json']);
    expect(cli.code, cli.stderr).toBe(0);
    const expected = JSON.parse(cli.stdout) as CliSummary & { limit: { courant: number; courant_source: string } };
    await page.selectOption('#settings-form select[name="integrator"]', 'ssp-rk3');
    await page.selectOption('#settings-form select[name="space"]', 'upwind2');
    await expect.poll(() => globalLimit(page)).toBe(expected.limit.dt);
    await waitReady(page);
    expect(await page.inputValue('#settings-form input[name="courant"]')).toBe(String(expected.limit.courant));
    expect(await page.textContent('#limit-body')).toContain(expected.limit.courant_source);
    await page.selectOption('#settings-form select[name="integrator"]', '');
    await page.fill('#settings-form input[name="courant"]', '');
    await page.press('#settings-form input[name="courant"]', 'Enter');
    await expect.poll(() => globalLimit(page)).toBe(harbourCli.limit.dt);
  });

  it('a bad file shows the error panel with file and line, and the previous mesh stays usable', async () => {
    const bad = '# vtk DataFile Version 3.0\nbroken on purpose\nASCII\nDATASET UNSTRUCTURED_GRID\nPOINTS 3 double\n0 0 0 1 0 zero 0 1 0\nCELLS 1 4\n3 0 1 2\nCELL_TYPES 1\n5\n';
    await page.setInputFiles('#file-input', { name: 'broken.vtk', mimeType: 'application/octet-stream', buffer: Buffer.from(bad) });
    await page.waitForSelector('#app[data-state="error"]');
    const panel = page.locator('[data-role="error-panel"]');
    expect(await panel.isVisible()).toBe(true);
    const text = (await panel.textContent())!;
    expect(text).toContain('broken.vtk');
    expect(text).toMatch(/line\s*6/);
    expect(text).toContain('harbour.vtu is still loaded');
    await page.screenshot({ path: `${OUTPUT}view-error.png` });
    expect(await globalLimit(page)).toBe(harbourCli.limit.dt);
    await page.locator('[data-role="worst-row"]').nth(2).click();
    await expect.poll(() => page.textContent('[data-role="selected-cell"]')).toBe(String(harbourCli.worst[2]!.cell));
    await page.click('#error-dismiss');
    expect(await page.getAttribute('#app', 'data-state')).toBe('ready');
  });

  it('a large load can be cancelled; the previous mesh comes back', async () => {
    // a 600 × 600 grid split into 720 000 triangles, ASCII legacy VTK: seconds of work in the worker
    const n = 600;
    const parts: string[] = [`# vtk DataFile Version 4.2\nlarge grid\nASCII\nDATASET UNSTRUCTURED_GRID\nPOINTS ${(n + 1) ** 2} double\n`];
    for (let j = 0; j <= n; j++) for (let i = 0; i <= n; i++) parts.push(`${i} ${j} 0\n`);
    parts.push(`CELLS ${2 * n * n} ${8 * n * n}\n`);
    for (let j = 0; j < n; j++) for (let i = 0; i < n; i++) {
      const a = j * (n + 1) + i;
      parts.push(`3 ${a} ${a + 1} ${a + n + 2}\n3 ${a} ${a + n + 2} ${a + n + 1}\n`);
    }
    parts.push(`CELL_TYPES ${2 * n * n}\n${'5\n'.repeat(2 * n * n)}`);
    await page.setInputFiles('#file-input', { name: 'large.vtk', mimeType: 'application/octet-stream', buffer: Buffer.from(parts.join('')) });
    await page.waitForSelector('#progress-stage:has-text("Reading large.vtk")');
    await page.click('[data-role="cancel-load"]');
    await page.waitForSelector('#app[data-state="ready"]');
    expect(await page.textContent('#file-name')).toBe('harbour.vtu');
    expect(await globalLimit(page)).toBe(harbourCli.limit.dt);
    expect(await page.isVisible('[data-role="error-panel"]')).toBe(false);
  });

  it('takes a dropped Triangle .node and .ele pair', async () => {
    // a unit square cut into two right triangles, no arrays: the view assumes λ = 1 m/s,
    // so dt = h = 2A/P = 1 / (2 + √2) s for both (legs 1, hypotenuse √2)
    const node = '# square\n4 2 0 0\n1 0 0\n2 1 0\n3 1 1\n4 0 1\n';
    const ele = '2 3 0\n1 1 2 3\n2 1 3 4\n';
    const transfer = await page.evaluateHandle(([n, e]) => {
      const dt = new DataTransfer();
      dt.items.add(new File([n!], 'square.node'));
      dt.items.add(new File([e!], 'square.ele'));
      return dt;
    }, [node, ele]);
    await page.dispatchEvent('#app', 'drop', { dataTransfer: transfer });
    await expect.poll(() => page.textContent('#file-name')).toBe('square.node');
    await waitReady(page);
    expect(await globalLimit(page)).toBeCloseTo(1 / (2 + Math.SQRT2), 14);
    expect(await page.textContent('#limit-body')).toMatch(/λ = 1 m\/s is assumed/);
  });

  it('refuses a mesh address on another origin', async () => {
    await page.goto(`${server.url}?mesh=${encodeURIComponent('http://example.org/x.vtu')}`);
    await page.waitForSelector('#app[data-state="error"]');
    expect(await page.textContent('[data-role="error-panel"]')).toMatch(/only meshes from this server/);
  });

  it('loads the channel demo (triangles and quads) with the CLI limit and palette colours', async () => {
    await page.goto(server.url + CHANNEL_QUERY);
    await waitReady(page);
    expect(await globalLimit(page)).toBe(channelCli.limit.dt);
    await page.locator('[data-role="worst-row"]').first().click();
    await expect.poll(() => page.textContent('[data-role="selected-cell"]')).toBe(String(channelCli.limit.cell));
    await page.click('#fit-button');
    await frames(page);
    const img = await canvasImage(page, 'canvas-channel.png');
    // the channel is long and thin: compare with the pixels the mesh covers, not the whole canvas
    const background = fractionNear(img, [[0x15, 0x17, 0x1b]], 1);
    expect(background).toBeLessThan(0.95);
    expect(fractionNear(img, VIRIDIS, 3) / (1 - background)).toBeGreaterThan(0.3);
    await page.screenshot({ path: `${OUTPUT}view-channel.png` });
  });
});
