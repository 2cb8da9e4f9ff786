/**
 * `slackline z0`: Z0, eps_eff, velocity, delay and L/C per length of one trace (or an edge-coupled pair
 * with --spacing) from its cross-section. Parsing and printing only; the physics is core/stackup and
 * core/fieldsolve (which solver: core/stackup/field-choice.ts).
 */
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import {
  chooseSolver, edgeCoupled, fieldEdgeCoupled, fieldSingleEnded, IMPEDANCE_MODELS, singleEnded, SOLVERS, spacingForZdiff, STRUCTURES,
  plausibilityNotes, validityNotes, widthForZ0, type CrossSectionExtras, type FieldLabel, type ImpedanceModel, type PairProperties, type Solver,
  type Structure, type TraceGeometry, type TraceProperties,
} from '../../../core/stackup/index.js';
import { formatIn, parseQuantity } from '../../../core/units/index.js';
import { printJson, type CliCommand, type CliIo } from '../command.js';

const usage = `Usage: slackline z0 --kind KIND --width W --thickness T --below H1 [--above H2] [--cover H3]
                    --er ER [--spacing S] [--model MODEL] [--solver SOLVER]
                    [--mask THICKNESS --mask-er DK] [--etch FACTOR] [--json]

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
  --solver     ${SOLVERS.join(' | ')}: the 2-D field solver or the published closed forms. Default: the field
               solver for pairs, --mask, --etch, thick copper (T/h > 0.2), offset stripline and
               inputs outside the closed forms' validity; the closed forms otherwise
  --mask       solder-mask thickness over an outer (microstrip) trace, conforming over its top and
               sides (field solver); --mask-er DK is its relative permittivity
  --etch       etch factor T/undercut per side: the top is narrower than W by 2T/FACTOR (field solver)
  --json       machine-readable output in SI units (ohm, m/s, s/m, H/m, F/m); "method" says which
               solver gave the numbers ("field" adds "convergence", the relative estimate); "notes"
               lists inputs outside the closed form's published validity range

The field solver is quasi-static and lossless (docs/field-solver.md); the laminate vendor's data and
coupon measurements remain the authority.`;

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

function summary(geometry: TraceGeometry, p: TraceProperties | PairProperties, notes: string[], solver: Solver, convergence: number | undefined): string {
  const lines = [
    `${p.structure} (${p.model})`,
    `  method     ${solver === 'field' ? `field solver, convergence estimate ${((convergence ?? 0) * 100).toFixed(2)} %` : 'closed form'}`,
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
  lines.push(solver === 'field'
    ? 'Quasi-static 2-D field solution (lossless); vendor data and measured coupons remain the authority.'
    : 'Closed-form estimate; field solver, vendor data and measured coupons remain the authority.');
  return lines.join('\n');
}

/** --mask, --mask-er and --etch as the field solver's extras; errors name the flag. */
function crossSectionExtras(values: { mask?: string; 'mask-er'?: string; etch?: string }, kind: Structure): CrossSectionExtras {
  const extras: CrossSectionExtras = {};
  if (values['mask-er'] !== undefined && values.mask === undefined) throw new InputError('--mask-er', 'needs --mask THICKNESS');
  if (values.mask !== undefined) {
    if (kind !== 'microstrip') throw new InputError('--mask', `coats an outer (microstrip) trace, not ${kind}`);
    const thickness = length(values.mask, '--mask') as number;
    const er = parseQuantity(required(values['mask-er'], '--mask-er'), 'ratio', '--mask-er', { min: 1 });
    extras.mask = { thickness, er };
  }
  if (values.etch !== undefined) extras.etchFactor = parseQuantity(values.etch, 'ratio', '--etch', { min: 0, minExclusive: true });
  return extras;
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
      solver: { type: 'string' },
      mask: { type: 'string' },
      'mask-er': { type: 'string' },
      etch: { type: 'string' },
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
  // A stripline has two planes: the dielectric above is asked for, never assumed equal to --below.
  if ((kind === 'stripline' || kind === 'offset-stripline') && values.above === undefined) {
    throw new InputError('--above', `is required for ${kind}: the dielectric between the trace and the plane above (equal to --below for a centred stripline)`);
  }
  const crossSection = {
    structure: kind as Structure,
    thickness: required(length(values.thickness, '--thickness', true), '--thickness'),
    below: required(length(values.below, '--below'), '--below'),
    above: length(values.above, '--above'),
    cover: length(values.cover, '--cover'),
    er: parseQuantity(required(values.er, '--er'), 'ratio', '--er', { min: 1 }),
    model: values.model as ImpedanceModel | undefined,
  };
  if (values.solver !== undefined && !(SOLVERS as readonly string[]).includes(values.solver)) {
    throw new InputError('--solver', `unknown solver "${values.solver}" (known: ${SOLVERS.join(', ')})`);
  }
  const extras = crossSectionExtras(values, kind as Structure);
  const givenWidth = targetZ0 !== undefined ? undefined : required(length(values.width, '--width'), '--width');
  const givenSpacing = length(values.spacing, '--spacing');
  const pair = givenSpacing !== undefined || targetZdiff !== undefined;
  // One choice for the whole command: the geometry as given (the width to be solved counts as H1).
  const solver = chooseSolver({ ...crossSection, width: givenWidth ?? crossSection.below, ...(pair ? { spacing: givenSpacing ?? crossSection.below } : {}) },
    extras, values.solver as Solver | undefined);
  if (solver === 'closed-form' && (extras.mask || extras.etchFactor !== undefined)) {
    throw new InputError(extras.mask ? '--mask' : '--etch', 'the closed forms cannot model it; leave out --solver closed-form (or use --solver field)');
  }
  const inverse = { solver, ...extras };
  const width = givenWidth ?? widthForZ0(targetZ0 as number, crossSection, inverse);
  const geometry: TraceGeometry = { ...crossSection, width };
  if (extras.etchFactor !== undefined && !(width - (2 * geometry.thickness) / extras.etchFactor > 0)) {
    throw new InputError('--etch', `${extras.etchFactor} undercuts the ${formatIn(width, 'mil', 2)} trace to nothing (top width W − 2T/FACTOR <= 0)`);
  }
  const spacing = targetZdiff !== undefined ? spacingForZdiff(targetZdiff, geometry, inverse) : givenSpacing;
  let result: TraceProperties | PairProperties;
  let convergence: number | undefined;
  if (solver === 'field') {
    const r = spacing === undefined ? fieldSingleEnded(geometry, extras, label) : fieldEdgeCoupled({ ...geometry, spacing }, extras, label);
    const { method: _method, convergence: estimate, ...rest } = r;
    result = rest;
    convergence = estimate;
  } else {
    result = spacing === undefined ? singleEnded(geometry, label) : edgeCoupled({ ...geometry, spacing }, label);
  }
  const notes = [...(solver === 'closed-form' ? validityNotes({ ...geometry, spacing }) : []), ...plausibilityNotes({ ...geometry, spacing })];
  const solved = {
    ...(targetZ0 !== undefined ? { width } : {}),
    ...(targetZdiff !== undefined ? { spacing } : {}),
  };
  if (!values.json && Object.keys(solved).length) {
    const parts = Object.entries(solved).map(([name, m]) => `${name} ${formatIn(m as number, 'mil', 2)} (${formatIn(m as number, 'mm', 4)})`);
    io.out(`solved: ${parts.join(', ')}`);
  }
  if (values.json) {
    printJson(io, { ...result, method: solver, ...(convergence === undefined ? {} : { convergence }), ...solved, notes });
  } else {
    io.out(summary(geometry, result, notes, solver, convergence));
  }
  return 0;
}

export const command: CliCommand = {
  name: 'z0',
  summary: 'Z0, eps_eff, delay and L/C of a trace or edge-coupled pair from its cross-section (field solver or closed forms)',
  usage,
  run,
};
