/**
 * `slackline z0`: Z0, eps_eff, velocity, delay and L/C per length of one trace (or an edge-coupled pair
 * with --spacing) from its cross-section. Parsing and printing only; the physics is core/stackup.
 */
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import {
  edgeCoupled, IMPEDANCE_MODELS, singleEnded, STRUCTURES, validityNotes, type FieldLabel, type ImpedanceModel, type PairProperties,
  type Structure, type TraceGeometry, type TraceProperties,
} from '../../../core/stackup/index.js';
import { formatIn, parseQuantity } from '../../../core/units/index.js';
import { printJson, type CliCommand, type CliIo } from '../command.js';

const usage = `Usage: slackline z0 --kind KIND --width W --thickness T --below H1 [--above H2] [--cover H3]
                    --er ER [--spacing S] [--model MODEL] [--json]

  --kind       ${STRUCTURES.join(' | ')}
  --width      trace width W                       lengths take units: 5mil, 0.1mm, 35um, 1oz
  --thickness  copper thickness T (0 allowed)      a bare number is metres
  --below      H1, dielectric between the trace and the plane below (its reference plane)
  --above      H2, dielectric between the trace and the plane above (striplines)
  --cover      H3, dielectric over an embedded microstrip
  --er         relative permittivity (Dk) of the dielectric, >= 1
  --spacing    edge-to-edge gap S of an edge-coupled pair: adds Zodd, Zeven, Zdiff, Zcommon
  --model      ${IMPEDANCE_MODELS.join(' | ')} (default standard; ipc-2141a = simple labelled forms)
  --json       machine-readable output in SI units (ohm, m/s, s/m, H/m, F/m); "notes" lists
               inputs outside the formula's published validity range

Closed-form estimates from published formulas; a field solver, the laminate vendor's data and coupon
measurements remain the authority.`;

const label: FieldLabel = (field) => (field === 'structure' ? '--kind' : `--${field}`);

function length(value: string | undefined, flag: string, allowZero = false): number | undefined {
  if (value === undefined) return undefined;
  return parseQuantity(value, 'length', flag, { min: 0, minExclusive: !allowZero });
}

function required<T>(value: T | undefined, flag: string): T {
  if (value === undefined) throw new InputError(flag, 'is required');
  return value;
}

function perInch(si: number, unit: 'ps/in' | 'pF/in' | 'nH/in', decimals: number): string {
  return formatIn(si, unit, decimals);
}

function summary(geometry: TraceGeometry, p: TraceProperties | PairProperties, notes: string[]): string {
  const lines = [
    `${p.structure} (${p.model})`,
    `  Z0         ${formatIn(p.z0, 'Ω', 2)}`,
    `  eps_eff    ${p.epsEff.toFixed(3)}   (Dk ${geometry.er})`,
    `  velocity   ${(p.velocity / 299_792_458).toFixed(3)} c   (${(p.velocity / 1e6).toFixed(1)} mm/ns)`,
    `  delay      ${perInch(p.delayPerMetre, 'ps/in', 1)}   ${formatIn(p.delayPerMetre, 'ps/mm', 2)}`,
    `  L          ${perInch(p.inductancePerMetre, 'nH/in', 2)}`,
    `  C          ${perInch(p.capacitancePerMetre, 'pF/in', 3)}`,
  ];
  if ('zodd' in p) {
    lines.push(
      `pair (${p.pairModel})`,
      `  Zodd       ${formatIn(p.zodd, 'Ω', 2)}     Zeven    ${formatIn(p.zeven, 'Ω', 2)}`,
      `  Zdiff      ${formatIn(p.zdiff, 'Ω', 2)}     Zcommon  ${formatIn(p.zcommon, 'Ω', 2)}`,
    );
  }
  for (const note of notes) lines.push(`note: ${note}`);
  lines.push('Closed-form estimate; field solver, vendor data and measured coupons remain the authority.');
  return lines.join('\n');
}

async function run(argv: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    strict: true,
    allowPositionals: true,
    options: {
      kind: { type: 'string' },
      width: { type: 'string' },
      thickness: { type: 'string' },
      below: { type: 'string' },
      above: { type: 'string' },
      cover: { type: 'string' },
      er: { type: 'string' },
      spacing: { type: 'string' },
      model: { type: 'string' },
      json: { type: 'boolean', default: false },
    },
  });
  if (positionals.length > 0) throw new InputError(`argument "${positionals[0]}"`, 'unexpected; every value goes with a flag (see --help)');
  const kind = required(values.kind, '--kind');
  if (!(STRUCTURES as readonly string[]).includes(kind)) {
    throw new InputError('--kind', `unknown kind "${kind}" (known: ${STRUCTURES.join(', ')})`);
  }
  if (values.model !== undefined && !(IMPEDANCE_MODELS as readonly string[]).includes(values.model)) {
    throw new InputError('--model', `unknown model "${values.model}" (known: ${IMPEDANCE_MODELS.join(', ')})`);
  }
  const geometry: TraceGeometry = {
    structure: kind as Structure,
    width: required(length(values.width, '--width'), '--width'),
    thickness: required(length(values.thickness, '--thickness', true), '--thickness'),
    below: required(length(values.below, '--below'), '--below'),
    above: length(values.above, '--above'),
    cover: length(values.cover, '--cover'),
    er: parseQuantity(required(values.er, '--er'), 'ratio', '--er', { min: 1 }),
    model: values.model as ImpedanceModel | undefined,
  };
  const spacing = length(values.spacing, '--spacing');
  const result = spacing === undefined ? singleEnded(geometry, label) : edgeCoupled({ ...geometry, spacing }, label);
  const notes = validityNotes({ ...geometry, spacing });
  if (values.json) {
    printJson(io, { ...result, notes });
  } else {
    io.out(summary(geometry, result, notes));
  }
  return 0;
}

export const command: CliCommand = {
  name: 'z0',
  summary: 'Z0, eps_eff, delay and L/C of a trace or edge-coupled pair from its cross-section',
  usage,
  run,
};
