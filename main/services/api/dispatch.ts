/**
 * The single entry point transports use to call the API with untrusted arguments: checks the method
 * name, validates the argument tuple (schemas.ts), calls AppService, and turns failures into a plain
 * error description every transport can carry (IPC structured clone, HTTP JSON).
 */
import { InputError } from '../../../core/errors.js';
import type { SlacklineApi } from '../../../core/contract/api.js';
import { isApiMethod } from '../../../core/contract/methods.js';
import { parseArguments, PayloadError } from './schemas.js';

import type { ApiFailure, ApiOutcome } from '../../../core/contract/transport.js';

export type { ApiFailure, ApiOutcome };

export async function dispatchApiCall(api: SlacklineApi, method: string, args: unknown): Promise<ApiOutcome> {
  if (!isApiMethod(method)) {
    return { ok: false, error: { kind: 'unknown-method', message: `no API method named "${method}"`, where: null } };
  }
  try {
    const parsed = parseArguments(method, args);
    const fn = api[method] as (...a: unknown[]) => Promise<unknown>;
    const value = await fn.apply(api, parsed);
    return { ok: true, value: value === undefined ? null : value };
  } catch (error) {
    return { ok: false, error: describeFailure(error) };
  }
}

export function describeFailure(error: unknown): ApiFailure {
  if (error instanceof InputError) return { kind: 'input', message: error.message, where: error.where };
  if (error instanceof PayloadError) return { kind: 'payload', message: error.message, where: null };
  const message = error instanceof Error ? error.message : String(error);
  return { kind: 'internal', message, where: null };
}
