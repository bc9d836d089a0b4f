/**
 * Angles from + − × ÷ only, so that the CLI (Node) and the browser worker print the same bytes:
 * engines may round Math.atan2 differently in the last bit. The arctangent follows fdlibm's
 * s_atan.c (Sun Microsystems 1993; as kept in FreeBSD lib/msun): reduction of |x| to
 * [0, 7/16] around atan(0.5), atan(1), atan(1.5), atan(∞), each held as a hi + lo pair, then
 * an odd polynomial of degree 23 split into even and odd parts. Error under 1 ulp of π/2.
 */
const ATAN_HI = [4.63647609000806093515e-01, 7.85398163397448278999e-01, 9.82793723247329054082e-01, 1.57079632679489655800e+00];
const ATAN_LO = [2.26987774529616870924e-17, 3.06161699786838301793e-17, 1.39033110312309984516e-17, 6.12323399573676603587e-17];
const T0 = 3.33333333333329318027e-01, T1 = -1.99999999998764832476e-01, T2 = 1.42857142725034663711e-01;
const T3 = -1.11111104054623557880e-01, T4 = 9.09088713343650656196e-02, T5 = -7.69187620504482999495e-02;
const T6 = 6.66107313738753120669e-02, T7 = -5.83357013379057348645e-02, T8 = 4.97687799461593236017e-02;
const T9 = -3.65315727442169155270e-02, T10 = 1.62858201153657823623e-02;
/** π = PI_HI + PI_LO (fdlibm e_atan2.c). */
const PI_HI = 3.1415926535897931160e+00;
const PI_LO = 1.2246467991473531772e-16;
const RAD2DEG = 180 / Math.PI;

/** atan(a) for a ≥ 0 (NaN passes through). */
export function atanNonNegative(a: number): number {
  if (a >= 4.4e15) return ATAN_HI[3]! + ATAN_LO[3]!;
  let id: number;
  let x = a;
  if (a < 0.4375) {
    if (a < 3.7252902984e-09) return a;
    id = -1;
  } else if (a < 0.6875) { id = 0; x = (2 * a - 1) / (2 + a); }
  else if (a < 1.1875) { id = 1; x = (a - 1) / (a + 1); }
  else if (a < 2.4375) { id = 2; x = (a - 1.5) / (1 + 1.5 * a); }
  else { id = 3; x = -1 / a; }
  const z = x * x;
  const w = z * z;
  const s1 = z * (T0 + w * (T2 + w * (T4 + w * (T6 + w * (T8 + w * T10)))));
  const s2 = w * (T1 + w * (T3 + w * (T5 + w * (T7 + w * T9))));
  if (id < 0) return x - x * (s1 + s2);
  return ATAN_HI[id]! - ((x * (s1 + s2) - ATAN_LO[id]!) - x);
}

/** The angle in degrees of the vector (x, y) with y ≥ 0, in [0, 180]: atan2(y, x) in degrees. */
export function angleDegrees(y: number, x: number): number {
  if (y === 0) return x < 0 ? 180 : 0;
  if (x === 0) return 90;
  if (x > 0) return atanNonNegative(y / x) * RAD2DEG;
  const z = atanNonNegative(y / -x);
  return (PI_HI - (z - PI_LO)) * RAD2DEG;
}
