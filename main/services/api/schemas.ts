/**
 * Runtime schemas for every SlacklineApi method's arguments. The Electron IPC handlers and the HTTP
 * shell validate each incoming payload against these before any service sees it: the renderer is
 * treated as untrusted input. Numbers are SI (metres, seconds, ohms, farads, volts) and finite
 * (zod 4's number() rejects Infinity and NaN). Deep checks of engineering ranges stay in the services,
 * which report them as InputError naming the field; these schemas only guarantee the shape.
 */
import { z } from 'zod';
import type { ApiMethod } from '../../../core/contract/api.js';

const name = z.string().min(1).max(200);
const text = z.string().max(10_000);
const num = z.number();
const positive = z.number().positive();
const nonNegative = z.number().nonnegative();

const projectInfoPatch = z.strictObject({
  name: name.optional(),
  boardRevision: z.string().max(200).optional(),
  description: text.optional(),
  guardBand: nonNegative.optional(),
  settleBand: positive.optional(),
});

const stackupLayer = z.strictObject({
  name,
  kind: z.enum(['copper', 'dielectric', 'mask']),
  thickness: positive,
  dk: positive.optional(),
  df: nonNegative.optional(),
  role: z.enum(['signal', 'plane']).optional(),
  defaultWidth: positive.optional(),
});

const stackup = z.strictObject({ name, layers: z.array(stackupLayer).min(1).max(200) });

const driver = z.strictObject({
  vol: num, voh: num, routHigh: nonNegative, routLow: nonNegative,
  riseTime: positive, fallTime: positive, tcoMin: num, tcoMax: num,
  refLoad: z.strictObject({ ohms: nonNegative, vtt: num, farads: nonNegative }),
  vmeas: num,
});

const receiver = z.strictObject({
  cin: nonNegative, vil: num, vih: num, vref: num,
  odtOhms: positive.nullable(), odtVtt: num,
  vmaxAbs: num, vminAbs: num, tsetup: num, thold: num,
});

const part = z.strictObject({
  name, description: text, ioStandard: z.string().max(200),
  driver: driver.nullable(), receiver: receiver.nullable(),
});

const node = z.string().min(1).max(200);
const netElement = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('segment'), a: node, b: node, layer: name, width: positive, length: nonNegative, spacing: positive.optional() }),
  z.strictObject({ kind: z.literal('line'), a: node, b: node, z0: positive, delay: nonNegative }),
  z.strictObject({ kind: z.literal('resistor'), a: node, b: node, ohms: positive }),
  z.strictObject({ kind: z.literal('capacitor'), a: node, b: node, farads: nonNegative }),
  z.strictObject({ kind: z.literal('inductor'), a: node, b: node, henries: nonNegative }),
  z.strictObject({ kind: z.literal('via'), a: node, farads: nonNegative }),
]);

const allowance = z.strictObject({
  name, value: num, appliesTo: z.enum(['setup', 'hold', 'both']), note: text,
});

const bus = z.strictObject({
  name,
  kind: z.enum(['common-clock', 'source-synchronous']),
  description: text,
  referenceNet: name.nullable(),
  timing: z.discriminatedUnion('kind', [
    z.strictObject({ kind: z.literal('common-clock'), cycleTime: positive, clockSkew: num, jitter: nonNegative }),
    z.strictObject({ kind: z.literal('source-synchronous'), tValidBefore: num, tValidAfter: num }),
  ]),
  allowances: z.array(allowance).max(200),
});

const corner = z.strictObject({
  name, driverStrength: positive, edgeRate: positive, dk: positive, widthDelta: num,
  rail: positive, cin: positive, tco: z.enum(['min', 'max', 'typ']),
});

/** CSV text of a length report: generous, but bounded so one request cannot exhaust memory. */
const csvText = z.string().max(20_000_000);
const fileName = z.string().min(1).max(500);

/** Argument tuple schema per API method. */
export const API_ARGUMENTS = {
  getProject: z.tuple([]),
  updateInfo: z.tuple([projectInfoPatch]),
  updateStackup: z.tuple([stackup]),
  previewStackup: z.tuple([stackup]),
  upsertPart: z.tuple([part]),
  updateBus: z.tuple([bus]),
  updateNetElement: z.tuple([name, z.number().int().nonnegative(), netElement]),
  updateCorners: z.tuple([z.array(corner).min(1).max(50)]),
  previewImport: z.tuple([fileName, csvText]),
  applyImport: z.tuple([fileName, csvText]),
  startSolve: z.tuple([z.strictObject({ bus: name.optional() })]),
  getJob: z.tuple([z.string().min(1).max(100)]),
  cancelJob: z.tuple([z.string().min(1).max(100)]),
  getResults: z.tuple([]),
  getOutdatedResults: z.tuple([]),
  solveNet: z.tuple([name]),
  getNetWaveforms: z.tuple([name]),
  readExport: z.tuple([z.string().min(1).max(4096)]),
  exportReport: z.tuple([
    z.strictObject({ formats: z.array(z.enum(['pdf', 'html', 'csv'])).min(1).max(3), bus: name.optional() }),
  ]),
} satisfies Record<ApiMethod, z.ZodType>;

/** Thrown when a payload does not match its method's schema; hosts map it to "bad request". */
export class PayloadError extends Error {
  constructor(method: string, detail: string) {
    super(`${method}: invalid arguments: ${detail}`);
    this.name = 'PayloadError';
  }
}

/** Validates `args` for `method`; returns the parsed tuple or throws PayloadError naming the bad path. */
export function parseArguments(method: ApiMethod, args: unknown): unknown[] {
  const result = API_ARGUMENTS[method].safeParse(args);
  if (!result.success) {
    const detail = result.error.issues
      .slice(0, 5)
      .map((issue) => `${issue.path.length ? `argument ${issue.path.join('.')}` : 'arguments'}: ${issue.message}`)
      .join('; ');
    throw new PayloadError(method, detail);
  }
  return result.data as unknown[];
}
