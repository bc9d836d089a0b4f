import { expect } from 'vitest';
import { MeshInputError } from '../../src/mesh/errors.js';

/** The MeshInputError `fn` must throw (anything else, or nothing, fails the test). */
export function inputError(fn: () => unknown): MeshInputError {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(MeshInputError);
    return e as MeshInputError;
  }
  throw new Error('expected a MeshInputError, none was thrown');
}
