/**
 * A Stackup from untrusted JSON (a file or a request body). Lengths may be numbers (metres) or strings
 * with units ("4.5mil", "0.1mm", "1oz"); dk/df are plain numbers or numeric strings. Every error names
 * the source, the layer and the field. The result is validated (validateStackup).
 */
import { InputError } from '../errors.js';
import type { CopperRole, LayerKind, Stackup, StackupLayer } from '../project/model.js';
import { parseQuantity } from '../units/index.js';
import { validateStackup } from './classify.js';

const KINDS: LayerKind[] = ['copper', 'dielectric', 'mask'];
const ROLES: CopperRole[] = ['signal', 'plane'];

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/**
 * @param value parsed JSON
 * @param source name of the file or request for messages, e.g. "board.json"
 */
export function stackupFromJson(value: unknown, source: string): Stackup {
  if (!isRecord(value)) throw new InputError(source, 'expected a JSON object with "name" and "layers"');
  const name = value.name === undefined ? source : value.name;
  if (typeof name !== 'string') throw new InputError(`${source} name`, 'must be a string');
  if (!Array.isArray(value.layers) || value.layers.length === 0) {
    throw new InputError(`${source} layers`, 'must be a non-empty array of layers, top to bottom');
  }
  const layers = value.layers.map((raw: unknown, i: number): StackupLayer => {
    const at = `${source} layers[${i}]`;
    if (!isRecord(raw)) throw new InputError(at, 'must be an object');
    if (typeof raw.name !== 'string' || raw.name.trim() === '') throw new InputError(`${at} name`, 'must be a non-empty string');
    const here = `${at} ("${raw.name}")`;
    if (!KINDS.includes(raw.kind as LayerKind)) {
      throw new InputError(`${here} kind`, `must be one of ${KINDS.join(', ')}, got ${JSON.stringify(raw.kind)}`);
    }
    const kind = raw.kind as LayerKind;
    const layer: StackupLayer = {
      name: raw.name,
      kind,
      thickness: parseQuantity(raw.thickness, 'length', `${here} thickness`, { min: 0, minExclusive: true }),
    };
    if (kind === 'copper') {
      if (!ROLES.includes(raw.role as CopperRole)) {
        throw new InputError(`${here} role`, `copper layers need role "signal" or "plane", got ${JSON.stringify(raw.role)}`);
      }
      layer.role = raw.role as CopperRole;
      if (raw.defaultWidth !== undefined) {
        layer.defaultWidth = parseQuantity(raw.defaultWidth, 'length', `${here} defaultWidth`, { min: 0, minExclusive: true });
      }
    } else {
      layer.dk = parseQuantity(raw.dk, 'ratio', `${here} dk`, { min: 1 });
      if (raw.df !== undefined) layer.df = parseQuantity(raw.df, 'ratio', `${here} df`, { min: 0, max: 1 });
    }
    return layer;
  });
  const stackup: Stackup = { name, layers };
  validateStackup(stackup);
  return stackup;
}
