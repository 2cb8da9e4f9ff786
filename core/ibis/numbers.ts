/**
 * Numbers as IBIS writes them (docs/ibis.md §2): a decimal or scientific number, an optional scale
 * suffix T G M k m u n p f (ANSI/EIA-656 "Scaling factors": M is mega, m is milli) and any trailing
 * unit letters, which the standard says are ignored ("1.5nH", "2.0pF", "35m", "3.3V"). "NA" means not
 * available. A ratio "dV/dt" (1.2/0.5n) is two numbers joined by a slash.
 */

/** Scale letter -> power of ten. */
const SCALE: Record<string, number> = { T: 12, G: 9, M: 6, k: 3, m: -3, u: -6, n: -9, p: -12, f: -15 };

const NUMBER = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)([A-Za-z]*)$/;

/** The SI value of one IBIS number, or null when the token is not a number. "NA" is not a number here. */
export function ibisNumber(token: string): number | null {
  const m = NUMBER.exec(token);
  if (!m) return null;
  let value = Number(m[1]);
  const first = m[2][0];
  // A scale letter is taken only when it is one of the standard's; other letters are a unit (V, A, s, ohm).
  if (first !== undefined && Object.hasOwn(SCALE, first)) {
    // "1.5n" is read as the decimal text 1.5e-9 (exact to the last digit, unlike 1.5 * 1e-9).
    value = /[eE]/.test(m[1]) ? value * 10 ** SCALE[first] : Number(`${m[1]}e${SCALE[first]}`);
  }
  return Number.isFinite(value) ? value : null;
}

/** True for the standard's "not available" token. */
export function isNa(token: string): boolean {
  return token.toUpperCase() === 'NA';
}

/** Splits "dV/dt" into two numbers, or null when it is not such a ratio. */
export function ibisRatio(token: string): { dv: number; dt: number } | null {
  const parts = token.split('/');
  if (parts.length !== 2) return null;
  const dv = ibisNumber(parts[0]);
  const dt = ibisNumber(parts[1]);
  return dv === null || dt === null ? null : { dv, dt };
}
