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

/** Byte storage reused by every hash (grown as needed): the loop reads one typed array only. */
let scratch = new Uint8Array(1 << 16);
function bytesFor(count: number): Uint8Array {
  if (scratch.length < count) scratch = new Uint8Array(Math.max(count, 2 * scratch.length));
  return scratch;
}

/**
 * FNV-1a 64 of bytes[0 .. count) on four 16-bit limbs (h = h3·2^48 + h2·2^32 + h1·2^16 + h0):
 * multiplying by the prime 2^40 + 435 is h·435 plus h shifted left by 40 bits (two limbs and 8 bits),
 * mod 2^64. Every intermediate stays below 2^31, so the loop is small-integer arithmetic.
 */
function fnv1a64Of(bytes: Uint8Array, count: number): string {
  let h0 = 0x2325;
  let h1 = 0x8422;
  let h2 = 0x9ce4;
  let h3 = 0xcbf2;
  for (let i = 0; i < count; i++) {
    h0 ^= bytes[i];
    const t0 = h0 * 435;
    const t1 = h1 * 435 + (t0 >>> 16);
    const t2 = h2 * 435 + (t1 >>> 16) + (h0 << 8);
    h3 = (h3 * 435 + (t2 >>> 16) + (h1 << 8)) & 0xffff;
    h0 = t0 & 0xffff;
    h1 = t1 & 0xffff;
    h2 = t2 & 0xffff;
  }
  return [h3, h2, h1, h0].map((limb) => limb.toString(16).padStart(4, '0')).join('');
}

/** FNV-1a 64 over bytes (each 0..255), as 16 hex digits. */
export function fnv1a64Bytes(bytes: ArrayLike<number>): string {
  const buffer = bytesFor(bytes.length);
  for (let i = 0; i < bytes.length; i++) buffer[i] = bytes[i] & 0xff;
  return fnv1a64Of(buffer, bytes.length);
}

/** FNV-1a 64 of a string's UTF-16 code units, each fed as two bytes (little-endian). */
export function fnv1a64(text: string): string {
  const buffer = bytesFor(2 * text.length);
  for (let i = 0; i < text.length; i++) {
    const unit = text.charCodeAt(i);
    buffer[2 * i] = unit & 0xff;
    buffer[2 * i + 1] = unit >>> 8;
  }
  return fnv1a64Of(buffer, 2 * text.length);
}

/** Hash of any JSON-like value, independent of object key order. */
export function hashOf(value: unknown): string {
  return fnv1a64(canonicalJson(value));
}
