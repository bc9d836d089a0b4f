/**
 * Input units, converted once on reading; every output is SI.
 * Factors to SI: the foot is 0.3048 m exactly (NIST SP 811, 2008 ed., App. B.8); the nautical
 * mile is 1852 m and the knot 1852/3600 m/s (SI Brochure, 9th ed., 2019, Table 8).
 */
import { UsageError } from '../mesh/errors.js';

export const LENGTH_UNITS: Record<string, number> = { m: 1, km: 1000, ft: 0.3048 };
export const VELOCITY_UNITS: Record<string, number> = { 'm/s': 1, 'km/h': 1000 / 3600, kn: 1852 / 3600, 'ft/s': 0.3048 };

export function lengthFactor(unit: string | undefined): number {
  if (unit === undefined) return 1;
  const f = LENGTH_UNITS[unit];
  if (f === undefined) throw new UsageError(`--length-unit must be one of ${Object.keys(LENGTH_UNITS).join(', ')}; got "${unit}"`);
  return f;
}

export function velocityFactor(unit: string | undefined): number {
  if (unit === undefined) return 1;
  const f = VELOCITY_UNITS[unit];
  if (f === undefined) throw new UsageError(`--velocity-unit must be one of ${Object.keys(VELOCITY_UNITS).join(', ')}; got "${unit}"`);
  return f;
}
