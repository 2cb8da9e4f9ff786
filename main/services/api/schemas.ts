/**
 * Runtime schemas for every SlacklineApi method's arguments. The Electron IPC handlers and the HTTP
 * shell validate each incoming payload against these before any service sees it: the renderer is
 * treated as untrusted input. Numbers are SI (metres, seconds, ohms, farads, volts) and finite
 * (zod 4's number() rejects Infinity and NaN). Deep checks of engineering ranges stay in the services,
 * which report them as InputError naming the field; these schemas only guarantee the shape.
 */
import { z } from 'zod';
import { BUS_PAGE_MAX, type ApiMethod } from '../../../core/contract/api.js';

import {
  busDefinitionSchema, netDefinitionSchema, cornerSchema, netElementSchema, partModelSchema, projectInfoSchema,
  stackupLayerSchema,
} from '../../../core/project/model.js';

// The domain shapes come from core/project/model.ts (one definition for the type and the check);
// only the limits a request adds beyond the model are written here.
const name = z.string().min(1).max(200);
const projectInfoPatch = projectInfoSchema.partial();
/** An edited stackup must keep at least one layer. */
const stackup = z.strictObject({ name, layers: z.array(stackupLayerSchema).min(1).max(200) });
const part = partModelSchema;
const netElement = netElementSchema;
const bus = busDefinitionSchema;
const corner = cornerSchema;

const netDefinition = netDefinitionSchema;
const rename = { from: name, to: name };
const index = z.number().int().nonnegative();
/** One authoring edit (core/design/edits.ts ProjectEdit). */
const projectEdit = z.discriminatedUnion('op', [
  z.strictObject({ op: z.literal('createBus'), bus }),
  z.strictObject({ op: z.literal('renameBus'), ...rename }),
  z.strictObject({ op: z.literal('deleteBus'), name }),
  z.strictObject({ op: z.literal('createNet'), net: netDefinition }),
  z.strictObject({ op: z.literal('renameNet'), ...rename }),
  z.strictObject({ op: z.literal('deleteNet'), name }),
  z.strictObject({ op: z.literal('createPart'), part }),
  z.strictObject({ op: z.literal('renamePart'), ...rename }),
  z.strictObject({ op: z.literal('deletePart'), name }),
  z.strictObject({ op: z.literal('setPartIbis'), part: name, ibis: z.strictObject({ file: name, model: name, pin: name.optional() }).nullable() }),
  z.strictObject({ op: z.literal('insertNetElement'), net: name, index, element: netElement }),
  z.strictObject({ op: z.literal('removeNetElement'), net: name, index }),
  z.strictObject({
    op: z.literal('applyTermination'),
    net: name,
    change: z.discriminatedUnion('kind', [
      z.strictObject({ kind: z.literal('series'), ohms: z.number().positive() }),
      z.strictObject({ kind: z.literal('parallel-end'), ohms: z.number().positive(), node: name, vtt: z.number() }),
    ]),
  }),
  z.strictObject({ op: z.literal('applyBusTemplate'), bus: name, template: z.string().min(1).max(1_000_000) }),
]);

/** CSV text of a length report: generous, but bounded so one request cannot exhaust memory. */
const csvText = z.string().max(20_000_000);
const fileName = z.string().min(1).max(500);
const importOptions = z.strictObject({ allowRepeatedRows: z.boolean().optional() });

/** A new project (core/contract/api.ts NewProjectRequest): exactly one of design and empty. */
const newProjectRequest = z.strictObject({
  path: z.string().min(1).max(255).optional(),
  design: z.strictObject({
    fileName,
    text: z.string().max(20_000_000),
    ibisFiles: z.array(z.strictObject({ path: z.string().min(1).max(4096), text: z.string().max(20_000_000) })).max(200),
  }).optional(),
  empty: z.strictObject({ name: z.string().max(200), boardRevision: z.string().max(200).optional(), description: z.string().max(5000).optional() }).optional(),
  checkOnly: z.boolean().optional(),
}).refine((r) => (r.design === undefined) !== (r.empty === undefined), { message: 'give exactly one of design and empty' });

/** A what-if sweep (core/engine/sweep.ts): ranges and point limits are checked there, naming the field. */
const sweepRequest = z.strictObject({
  quantity: z.strictObject({ kind: z.enum(['length', 'resistance']), elementIndex: index }),
  start: z.number(),
  stop: z.number(),
  points: z.number(),
});

/** Argument tuple schema per API method. */
export const API_ARGUMENTS = {
  getProject: z.tuple([]),
  updateInfo: z.tuple([projectInfoPatch]),
  updateStackup: z.tuple([stackup]),
  previewStackup: z.tuple([stackup]),
  solveLayerTarget: z.tuple([stackup, z.strictObject({
    layer: z.string().min(1).max(200),
    targetZ0: z.number().positive().max(1e4).optional(),
    width: z.number().positive().max(1).optional(),
    targetZdiff: z.number().positive().max(1e4).optional(),
  })]),
  layerFieldMap: z.union([
    z.tuple([stackup, z.string().min(1).max(200), z.number().positive().max(1)]),
    z.tuple([stackup, z.string().min(1).max(200), z.number().positive().max(1), z.number().positive().max(1)]),
  ]),
  upsertPart: z.tuple([part]),
  updateBus: z.tuple([bus]),
  updateNetElement: z.tuple([name, z.number().int().nonnegative(), netElement]),
  updateCorners: z.tuple([z.array(corner).min(1).max(50)]),
  previewImport: z.tuple([fileName, csvText]).or(z.tuple([fileName, csvText, importOptions])),
  applyImport: z.tuple([fileName, csvText]).or(z.tuple([fileName, csvText, importOptions])),
  startSolve: z.tuple([z.strictObject({ bus: name.optional() })]),
  getJob: z.tuple([z.string().min(1).max(100)]),
  cancelJob: z.tuple([z.string().min(1).max(100)]),
  getResults: z.tuple([]),
  getOutdatedResults: z.tuple([]),
  getBoardSummary: z.tuple([]),
  getBusResults: z.tuple([name]).or(z.tuple([name, z.strictObject({
    offset: index.max(10_000_000).optional(),
    limit: z.number().int().positive().max(BUS_PAGE_MAX).optional(),
  })])),
  solveNet: z.tuple([name]),
  getNetWaveforms: z.tuple([name]),
  sweepNet: z.tuple([name, sweepRequest]),
  startSweep: z.tuple([name, sweepRequest]),
  getSweepResult: z.tuple([z.string().min(1).max(100)]),
  readExport: z.tuple([z.string().min(1).max(4096)]),
  editProject: z.tuple([projectEdit]),
  applySuggestedTermination: z.tuple([name]),
  undo: z.tuple([]),
  redo: z.tuple([]),
  getEditHistory: z.tuple([]),
  importIbis: z.tuple([fileName, z.string().max(20_000_000)]),
  getPartIbisCurves: z.tuple([name, name]),
  // Empty comment or author pass the shape check so the service can refuse them naming the field.
  setWaiver: z.tuple([name, z.strictObject({ comment: z.string().max(10_000), author: z.string().max(200) })]),
  removeWaiver: z.tuple([name]),
  getPreviousSolve: z.tuple([]),
  createProject: z.tuple([newProjectRequest]),
  getNewProjectTarget: z.tuple([]),
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
