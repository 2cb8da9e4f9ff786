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

const TWO_32 = 4294967296;

/**
 * FNV-1a 64 over bytes (each 0..255), as 16 hex digits.
 * 64-bit arithmetic is done on two 32-bit halves: h * (2^40 + 435) = h * 435 + (h << 40) mod 2^64.
 */
export function fnv1a64Bytes(bytes: ArrayLike<number>): string {
  let hi = 0xcbf29ce4;
  let lo = 0x84222325;
  for (let i = 0; i < bytes.length; i++) {
    lo = (lo ^ (bytes[i] & 0xff)) >>> 0;
    const loProduct = lo * 435;
    const carry = Math.floor(loProduct / TWO_32);
    hi = (hi * 435 + carry + ((lo << 8) >>> 0)) >>> 0;
    lo = loProduct >>> 0;
  }
  return hi.toString(16).padStart(8, '0') + lo.toString(16).padStart(8, '0');
}

/**
 * FNV-1a 64 of a string's UTF-16 code units, each fed as two bytes (little-endian): the same value as
 * fnv1a64Bytes over those bytes, without building the byte array (the cache keys of a board hash
 * megabytes of canonical JSON).
 */
export function fnv1a64(text: string): string {
  let hi = 0xcbf29ce4;
  let lo = 0x84222325;
  for (let i = 0; i < text.length; i++) {
    const unit = text.charCodeAt(i);
    lo = (lo ^ (unit & 0xff)) >>> 0;
    let product = lo * 435;
    hi = (hi * 435 + Math.floor(product / TWO_32) + ((lo << 8) >>> 0)) >>> 0;
    lo = product >>> 0;
    lo = (lo ^ (unit >>> 8)) >>> 0;
    product = lo * 435;
    hi = (hi * 435 + Math.floor(product / TWO_32) + ((lo << 8) >>> 0)) >>> 0;
    lo = product >>> 0;
  }
  return hi.toString(16).padStart(8, '0') + lo.toString(16).padStart(8, '0');
}

/** Hash of any JSON-like value, independent of object key order. */
export function hashOf(value: unknown): string {
  return fnv1a64(canonicalJson(value));
}
