/**
 * Words and place of a thrown error (renderer/src/lib/errors.ts). Contract: core/errors.ts InputError
 * carries `where`; the renderer's ApiError carries `where: string | null` from the services.
 */
import { describe, expect, it } from 'vitest';
import { messageOf, whereOf } from '../../renderer/src/lib/errors.js';
import { InputError } from '../../core/errors.js';

describe('whereOf', () => {
  it('returns the place an InputError or a service failure names', () => {
    // core/errors.ts contract: InputError(where, reason)
    expect(whereOf(new InputError('corner slow dk', 'must be greater than 0'))).toBe('corner slow dk');
    // shape of renderer/src/api/client.ts ApiError (an Error with `where`), built here without the DOM client
    const apiError = Object.assign(new Error('the name is used twice'), { where: 'bus ADDR allowance "ISI"' });
    expect(whereOf(apiError)).toBe('bus ADDR allowance "ISI"');
  });

  it('returns null when there is no usable place', () => {
    // core/contract transport: where is null when the service could not say; common practice otherwise
    expect(whereOf(Object.assign(new Error('x'), { where: null }))).toBeNull();
    expect(whereOf(Object.assign(new Error('x'), { where: '' }))).toBeNull();
    expect(whereOf(Object.assign(new Error('x'), { where: 42 }))).toBeNull();
    expect(whereOf(new Error('plain'))).toBeNull();
    expect(whereOf(null)).toBeNull();
    expect(whereOf(undefined)).toBeNull();
    expect(whereOf('a string')).toBeNull();
  });
});

describe('messageOf', () => {
  it('uses an Error\'s message as is and turns anything else into text', () => {
    // common practice, no source
    expect(messageOf(new InputError('lengths.csv line 12 column length', 'not a number'))).toBe('lengths.csv line 12 column length: not a number');
    expect(messageOf('refused')).toBe('refused');
    expect(messageOf(404)).toBe('404');
  });
});
