/// <reference lib="webworker" />
/**
 * The worker: reads the mesh and runs the audit with the same core as the CLI, keeps both, and
 * answers the app with transferred typed arrays. A failed load leaves the previous mesh in place.
 */
import { runAudit, type AuditOptions, type AuditResult } from '../../audit/audit.js';
import { buildPlan, type Plan } from '../../audit/plan.js';
import { cellsCsvBytes } from '../../io/csv.js';
import { toJson } from '../../io/format.js';
import { readMesh } from '../../mesh/read.js';
import type { FieldId } from '../fields.js';
import { fetchMesh } from '../load.js';
import { autoOptions } from '../options.js';
import { errorPayload } from './error.js';
import type { AuditPayload, FileBytes, MeshPayload, Reply, Request } from '../protocol.js';
import { cellIndex, countQuads, interleave, renderBuffers, uniqueEdges, usedBounds } from './buffers.js';
import { cellInfo, fieldPayload } from './results.js';

const scope = self as unknown as DedicatedWorkerGlobalScope;

let current: AuditResult | null = null;
let currentPlan: Plan | null = null;
let currentCenter = { x: 0, y: 0 };

function post(reply: Reply, transfer: Transferable[] = []): void {
  scope.postMessage(reply, transfer);
}

function baseName(name: string): string {
  return name.replace(/^.*[\\/]/, '');
}

function findFile(files: FileBytes[], name: string): FileBytes | undefined {
  const want = baseName(name);
  return files.find((f) => baseName(f.name) === want)
    ?? files.find((f) => baseName(f.name).toLowerCase() === want.toLowerCase());
}

function auditPayload(result: AuditResult, options: AuditOptions, field: FieldId): { payload: AuditPayload; transfer: Transferable[] } {
  const dt = result.dt.slice();
  const fp = fieldPayload(result, field);
  return {
    payload: { summary: result.summary, options, dt, hasCourant: result.courantAtDt !== null, field: fp },
    transfer: [dt.buffer, fp.values.buffer],
  };
}

async function load(req: Extract<Request, { kind: 'load' }>): Promise<void> {
  const t0 = performance.now();
  const stages: Record<string, number> = {};
  let src = req.source;
  if (src.kind === 'url') {
    const got = await fetchMesh(src.url, src.url, (n, total) => {
      post({ kind: 'progress', seq: req.seq, stage: `Downloading ${(n / 1e6).toFixed(1)} MB`, fraction: total ? n / total : null });
    });
    src = { kind: 'files', ...got };
    stages.download = performance.now() - t0;
  }
  const files = src.files;
  const primary = findFile(files, src.primary);
  if (!primary) throw new Error(`no file named ${src.primary} was given`);
  post({ kind: 'progress', seq: req.seq, stage: `Reading ${primary.name}`, fraction: null });
  const t1 = performance.now();
  const mesh = readMesh(new Uint8Array(primary.bytes), primary.name, {
    loadSibling: (name) => {
      const f = findFile(files, name);
      return f ? new Uint8Array(f.bytes) : null;
    },
  });
  stages.read = performance.now() - t1;
  post({ kind: 'progress', seq: req.seq, stage: `Auditing ${mesh.nCells.toLocaleString('en-US')} cells`, fraction: null });
  const t2 = performance.now();
  let options = req.options;
  let note: string | null = null;
  if (req.auto) {
    const auto = autoOptions([...mesh.pointData, ...mesh.cellData]);
    options = { ...auto.options, ...(req.options.file !== undefined ? { file: req.options.file } : {}), ...(req.options.top !== undefined ? { top: req.options.top } : {}) };
    note = auto.note;
  }
  const result = runAudit(mesh, options);
  stages.audit = performance.now() - t2;
  post({ kind: 'progress', seq: req.seq, stage: 'Preparing the view', fraction: null });
  const t3 = performance.now();
  const b = usedBounds(mesh);
  const cx = (b.minX + b.maxX) / 2;
  const cy = (b.minY + b.maxY) / 2;
  const { positions, cellIds } = renderBuffers(mesh, cx, cy);
  const centroids = interleave(result.geom.centroidX, result.geom.centroidY);
  const points = mesh.points.slice();
  const cellOffsets = mesh.cellOffsets.slice();
  const cellNodes = mesh.cellNodes.slice();
  const cellTypes = mesh.cellTypes.slice();
  const arrays = [
    ...mesh.pointData.map((a) => ({ name: a.name, components: a.components, where: 'point' as const })),
    ...mesh.cellData.map((a) => ({ name: a.name, components: a.components, where: 'cell' as const })),
  ];
  const meshPayload: MeshPayload = {
    name: primary.name, format: mesh.format, nCells: mesh.nCells, nPoints: mesh.nPoints,
    nQuads: countQuads(mesh), nTriangles: mesh.nCells - countQuads(mesh), warnings: mesh.warnings, arrays,
    centerX: cx, centerY: cy, ...b,
    positions, cellIds, points, cellOffsets, cellNodes, cellTypes, centroids,
  };
  const audit = auditPayload(result, options, req.field);
  stages.buffers = performance.now() - t3;
  current = result;
  currentPlan = null;
  currentCenter = { x: cx, y: cy };
  post({ kind: 'loaded', seq: req.seq, mesh: meshPayload, audit: audit.payload, note, ms: performance.now() - t0, stages }, [
    positions.buffer, cellIds.buffer, points.buffer, cellOffsets.buffer, cellNodes.buffer, cellTypes.buffer,
    centroids.buffer, ...audit.transfer,
  ]);
}

function need(): AuditResult {
  if (!current) throw new Error('no mesh is loaded');
  return current;
}

async function handle(req: Request): Promise<void> {
  switch (req.kind) {
    case 'load':
      await load(req);
      return;
    case 'audit': {
      const t0 = performance.now();
      const result = runAudit(need().mesh, req.options);
      current = result;
          const audit = auditPayload(result, req.options, req.field);
      post({ kind: 'audited', seq: req.seq, audit: audit.payload, ms: performance.now() - t0 }, audit.transfer);
      return;
    }
    case 'field': {
      const fp = fieldPayload(need(), req.field);
      post({ kind: 'field', seq: req.seq, field: fp }, [fp.values.buffer]);
      return;
    }
    case 'cell': {
      const r = need();
      if (!(req.cell >= 0 && req.cell < r.mesh.nCells)) throw new Error(`no cell ${req.cell}`);
      post({ kind: 'cell', seq: req.seq, info: cellInfo(r, req.cell) });
      return;
    }
    case 'export': {
      const r = need();
      // the CLI's outputs with its default decision options: the plan's columns and summary
      currentPlan ??= buildPlan(r, {});
      const parts: Uint8Array[] = [];
      if (req.what === 'csv') {
        for (const chunk of cellsCsvBytes(r, currentPlan.cellColumns)) parts.push(chunk.slice()); // the writer reuses its buffer
      } else {
        parts.push(new TextEncoder().encode(toJson({ ...r.summary, plan: currentPlan.summary })));
      }
      post({ kind: 'export', seq: req.seq, what: req.what, parts }, parts.map((p) => p.buffer));
      return;
    }
    case 'index': {
      const index = cellIndex(need().mesh);
      post({ kind: 'index', seq: req.seq, index }, [index]);
      return;
    }
    case 'edges': {
      const e = uniqueEdges(need().mesh, currentCenter.x, currentCenter.y);
      post({ kind: 'edges', seq: req.seq, positions: e.positions, lengths: e.lengths }, [e.positions.buffer, e.lengths.buffer]);
      return;
    }
  }
}

// requests run one at a time, in order (a load that awaits its download holds the others back)
let queue: Promise<void> = Promise.resolve();
scope.onmessage = (ev: MessageEvent<Request>) => {
  const req = ev.data;
  queue = queue.then(() => handle(req)).catch((e: unknown) => {
    post({ kind: 'error', seq: req.seq, error: errorPayload(e) });
  });
};
