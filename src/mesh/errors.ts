/**
 * Typed errors. The core throws these; only the CLI turns them into exit codes.
 * A location names the file and, where it applies, a 1-based line or a 0-based byte offset.
 */
export interface ErrorLocation {
  file?: string;
  line?: number;
  byteOffset?: number;
}

export class SteplensError extends Error {
  readonly kind: 'input' | 'usage';
  readonly location: ErrorLocation;
  readonly detail: string;

  constructor(kind: 'input' | 'usage', detail: string, location: ErrorLocation = {}) {
    super(formatLocated(detail, location));
    this.name = kind === 'input' ? 'MeshInputError' : 'UsageError';
    this.kind = kind;
    this.detail = detail;
    this.location = location;
  }
}

/** A file that cannot be read: bad bytes, lying header, unsupported content. */
export class MeshInputError extends SteplensError {
  constructor(detail: string, location: ErrorLocation = {}) {
    super('input', detail, location);
  }
}

/** A wrong command line or a wrong option value (an array name that does not exist, ...). */
export class UsageError extends SteplensError {
  constructor(detail: string) {
    super('usage', detail, {});
  }
}

export function formatLocated(detail: string, loc: ErrorLocation): string {
  const parts: string[] = [];
  if (loc.file !== undefined) parts.push(loc.file);
  if (loc.line !== undefined) parts.push(`line ${loc.line}`);
  else if (loc.byteOffset !== undefined) parts.push(`byte ${loc.byteOffset}`);
  return parts.length > 0 ? `${parts.join(': ')}: ${detail}` : detail;
}
