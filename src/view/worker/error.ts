import { SteplensError } from '../../mesh/errors.js';
import { LoadError } from '../load.js';
import type { ErrorPayload } from '../protocol.js';

/** A thrown value as plain data that survives postMessage. */
export function errorPayload(e: unknown): ErrorPayload {
  if (e instanceof SteplensError) {
    const out: ErrorPayload = { kind: e.kind, detail: e.detail, message: e.message };
    if (e.location.file !== undefined) out.file = e.location.file;
    if (e.location.line !== undefined) out.line = e.location.line;
    if (e.location.byteOffset !== undefined) out.byteOffset = e.location.byteOffset;
    return out;
  }
  if (e instanceof LoadError) return { kind: 'input', detail: e.message, message: e.message };
  const msg = e instanceof Error ? `${e.name}: ${e.message}` : String(e);
  const out: ErrorPayload = { kind: 'internal', detail: msg, message: msg };
  if (e instanceof Error && e.stack) out.stack = e.stack;
  return out;
}
