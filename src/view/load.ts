/** Getting bytes into the app: dropped or picked files, and same-origin URLs (with progress). */
import type { FileBytes } from './protocol.js';

export class LoadError extends Error {}

function extension(name: string): string {
  const m = /\.([^./\\]+)$/.exec(name);
  return m ? m[1]!.toLowerCase() : '';
}

/** The file the reader starts from: the .node of a Triangle pair, else the only file. */
export function primaryOf(names: string[]): string {
  if (names.length === 0) throw new LoadError('no file was given');
  if (names.length === 1) return names[0]!;
  const exts = names.map(extension);
  if (names.length === 2 && exts.includes('node') && exts.includes('ele')) return names[exts.indexOf('node')]!;
  throw new LoadError(`open one mesh file, or a Triangle .node and .ele pair (got ${names.length} files: ${names.join(', ')})`);
}

export async function readFiles(list: FileList | File[]): Promise<{ files: FileBytes[]; primary: string }> {
  const files = [...list];
  const primary = primaryOf(files.map((f) => f.name));
  const out: FileBytes[] = [];
  for (const f of files) out.push({ name: f.name, bytes: await f.arrayBuffer() });
  return { files: out, primary };
}

/** Resolve a ?mesh= value; only same-origin URLs are allowed. */
export function sameOriginUrl(value: string, base: string): URL {
  let u: URL;
  try {
    u = new URL(value, base);
  } catch {
    throw new LoadError(`"${value}" is not a valid address`);
  }
  if (u.origin !== new URL(base).origin) throw new LoadError(`only meshes from this server can be opened by address (got ${u.origin})`);
  return u;
}

/** The file name at the end of a URL's path. */
export function nameOfUrl(u: URL): string {
  const last = u.pathname.split('/').pop() ?? '';
  try {
    return decodeURIComponent(last) || 'mesh';
  } catch {
    return last || 'mesh';
  }
}

async function fetchBytes(u: URL, progress: (received: number, total: number | null) => void): Promise<ArrayBuffer | null> {
  const res = await fetch(u);
  if (res.status === 404) return null;
  if (!res.ok) throw new LoadError(`${u.pathname}: the server answered ${res.status} ${res.statusText}`);
  const total = Number(res.headers.get('content-length')) || null;
  if (!res.body) return res.arrayBuffer();
  const reader = res.body.getReader();
  // with a known length the chunks go straight into one buffer; otherwise they are joined at the end
  let whole: Uint8Array<ArrayBuffer> | null = total ? new Uint8Array(total) : null;
  const chunks: Uint8Array[] = [];
  let received = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    if (whole && received + value.length > whole.length) {
      chunks.push(whole.subarray(0, received)); // the length header was wrong
      whole = null;
    }
    if (whole) whole.set(value, received);
    else chunks.push(value);
    received += value.length;
    progress(received, total);
  }
  if (whole && received === whole.length) return whole.buffer;
  if (whole) chunks.push(whole.subarray(0, received));
  const all = new Uint8Array(received);
  let off = 0;
  for (const c of chunks) { all.set(c, off); off += c.length; }
  return all.buffer;
}

/** Fetch a mesh by URL, and its Triangle sibling when it is a .node or .ele. */
export async function fetchMesh(value: string, base: string, progress: (received: number, total: number | null) => void): Promise<{ files: FileBytes[]; primary: string }> {
  const u = sameOriginUrl(value, base);
  const name = nameOfUrl(u);
  const main = await fetchBytes(u, progress);
  if (!main) throw new LoadError(`${u.pathname}: not found on the server`);
  const files: FileBytes[] = [{ name, bytes: main }];
  const ext = extension(name);
  if (ext === 'node' || ext === 'ele') {
    const other = ext === 'node' ? 'ele' : 'node';
    const su = new URL(u.href);
    su.pathname = u.pathname.replace(/\.[^./]+$/, `.${other}`);
    const sib = await fetchBytes(su, () => {});
    if (sib) files.push({ name: nameOfUrl(su), bytes: sib });
  }
  return { files, primary: name };
}
