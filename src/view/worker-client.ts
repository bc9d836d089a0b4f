/** The app's side of the worker: numbered requests, one promise each, progress on the side. */
import type { ErrorPayload, Reply, Request } from './protocol.js';

export type RequestBody = Request extends infer R ? (R extends { seq: number } ? Omit<R, 'seq'> : never) : never;

export class WorkerError extends Error {
  constructor(readonly payload: ErrorPayload) {
    super(payload.message);
  }
}

export class WorkerClient {
  private readonly worker: Worker;
  private seq = 0;
  private readonly waiting = new Map<number, { resolve: (r: Reply) => void; reject: (e: unknown) => void }>();

  constructor(onProgress: (stage: string, fraction: number | null) => void, onCrash: (e: ErrorPayload) => void) {
    this.worker = new Worker(new URL('./worker/entry.ts', import.meta.url), { type: 'module' });
    this.worker.onmessage = (e: MessageEvent<Reply>) => {
      const r = e.data;
      if (r.kind === 'progress') { onProgress(r.stage, r.fraction); return; }
      const w = this.waiting.get(r.seq);
      if (!w) return;
      this.waiting.delete(r.seq);
      if (r.kind === 'error') w.reject(new WorkerError(r.error));
      else w.resolve(r);
    };
    this.worker.onerror = (e) => {
      // a failure outside any request (out of memory, a bad bundle): fail what waits on it
      const msg = e.message || 'the worker stopped';
      const err: ErrorPayload = { kind: 'internal', detail: msg, message: msg };
      for (const w of this.waiting.values()) w.reject(new WorkerError(err));
      this.waiting.clear();
      onCrash(err);
    };
  }

  call(body: RequestBody, transfer: Transferable[] = []): Promise<Reply> {
    const seq = ++this.seq;
    return new Promise((resolve, reject) => {
      this.waiting.set(seq, { resolve, reject });
      this.worker.postMessage({ ...body, seq } as Request, transfer);
    });
  }
}
