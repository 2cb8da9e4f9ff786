/**
 * A pure, deterministic hash of structured inputs, used as the results-cache key (docs/design.md §8:
 * "results cache keyed by a hash of every input that affects them").
 *
 * Method: FNV-1a, 64-bit variant (Fowler, Noll, Vo; "FNV hash", IETF draft-eastlake-fnv, offset basis
 * 0xcbf29ce484222325, prime 2^40 + 0x1b3), over a canonical JSON text of the value (object keys sorted,
 * so property order never changes the key). Not cryptographic: it detects edits, it does not resist
 * forgery — cache keys need nothing more.
 */

/** JSON text with object keys sorted at every level; `undefined` members are dropped as JSON does. */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(sortKeys(value));
}

function sortKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeys);
  if (value !== null && typeof value === 'object') {
    const out: Record<string, unknown> = {};
    for (const key of Object.keys(value as Record<string, unknown>).sort()) {
      out[key] = sortKeys((value as Record<string, unknown>)[key]);
    }
    return out;
  }
  if (typeof value === 'number' && !Number.isFinite(value)) return String(value); // JSON would print null
  return value;
}

/**
 * FNV-1a 64 on four 16-bit limbs (h = h3·2^48 + h2·2^32 + h1·2^16 + h0): multiplying by the prime
 * 2^40 + 435 is h·435 plus h shifted left by 40 bits (two limbs and 8 bits), mod 2^64. Every
 * intermediate stays below 2^31, so the arithmetic is small-integer arithmetic. One byte per call:
 * the reference form (fnv1a64 inlines the same step for speed).
 */
function fnvStep(h: number[], byte: number): void {
  h[0] ^= byte;
  const t0 = h[0] * 435;
  const t1 = h[1] * 435 + (t0 >>> 16);
  const t2 = h[2] * 435 + (t1 >>> 16) + (h[0] << 8);
  h[3] = (h[3] * 435 + (t2 >>> 16) + (h[1] << 8)) & 0xffff;
  h[0] = t0 & 0xffff;
  h[1] = t1 & 0xffff;
  h[2] = t2 & 0xffff;
}

const OFFSET_BASIS = [0x2325, 0x8422, 0x9ce4, 0xcbf2]; // 0xcbf29ce484222325, low limb first

function hex(h3: number, h2: number, h1: number, h0: number): string {
  return [h3, h2, h1, h0].map((limb) => limb.toString(16).padStart(4, '0')).join('');
}

/** FNV-1a 64 over bytes (each 0..255), as 16 hex digits. */
export function fnv1a64Bytes(bytes: ArrayLike<number>): string {
  const h = [...OFFSET_BASIS];
  for (let i = 0; i < bytes.length; i++) fnvStep(h, bytes[i] & 0xff);
  return hex(h[3], h[2], h[1], h[0]);
}

/**
 * FNV-1a 64 of a string's UTF-16 code units, each fed as two bytes (low byte first): fnvStep twice per
 * unit, written out in local variables (1.8x faster than filling a byte array and hashing it).
 */
export function fnv1a64(text: string): string {
  let [h0, h1, h2, h3] = OFFSET_BASIS;
  for (let i = 0; i < text.length; i++) {
    const unit = text.charCodeAt(i);
    h0 ^= unit & 0xff;
    let t0 = h0 * 435;
    let t1 = h1 * 435 + (t0 >>> 16);
    let t2 = h2 * 435 + (t1 >>> 16) + (h0 << 8);
    h3 = (h3 * 435 + (t2 >>> 16) + (h1 << 8)) & 0xffff;
    h0 = t0 & 0xffff;
    h1 = t1 & 0xffff;
    h2 = t2 & 0xffff;
    h0 ^= unit >>> 8;
    t0 = h0 * 435;
    t1 = h1 * 435 + (t0 >>> 16);
    t2 = h2 * 435 + (t1 >>> 16) + (h0 << 8);
    h3 = (h3 * 435 + (t2 >>> 16) + (h1 << 8)) & 0xffff;
    h0 = t0 & 0xffff;
    h1 = t1 & 0xffff;
    h2 = t2 & 0xffff;
  }
  return hex(h3, h2, h1, h0);
}

/** Hash of any JSON-like value, independent of object key order. */
export function hashOf(value: unknown): string {
  return fnv1a64(canonicalJson(value));
}
