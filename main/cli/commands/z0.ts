/**
 * `slackline z0`: Z0, eps_eff, velocity, delay and L/C per length of one trace (or an edge-coupled pair
 * with --spacing) from its cross-section. Parsing and printing only; the physics is core/stackup.
 */
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import {
  edgeCoupled, IMPEDANCE_MODELS, singleEnded, spacingForZdiff, STRUCTURES, validityNotes, widthForZ0, type FieldLabel, type ImpedanceModel, type PairProperties,
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
  --target-z0     Z   solve the width that gives Z0 = Z (then leave out --width)
  --target-zdiff  Z   solve the spacing that gives Zdiff = Z (then leave out --spacing; needs --width
                      or --target-z0)
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
      'target-z0': { type: 'string' },
      'target-zdiff': { type: 'string' },
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
  const targetZ0 = values['target-z0'] === undefined ? undefined
    : parseQuantity(values['target-z0'], 'resistance', '--target-z0', { min: 0, minExclusive: true });
  const targetZdiff = values['target-zdiff'] === undefined ? undefined
    : parseQuantity(values['target-zdiff'], 'resistance', '--target-zdiff', { min: 0, minExclusive: true });
  if (targetZ0 !== undefined && values.width !== undefined) throw new InputError('--width', 'leave it out with --target-z0 (the width is what is solved)');
  if (targetZdiff !== undefined && values.spacing !== undefined) throw new InputError('--spacing', 'leave it out with --target-zdiff (the spacing is what is solved)');
  const crossSection = {
    structure: kind as Structure,
    thickness: required(length(values.thickness, '--thickness', true), '--thickness'),
    below: required(length(values.below, '--below'), '--below'),
    above: length(values.above, '--above'),
    cover: length(values.cover, '--cover'),
    er: parseQuantity(required(values.er, '--er'), 'ratio', '--er', { min: 1 }),
    model: values.model as ImpedanceModel | undefined,
  };
  const width = targetZ0 !== undefined ? widthForZ0(targetZ0, crossSection) : required(length(values.width, '--width'), '--width');
  const geometry: TraceGeometry = { ...crossSection, width };
  const spacing = targetZdiff !== undefined ? spacingForZdiff(targetZdiff, geometry) : length(values.spacing, '--spacing');
  const result = spacing === undefined ? singleEnded(geometry, label) : edgeCoupled({ ...geometry, spacing }, label);
  const notes = validityNotes({ ...geometry, spacing });
  const solved = {
    ...(targetZ0 !== undefined ? { width } : {}),
    ...(targetZdiff !== undefined ? { spacing } : {}),
  };
  if (!values.json && Object.keys(solved).length) {
    const parts = Object.entries(solved).map(([name, m]) => `${name} ${formatIn(m as number, 'mil', 2)} (${formatIn(m as number, 'mm', 4)})`);
    io.out(`solved: ${parts.join(', ')}`);
  }
  if (values.json) {
    printJson(io, { ...result, ...solved, notes });
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
