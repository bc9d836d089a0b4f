/** The demo meshes as shipped in meshes/: which generator makes which file, and how it is written. */
import type { Mesh } from '../mesh/model.js';
import { writeVtu, type VtuWriteOptions } from '../io/vtu.js';
import { makeChannel } from './channel.js';
import { makeHarbour } from './harbour.js';

export interface DemoSpec {
  /** File name inside meshes/. */
  file: string;
  make: () => Mesh;
}

export const DEMOS: readonly DemoSpec[] = [
  { file: 'harbour.vtu', make: makeHarbour },
  { file: 'channel.vtu', make: makeChannel },
];

export const DEMO_VTU_OPTIONS: VtuWriteOptions = { encoding: 'appended-raw', compress: true };

/** Largest size we ship for a demo file. */
export const DEMO_MAX_BYTES = 2 * 1024 * 1024;

export function demoBytes(mesh: Mesh): Uint8Array {
  return writeVtu(mesh, {}, DEMO_VTU_OPTIONS);
}
