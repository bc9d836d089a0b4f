/**
 * The app: wires the worker (reading, audit), the GPU scene and the panels together.
 * State lives here; panels only draw what they are given.
 */
import Flatbush from 'flatbush';
import type { AuditOptions } from '../audit/audit.js';
import { cellThickness, centredPoints, logHistogram, markedCells, type LogHistogram } from './analysis.js';
import { cellBox } from './cellbox.js';
import { CAUSE_COLOURS, PALETTES, SPECIAL, categoryBytes, paletteBytes, sanitizeRange, type PaletteName, type Range } from './colour.js';
import { byId, download, el, facts } from './dom.js';
import { FIELDS, fieldDef, isFieldId, type FieldId } from './fields.js';
import { LoadError, nameOfUrl, readFiles, sameOriginUrl } from './load.js';
import { DEMO, optionsFromQuery } from './options.js';
import { placeTooltip, renderCellPanel, renderTooltip } from './panels/cell.js';
import { HistogramView } from './panels/histogram.js';
import { drawLegend, type LegendSpec } from './panels/legend.js';
import { viewPicture } from './panels/picture.js';
import { renderLimitPanel } from './panels/limit.js';
import { SettingsPanel, type SchemeCatalogue } from './panels/settings.js';
import { WorstList } from './panels/worst.js';
import { pickCell } from './pick.js';
import type { AuditPayload, ErrorPayload, FieldPayload, MeshPayload, MeshSource, Reply } from './protocol.js';
import { attachControls } from './scene/controls.js';
import { MeshScene } from './scene/scene.js';
import { CancelledError, WorkerClient, WorkerError, type RequestBody } from './worker-client.js';

type State = 'loading' | 'ready' | 'error';

/** Most marker rings drawn at once (the smallest steps win). */
const MARK_CAP = 2000;
/** Marker ring radius in CSS pixels, for clicking on a ring. */
const RING_HIT_PX = 8;

/** Milliseconds from the start of a load (for measurements; not shown). */
export interface Timings {
  loadStart: number;
  firstFrame: number | null;
  workerMs: number | null;
  stages: Record<string, number>;
}

export class App {
  private readonly root = byId('app');
  private readonly scene: MeshScene;
  private readonly worker: WorkerClient;
  private mesh: MeshPayload | null = null;
  private index: Flatbush | null = null;
  private audit: AuditPayload | null = null;
  private field: FieldPayload | null = null;
  private fieldId: FieldId = 'dt';
  private range: Range = { lo: 1e-3, hi: 1 };
  private rangeAuto = true;
  private palette: PaletteName = 'viridis';
  private threshold: number | null = null;
  private markOn = true;
  private markFactor = 1.5;
  private marked: Int32Array = new Int32Array(0);
  private selected = -1;
  private note: string | null = null;
  private hoverSeq = 0;
  private hoverCell = -1;
  private busy = 0;
  private hist: LogHistogram | null = null;
  private histogramPending = false;
  private readonly worst: WorstList;
  private readonly histogram: HistogramView;
  private readonly settings: SettingsPanel;
  /** Exposed for tests and measurements (window.steplens). */
  readonly timings: Timings = { loadStart: 0, firstFrame: null, workerMs: null, stages: {} };

  private readonly firstLoad: Promise<void>;
  /** The last mesh shown, to load again after a cancelled load (the new worker holds none). */
  private lastGood: { source: 'url'; url: string; label: string } | { source: 'files'; files: File[] } | null = null;
  /** Bumped by every cancel: work started before it stops at its next step. */
  private cancelGen = 0;

  constructor(catalogue: SchemeCatalogue | null) {
    this.worker = new WorkerClient((stage, fraction) => this.showProgress(stage, fraction), (e) => this.showError(e));
    // the worker starts downloading and reading the first mesh while WebGL starts up here
    this.firstLoad = this.loadFirst();
    this.scene = new MeshScene(byId<HTMLCanvasElement>('view'));
    this.worst = new WorstList(byId<HTMLOListElement>('worst-list'), (cell) => this.select(cell, true));
    this.histogram = new HistogramView(byId<HTMLCanvasElement>('histogram'), (dt) => this.setThreshold(dt));
    this.settings = new SettingsPanel(byId<HTMLFormElement>('settings-form'), catalogue, (o) => void this.reaudit(o));
    this.wireControls();
    renderCellPanel(byId('cell-body'), byId('selected-cell'), null);
  }

  /** Resolves when the first mesh (named by ?mesh=, or the demo) is shown or has failed. */
  start(): Promise<void> {
    return this.firstLoad;
  }

  private call(body: RequestBody, transfer: Transferable[] = []): Promise<Reply> {
    return this.worker.call(body, transfer);
  }

  // ---- state and feedback ---------------------------------------------------------------

  private setState(s: State): void {
    this.root.dataset.state = s;
  }

  private showProgress(stage: string, fraction: number | null): void {
    byId('progress').hidden = false;
    byId('progress-stage').textContent = stage;
    const bar = byId('progress-bar');
    bar.classList.toggle('indeterminate', fraction === null);
    bar.style.width = fraction === null ? '' : `${Math.round(fraction * 100)}%`;
  }

  private hideProgress(): void {
    byId('progress').hidden = true;
  }

  private showError(e: ErrorPayload): void {
    this.hideProgress();
    const rows: [string, string][] = [];
    if (e.file !== undefined) rows.push(['file', e.file]);
    if (e.line !== undefined) rows.push(['line', String(e.line)]);
    if (e.byteOffset !== undefined) rows.push(['byte offset', String(e.byteOffset)]);
    rows.push(['problem', e.detail]);
    if (e.stack) rows.push(['where', e.stack.split('\n').slice(1, 4).join('\n')]);
    if (e.kind === 'internal') console.error(e.stack ?? e.message);
    byId('error-title').textContent = e.kind === 'input' ? 'The file could not be read'
      : e.kind === 'usage' ? 'These settings do not fit the file' : 'Something went wrong';
    const dl = byId('error-facts');
    dl.replaceWith(Object.assign(facts(rows), { id: 'error-facts' }));
    byId('error-keep').textContent = this.mesh ? `${this.mesh.name} is still loaded.` : '';
    byId('error-panel').dataset.kind = e.kind;
    byId('error-panel').hidden = false;
    this.setState('error');
  }

  /** Hide the error panel; `onlyKind`: only when it shows that kind of error. */
  private hideError(onlyKind?: ErrorPayload['kind']): void {
    const panel = byId('error-panel');
    if (onlyKind !== undefined && panel.dataset.kind !== onlyKind) return;
    panel.hidden = true;
    if (this.root.dataset.state === 'error' && this.mesh) this.setState('ready');
  }

  private fail(e: unknown): void {
    if (e instanceof CancelledError) return;
    if (e instanceof WorkerError) this.showError(e.payload);
    else if (e instanceof LoadError) this.showError({ kind: 'input', detail: e.message, message: e.message });
    else {
      const msg = e instanceof Error ? e.message : String(e);
      this.showError({ kind: 'internal', detail: msg, message: msg });
    }
  }

  private async withBusy<T>(work: () => Promise<T>): Promise<T | undefined> {
    this.busy++;
    this.setState('loading');
    try {
      const r = await work();
      return r;
    } catch (e) {
      this.fail(e);
      return undefined;
    } finally {
      this.busy--;
      this.hideProgress();
      // nothing drawn (an error, or no change): leave the loading state now
      if (this.busy === 0 && this.root.dataset.state === 'loading' && !this.scene.onFrame) {
        this.setState(byId('error-panel').hidden ? (this.mesh ? 'ready' : 'loading') : 'error');
      }
    }
  }

  /** Set `ready` once the next frame has been drawn. */
  private readyAfterFrame(): void {
    const asked = performance.now();
    this.scene.onFrame = () => {
      this.scene.onFrame = null;
      this.timings.stages.frame = performance.now() - asked;
      if (this.timings.firstFrame === null) this.timings.firstFrame = performance.now() - this.timings.loadStart;
      if (this.busy === 0) this.setState(byId('error-panel').hidden ? 'ready' : 'error');
    };
    this.scene.requestRender();
  }

  // ---- loading --------------------------------------------------------------------------

  private loadFirst(): Promise<void> {
    const q = new URLSearchParams(location.search);
    const meshParam = q.get('mesh');
    const field = q.get('field');
    if (field && isFieldId(field)) this.fieldId = field;
    byId<HTMLSelectElement>('field-select').value = this.fieldId;
    if (meshParam) return this.loadUrl(meshParam, optionsFromQuery(q), q.get('file'));
    return this.loadUrl(DEMO.url, DEMO.options, null);
  }

  /** Load a same-origin URL (the worker fetches it); `options` null: chosen from its arrays. */
  async loadUrl(url: string, options: AuditOptions | null, fileLabel: string | null): Promise<void> {
    await this.withBusy(async () => {
      this.timings.loadStart = performance.now();
      this.timings.firstFrame = null;
      this.showProgress('Downloading', null);
      const u = sameOriginUrl(url, location.href);
      const label = fileLabel ?? nameOfUrl(u);
      if (await this.loadFrom({ kind: 'url', url: u.href }, [], options, label)) this.lastGood = { source: 'url', url: u.href, label };
    });
  }

  async loadFiles(list: FileList | File[]): Promise<void> {
    await this.withBusy(async () => {
      this.timings.loadStart = performance.now();
      this.timings.firstFrame = null;
      this.showProgress('Reading the file', null);
      const files = Array.from(list);
      const gen = this.cancelGen;
      const got = await readFiles(files);
      if (gen !== this.cancelGen) return;
      if (await this.loadFrom({ kind: 'files', ...got }, got.files.map((f) => f.bytes), null, got.primary)) this.lastGood = { source: 'files', files };
    });
  }

  /** True when the mesh was loaded and shown. */
  private async loadFrom(source: MeshSource, transfer: Transferable[], options: AuditOptions | null, fileLabel: string): Promise<boolean> {
    const reply = await this.call(
      { kind: 'load', source, options: { ...(options ?? {}), file: fileLabel }, auto: options === null, field: this.fieldId },
      transfer,
    );
    if (reply.kind !== 'loaded') return false;
    const received = performance.now() - this.timings.loadStart;
    this.hideError();
    this.timings.workerMs = reply.ms;
    this.note = reply.note;
    this.installMesh(reply.mesh);
    this.applyAudit(reply.audit);
    this.settings.render(reply.mesh.arrays, reply.audit.options);
    this.timings.stages = { ...this.timings.stages, ...reply.stages, received, installed: performance.now() - this.timings.loadStart };
    this.readyAfterFrame();
    void this.loadExtras();
    return true;
  }

  /**
   * Cancel the load or audit under way: the worker is replaced, and the mesh that was shown
   * before (if any) is loaded into the new worker again with the settings it had.
   */
  private async cancelWork(): Promise<void> {
    this.cancelGen++;
    this.worker.restart();
    this.hideProgress();
    const prev = this.lastGood;
    const options = this.audit?.options ?? null;
    if (!prev) {
      this.showError({ kind: 'usage', detail: 'loading was cancelled; open a mesh to start again', message: 'cancelled' });
      return;
    }
    await this.withBusy(async () => {
      this.showProgress('Restoring the previous mesh', null);
      if (prev.source === 'url') await this.loadFrom({ kind: 'url', url: prev.url }, [], options, prev.label);
      else {
        const got = await readFiles(prev.files);
        await this.loadFrom({ kind: 'files', ...got }, got.files.map((f) => f.bytes), options, got.primary);
      }
    });
  }

  private installMesh(m: MeshPayload): void {
    this.mesh = m;
    this.index = null;
    this.selected = -1;
    this.hoverCell = -1;
    this.rangeAuto = true;
    this.scene.setMesh(m.positions, m.cellIds, m.nCells);
    this.fit();
    byId('file-name').textContent = m.name;
    byId('file-name').title = `${m.name} · ${m.format}`;
    renderCellPanel(byId('cell-body'), byId('selected-cell'), null);
    renderTooltip(byId('tooltip'), null, 0, 0);
  }

  /** After the first frame: the picking index, then the edges (neither is needed to see the mesh). */
  private async loadExtras(): Promise<void> {
    const mesh = this.mesh;
    try {
      const r = await this.call({ kind: 'index' });
      if (r.kind === 'index' && this.mesh === mesh) this.index = Flatbush.from(r.index);
      const e = await this.call({ kind: 'edges' });
      if (e.kind === 'edges' && this.mesh === mesh) this.scene.setEdges(e.positions, e.lengths);
    } catch (e) {
      this.fail(e);
    }
  }

  private async reaudit(options: AuditOptions): Promise<void> {
    if (!this.mesh) return;
    const file = this.audit?.options.file;
    await this.withBusy(async () => {
      this.showProgress('Auditing', null);
      const r = await this.call({ kind: 'audit', options: { ...options, ...(file !== undefined ? { file } : {}) }, field: this.fieldId });
      if (r.kind !== 'audited') return;
      const t0 = performance.now();
      this.hideError('usage');
      this.note = null;
      this.applyAudit(r.audit);
      this.timings.stages = { reaudit: r.ms, applied: performance.now() - t0 };
      this.readyAfterFrame();
    });
  }

  // ---- audit results and colouring ------------------------------------------------------

  private applyAudit(a: AuditPayload): void {
    const mesh = this.mesh!;
    this.audit = a;
    this.hist = null;
    this.scene.setDt(a.dt);
    this.setField(a.field);
    renderLimitPanel(byId('limit-body'), a.summary, mesh, this.note ? [this.note] : [], (cell) => this.select(cell, true));
    this.worst.render(a.summary.worst);
    this.updateMarks();
    if (this.selected >= 0) this.select(this.selected, false);
  }

  private setField(f: FieldPayload): void {
    this.field = f;
    this.fieldId = f.field;
    byId<HTMLSelectElement>('field-select').value = f.field;
    this.scene.setValues(f.values);
    if (this.rangeAuto) this.range = sanitizeRange(fieldDef(f.field).scale, f.min, f.max);
    this.updateColours();
  }

  private async changeField(id: FieldId): Promise<void> {
    if (!this.audit) return;
    if (id === 'courant' && !this.audit.hasCourant) {
      // a Courant number needs a step: take the global limit as the intended one
      const lim = this.audit.summary.limit.dt;
      if (lim === null) return;
      this.fieldId = id;
      this.rangeAuto = true;
      await this.reaudit({ ...this.audit.options, dt: lim });
      this.settings.render(this.mesh!.arrays, this.audit.options);
      return;
    }
    await this.withBusy(async () => {
      const r = await this.call({ kind: 'field', field: id });
      if (r.kind !== 'field') return;
      this.rangeAuto = true;
      this.setField(r.field);
      this.readyAfterFrame();
    });
  }

  private legendSpec(): LegendSpec {
    const def = fieldDef(this.fieldId);
    const swatches: LegendSpec['swatches'] = [];
    if (def.scale !== 'category') {
      if (this.fieldId === 'dt') swatches.push({ label: 'no limit', colour: SPECIAL.noLimit }, { label: 'zero (degenerate)', colour: SPECIAL.zero });
      else if (def.scale === 'log') swatches.push({ label: 'zero', colour: SPECIAL.zero });
    }
    if (this.threshold !== null) swatches.push({ label: 'step above threshold', colour: SPECIAL.greyed });
    if (this.markOn && this.marked.length > 0) swatches.push({ label: `step ≤ ${this.markFactor}× limit`, colour: SPECIAL.marker, ring: true });
    return {
      title: def.label, unit: def.unit, kind: def.scale, range: this.range,
      palette: paletteBytes(this.palette, def.emphasis === 'low'), swatches,
    };
  }

  private updateColours(): void {
    const def = fieldDef(this.fieldId);
    const spec = this.legendSpec();
    this.scene.setScale(def.scale, this.range);
    this.scene.setPalette(spec.palette);
    this.scene.setCategories(categoryBytes(CAUSE_COLOURS));
    drawLegend(byId<HTMLCanvasElement>('legend-canvas'), spec);
    const lo = byId<HTMLInputElement>('range-lo');
    const hi = byId<HTMLInputElement>('range-hi');
    const rangeRow = lo.closest('.range') as HTMLElement;
    rangeRow.hidden = def.scale === 'category';
    lo.value = String(Number(this.range.lo.toPrecision(4)));
    hi.value = String(Number(this.range.hi.toPrecision(4)));
    this.drawHistogram();
  }

  /** Redraw the histogram after the next frame (binning a million steps should not delay it). */
  private drawHistogram(): void {
    if (this.histogramPending) return;
    this.histogramPending = true;
    requestAnimationFrame(() => setTimeout(() => {
      this.histogramPending = false;
      if (!this.audit) return;
      this.hist ??= logHistogram(this.audit.dt, 48);
      const lim = this.audit.summary.limit.dt;
      const pal = paletteBytes(this.palette, true);
      this.histogram.draw(this.hist, {
        limit: lim,
        markBound: this.markOn && lim !== null ? lim * this.markFactor : null,
        threshold: this.threshold,
        colourAt: (t) => {
          const k = Math.min(255, Math.max(0, Math.round(t * 255)));
          return `rgb(${pal[4 * k]}, ${pal[4 * k + 1]}, ${pal[4 * k + 2]})`;
        },
      });
    }, 0));
  }

  private setThreshold(t: number | null): void {
    this.threshold = t !== null && t > 0 && Number.isFinite(t) ? t : null;
    byId<HTMLInputElement>('threshold-input').value = this.threshold === null ? '' : String(Number(this.threshold.toPrecision(4)));
    this.scene.setThreshold(this.threshold);
    this.updateColours();
  }

  private updateMarks(): void {
    const a = this.audit;
    const m = this.mesh;
    const lim = a?.summary.limit.dt ?? null;
    const marked = a && m && this.markOn ? markedCells(a.dt, lim, this.markFactor, MARK_CAP) : { cells: new Int32Array(0), total: 0 };
    this.marked = marked.cells;
    this.scene.setMarks(
      this.markOn && lim !== null ? lim * this.markFactor : null,
      m ? centredPoints(m.centroids, this.marked, m.centerX, m.centerY) : new Float32Array(0),
      m ? cellThickness(m.points, m.cellOffsets, m.cellNodes, this.marked) : new Float32Array(0),
    );
    const count = marked.total.toLocaleString('en-US');
    byId('mark-count').textContent = !this.markOn || !a ? ''
      : marked.total > MARK_CAP ? `${count} cells (rings on the ${MARK_CAP.toLocaleString('en-US')} smallest)` : `${count} cells`;
    this.updateColours();
  }

  // ---- selection and picking ------------------------------------------------------------

  private fit(): void {
    const m = this.mesh;
    if (!m) return;
    this.scene.viewport.fit(m.minX - m.centerX, m.minY - m.centerY, m.maxX - m.centerX, m.maxY - m.centerY);
    this.scene.requestRender();
  }

  private cellOutline(cell: number): { outline: Float32Array; size: number } {
    const m = this.mesh!;
    const s = m.cellOffsets[cell]!, e = m.cellOffsets[cell + 1]!;
    const outline = new Float32Array((e - s) * 2);
    for (let k = s; k < e; k++) {
      const v = m.cellNodes[k]!;
      outline[2 * (k - s)] = m.points[2 * v]! - m.centerX;
      outline[2 * (k - s) + 1] = m.points[2 * v + 1]! - m.centerY;
    }
    const [minX, minY, maxX, maxY] = cellBox(m.points, m.cellOffsets, m.cellNodes, cell, new Float64Array(4));
    return { outline, size: Math.max(maxX! - minX!, maxY! - minY!) };
  }

  /** Select a cell (-1: none); `zoom` centres the view on it with its neighbourhood in sight. */
  select(cell: number, zoom: boolean): void {
    const m = this.mesh;
    if (!m || cell >= m.nCells) return;
    this.selected = cell;
    this.worst.highlight(cell);
    if (cell < 0) {
      this.scene.setSelected(-1, null, 0, 0);
      renderCellPanel(byId('cell-body'), byId('selected-cell'), null);
      return;
    }
    const { outline, size } = this.cellOutline(cell);
    const cx = m.centroids[2 * cell]! - m.centerX;
    const cy = m.centroids[2 * cell + 1]! - m.centerY;
    this.scene.setSelected(cell, outline, cx, cy);
    if (zoom) {
      const extent = Math.max(m.maxX - m.minX, m.maxY - m.minY);
      this.scene.viewport.focus(cx, cy, Math.min(Math.max(size * 14, extent * 1e-6), extent * 1.1));
      this.scene.requestRender();
    }
    byId('selected-cell').textContent = String(cell);
    byId('selected-cell').dataset.cell = String(cell);
    void this.call({ kind: 'cell', cell }).then((r) => {
      if (r.kind === 'cell' && this.selected === cell) renderCellPanel(byId('cell-body'), byId('selected-cell'), r.info);
    }).catch((e) => this.fail(e));
  }

  /** The cell under a canvas point: a marker ring first (tiny marked cells), then the cell itself. */
  private cellAt(px: number, py: number, rings: boolean): number {
    const m = this.mesh;
    if (!m || !this.index) return -1;
    const vp = this.scene.viewport;
    if (rings) {
      let best = -1, bestD = RING_HIT_PX;
      for (let k = 0; k < this.marked.length; k++) {
        const c = this.marked[k]!;
        const [sx, sy] = vp.toScreen(m.centroids[2 * c]! - m.centerX, m.centroids[2 * c + 1]! - m.centerY);
        const d = Math.hypot(sx - px, sy - py);
        if (d < bestD) { bestD = d; best = c; }
      }
      if (best >= 0) return best;
    }
    const [x, y] = vp.toModel(px, py);
    return pickCell(this.index, m, x + m.centerX, y + m.centerY);
  }

  private hover(px: number, py: number): void {
    const cell = this.cellAt(px, py, false);
    const tip = byId('tooltip');
    if (cell === this.hoverCell) {
      if (!tip.hidden) placeTooltip(tip, px, py);
      return;
    }
    this.hoverCell = cell;
    if (cell < 0) { renderTooltip(tip, null, 0, 0); return; }
    const mySeq = ++this.hoverSeq;
    void this.call({ kind: 'cell', cell }).then((r) => {
      if (r.kind === 'cell' && mySeq === this.hoverSeq) renderTooltip(tip, r.info, px, py);
    }).catch(() => renderTooltip(tip, null, 0, 0));
  }

  // ---- exports --------------------------------------------------------------------------

  private stem(): string {
    return (this.mesh?.name ?? 'mesh').replace(/\.[^.]*$/, '');
  }

  private async exportText(what: 'csv' | 'json'): Promise<void> {
    if (!this.mesh) return;
    try {
      const r = await this.call({ kind: 'export', what });
      if (r.kind !== 'export') return;
      const type = what === 'csv' ? 'text/csv' : 'application/json';
      download(`${this.stem()}-${what === 'csv' ? 'cells.csv' : 'summary.json'}`, new Blob(r.parts as BlobPart[], { type }));
    } catch (e) {
      this.fail(e);
    }
  }

  /** The view as drawn plus its legend, as a PNG. */
  private async exportPng(): Promise<void> {
    if (!this.mesh) return;
    this.scene.render();
    const lim = this.audit?.summary.limit.dt;
    const title = `${this.mesh.name} · largest stable step ${lim === null || lim === undefined ? 'none' : `${lim} s`}`;
    const blob = await viewPicture(this.scene.canvas, this.legendSpec(), title);
    if (blob) download(`${this.stem()}-view.png`, blob);
  }

  // ---- DOM wiring -----------------------------------------------------------------------

  private wireControls(): void {
    byId('progress-cancel').addEventListener('click', () => void this.cancelWork());
    this.wireInputs();
    this.wireColourControls();
    this.wireView();
    byId('export-csv').addEventListener('click', () => void this.exportText('csv'));
    byId('export-json').addEventListener('click', () => void this.exportText('json'));
    byId('export-png').addEventListener('click', () => void this.exportPng());
  }

  /** Toolbar, file picker, drag and drop, the error panel. */
  private wireInputs(): void {
    const fieldSelect = byId<HTMLSelectElement>('field-select');
    for (const f of FIELDS) fieldSelect.append(el('option', { value: f.id, text: f.label }));
    fieldSelect.addEventListener('change', () => { if (isFieldId(fieldSelect.value)) void this.changeField(fieldSelect.value); });
    const paletteSelect = byId<HTMLSelectElement>('palette-select');
    for (const p of Object.keys(PALETTES)) paletteSelect.append(el('option', { value: p, text: p }));
    paletteSelect.addEventListener('change', () => { this.palette = paletteSelect.value as PaletteName; this.updateColours(); });
    byId('fit-button').addEventListener('click', () => this.fit());

    const fileInput = byId<HTMLInputElement>('file-input');
    fileInput.addEventListener('change', () => {
      if (fileInput.files && fileInput.files.length) void this.loadFiles(fileInput.files).then(() => { fileInput.value = ''; });
    });
    const hint = byId('drop-hint');
    this.root.addEventListener('dragover', (e) => { e.preventDefault(); hint.hidden = false; });
    this.root.addEventListener('dragleave', (e) => { if (e.target === this.root || e.target === hint) hint.hidden = true; });
    this.root.addEventListener('drop', (e) => {
      e.preventDefault();
      hint.hidden = true;
      const files = e.dataTransfer?.files;
      if (files && files.length) void this.loadFiles(files);
    });
    byId('error-dismiss').addEventListener('click', () => this.hideError());
  }

  /** Colour range, threshold and marks. */
  private wireColourControls(): void {
    const lo = byId<HTMLInputElement>('range-lo');
    const hi = byId<HTMLInputElement>('range-hi');
    const setRange = () => {
      const a = Number(lo.value), b = Number(hi.value);
      const kind = fieldDef(this.fieldId).scale;
      if (!(Number.isFinite(a) && Number.isFinite(b) && b > a && (kind !== 'log' || a > 0))) {
        lo.classList.add('invalid');
        hi.classList.add('invalid');
        return;
      }
      lo.classList.remove('invalid');
      hi.classList.remove('invalid');
      this.rangeAuto = false;
      this.range = { lo: a, hi: b };
      this.updateColours();
    };
    lo.addEventListener('change', setRange);
    hi.addEventListener('change', setRange);
    byId('range-auto').addEventListener('click', () => {
      this.rangeAuto = true;
      if (this.field) this.setField(this.field);
    });

    const thr = byId<HTMLInputElement>('threshold-input');
    thr.addEventListener('change', () => {
      const v = thr.value.trim() === '' ? null : Number(thr.value);
      thr.classList.toggle('invalid', v !== null && !(v > 0));
      if (v === null || v > 0) this.setThreshold(v);
    });
    byId('threshold-clear').addEventListener('click', () => this.setThreshold(null));
    const markToggle = byId<HTMLInputElement>('mark-toggle');
    const markFactor = byId<HTMLInputElement>('mark-factor');
    markToggle.addEventListener('change', () => { this.markOn = markToggle.checked; this.updateMarks(); });
    markFactor.addEventListener('change', () => {
      const f = Number(markFactor.value);
      markFactor.classList.toggle('invalid', !(f >= 1));
      if (f >= 1) { this.markFactor = f; this.updateMarks(); }
    });
  }

  /** Pointer, wheel, touch and keys on the canvas; the canvas follows its container's size. */
  private wireView(): void {
    const canvas = this.scene.canvas;
    const stage = byId('stage');
    let hoverAt: { x: number; y: number } | null = null;
    let hoverFrame = 0;
    attachControls(canvas, this.scene.viewport, {
      changed: () => this.scene.requestRender(),
      hover: (x, y) => {
        hoverAt = { x, y };
        if (!hoverFrame) hoverFrame = requestAnimationFrame(() => { hoverFrame = 0; if (hoverAt) this.hover(hoverAt.x, hoverAt.y); });
      },
      leave: () => { hoverAt = null; this.hoverCell = -1; renderTooltip(byId('tooltip'), null, 0, 0); },
      click: (x, y) => { canvas.focus({ preventScroll: true }); this.select(this.cellAt(x, y, this.markOn), false); },
    });
    canvas.addEventListener('keydown', (e) => {
      const vp = this.scene.viewport;
      if (e.key === 'f' || e.key === 'F') this.fit();
      else if (e.key === '+' || e.key === '=') { vp.zoomAt(vp.width / 2, vp.height / 2, 1.5); this.scene.requestRender(); }
      else if (e.key === '-') { vp.zoomAt(vp.width / 2, vp.height / 2, 1 / 1.5); this.scene.requestRender(); }
      else if (e.key === 'Escape') this.select(-1, false);
    });
    let fitted = false;
    new ResizeObserver(() => {
      const r = stage.getBoundingClientRect();
      this.scene.resize(r.width, r.height);
      if (!fitted && this.mesh) { fitted = true; this.fit(); }
      this.drawHistogram();
    }).observe(stage);
  }
}
