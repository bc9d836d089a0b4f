/** Byte order of this machine, for typed-array views over bytes and over the words of doubles. */

/** True when the host stores numbers little-endian (checked, not assumed). */
export const HOST_LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;
/** Index of the high and low 32-bit word of a double in a Uint32Array view over float64 data. */
export const HI_WORD = HOST_LITTLE_ENDIAN ? 1 : 0;
export const LO_WORD = 1 - HI_WORD;
