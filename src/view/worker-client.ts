/** The app's side of the worker: numbered requests, one promise each, progress on the side. */
import type { ErrorPayload, Reply, Request } from './protocol.js';

export type RequestBody = Request extends infer R ? (R extends { seq: number } ? Omit<R, 'seq'> : never) : never;

export class WorkerError extends Error {
  constructor(readonly payload: ErrorPayload) {
    super(payload.message);
  }
}

/** A request that was cut short because the user cancelled the work. */
export class CancelledError extends Error {
  constructor() {
    super('cancelled');
  }
}

export class WorkerClient {
  private worker: Worker;
  private seq = 0;
  private readonly waiting = new Map<number, { resolve: (r: Reply) => void; reject: (e: unknown) => void }>();

  constructor(
    private readonly onProgress: (stage: string, fraction: number | null) => void,
    private readonly onCrash: (e: ErrorPayload) => void,
  ) {
    this.worker = this.spawn();
  }

  /**
   * Stop whatever the worker is doing (a parse cannot be interrupted from outside, so the worker
   * is ended and a fresh one started); every waiting request fails with CancelledError. The new
   * worker holds no mesh: the caller loads one again.
   */
  restart(): void {
    this.worker.terminate();
    for (const w of this.waiting.values()) w.reject(new CancelledError());
    this.waiting.clear();
    this.worker = this.spawn();
  }

  private spawn(): Worker {
    const onProgress = this.onProgress, onCrash = this.onCrash;
    const worker = new Worker(new URL('./worker/entry.ts', import.meta.url), { type: 'module' });
    worker.onmessage = (e: MessageEvent<Reply>) => {
      const r = e.data;
      if (r.kind === 'progress') { onProgress(r.stage, r.fraction); return; }
      const w = this.waiting.get(r.seq);
      if (!w) return;
      this.waiting.delete(r.seq);
      if (r.kind === 'error') w.reject(new WorkerError(r.error));
      else w.resolve(r);
    };
    worker.onerror = (e) => {
      // a failure outside any request (out of memory, a bad bundle): fail what waits on it
      const msg = e.message || 'the worker stopped';
      const err: ErrorPayload = { kind: 'internal', detail: msg, message: msg };
      for (const w of this.waiting.values()) w.reject(new WorkerError(err));
      this.waiting.clear();
      onCrash(err);
    };
    return worker;
  }

  call(body: RequestBody, transfer: Transferable[] = []): Promise<Reply> {
    const seq = ++this.seq;
    return new Promise((resolve, reject) => {
      this.waiting.set(seq, { resolve, reject });
      this.worker.postMessage({ ...body, seq } as Request, transfer);
    });
  }
}
