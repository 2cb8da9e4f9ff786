import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { sha256Hex } from '../../../core/hash/sha256.js';

describe('sha256Hex', () => {
  it('matches the FIPS 180-2 appendix B examples', () => {
    // FIPS 180-2 Appendix B.1 ("abc") and B.2 (the 448-bit message).
    expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(sha256Hex('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe('248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1');
  });
  it('matches Node crypto on multi-block and non-ASCII text', () => {
    // Node's OpenSSL SHA-256 as the reference implementation.
    for (const text of ['', 'Ω µ 漢字 😀'.repeat(50), 'x'.repeat(1000)]) {
      expect(sha256Hex(text)).toBe(createHash('sha256').update(text, 'utf8').digest('hex'));
    }
  });
});
