/**
 * Chart options across threads. An option is plain data except for the callbacks ECharts calls (a
 * custom series' renderItem), and a function cannot be copied to another thread. The callbacks the
 * builders use are module-level functions registered here by name: packOption swaps each for a
 * `{ [CALLBACK_KEY]: name }` marker and unpackOption swaps it back. An option holding any other
 * function does not pack (null), and its chart is drawn where it was built.
 */
import type { EChartsOption } from 'echarts';
import { skewWindowBar } from './skew.js';

/** Every callback a chart builder puts in an option, by a name that identifies it on any thread. */
const CALLBACKS: Readonly<Record<string, (...args: never[]) => unknown>> = { skewWindowBar };
const NAME_OF = new Map<unknown, string>(Object.entries(CALLBACKS).map(([name, f]) => [f, name]));

/** Property of the marker object that stands for a registered callback. */
export const CALLBACK_KEY = '$chartCallback';

/** A copy of `option` that the structured-clone algorithm can carry, or null when it holds an unregistered function. */
export function packOption(option: EChartsOption): unknown | null {
  let packable = true;
  const pack = (value: unknown): unknown => {
    if (typeof value === 'function') {
      const name = NAME_OF.get(value);
      if (name === undefined) packable = false;
      return { [CALLBACK_KEY]: name };
    }
    if (value === null || typeof value !== 'object' || ArrayBuffer.isView(value)) return value;
    if (Array.isArray(value)) return containsObjects(value) ? value.map(pack) : value;
    const out: Record<string, unknown> = {};
    for (const [key, v] of Object.entries(value)) out[key] = pack(v);
    return out;
  };
  const packed = pack(option);
  return packable ? packed : null;
}

/** The option packOption packed, its callbacks restored. */
export function unpackOption(packed: unknown): EChartsOption {
  const unpack = (value: unknown): unknown => {
    if (value === null || typeof value !== 'object' || ArrayBuffer.isView(value)) return value;
    if (Array.isArray(value)) return containsObjects(value) ? value.map(unpack) : value;
    const record = value as Record<string, unknown>;
    if (CALLBACK_KEY in record) {
      const callback = CALLBACKS[String(record[CALLBACK_KEY])];
      if (!callback) throw new Error(`chart option names an unknown callback "${String(record[CALLBACK_KEY])}"`);
      return callback;
    }
    const out: Record<string, unknown> = {};
    for (const [key, v] of Object.entries(record)) out[key] = unpack(v);
    return out;
  };
  return unpack(packed) as EChartsOption;
}

/** True when an array holds anything but numbers, strings and the like (a series' long number lists are left as they are). */
function containsObjects(values: readonly unknown[]): boolean {
  for (const v of values) if ((v !== null && typeof v === 'object') || typeof v === 'function') return true;
  return false;
}
