/**
 * The design file's JSON Schema (draft 2020-12): the structure check every design file passes before
 * the rules of core/design/rules.ts, and the file editors use for completion
 * (docs/design-file.schema.json is this object printed; a test keeps the two equal). The schema checks
 * shape, key names and enumerations; units, ranges and cross-references are the rules' job because
 * they need messages a schema cannot give (docs/design-file.md §7).
 */

type Schema = Record<string, unknown>;

const quantity = (what: string): Schema => ({
  type: ['string', 'number'],
  description: `${what}, with its unit (a bare 0 is allowed)`,
});
const length = quantity('length: mm, um, mil, in');
const time = quantity('time: ps, ns, us');
const voltage = quantity('voltage: V, mV');
const resistance = quantity('resistance: ohm, kohm');
const capacitance = quantity('capacitance: pF, fF, nF');
const inductance = quantity('inductance: nH, pH, uH');
const ratio: Schema = { type: 'number', description: 'a plain number (no unit)' };
const nameText: Schema = { type: 'string', minLength: 1, description: 'a name, unique in its scope' };
const text: Schema = { type: 'string' };
const ref = (name: string): Schema => ({ $ref: `#/$defs/${name}` });
const strict = (properties: Record<string, Schema>, required: string[] = [], description?: string): Schema => ({
  type: 'object',
  ...(description ? { description } : {}),
  properties,
  required,
  additionalProperties: false,
});

const trace = strict(
  { layer: nameText, width: length, length, spacing: length },
  ['layer'],
  'a routed trace on a copper layer; width defaults to the layer\'s defaultWidth, length to 0 (not routed yet)',
);
const templateEndpoint = strict({ part: nameText, designator: nameText }, ['part', 'designator']);
const templateDriver = strict(
  { part: nameText, designator: nameText, node: { type: 'string', minLength: 1, description: 'the driver pin\'s node (default drv)' } },
  ['part', 'designator'],
);

export const DESIGN_SCHEMA: Schema = {
  $schema: 'https://json-schema.org/draft/2020-12/schema',
  $id: 'https://slackline.invalid/design-file.schema.json',
  title: 'Slackline design file, version 1',
  description: 'A whole board: project, stackup, parts, corners, buses and their nets (docs/design-file.md).',
  type: 'object',
  properties: {
    version: { const: 1, description: 'format version; 1' },
    project: ref('project'),
    stackup: ref('stackup'),
    parts: { type: 'array', items: ref('part') },
    ibisFiles: {
      type: 'array',
      items: ref('ibisFile'),
      description: 'IBIS files the parts use (docs/ibis.md §9); omit when none',
    },
    corners: { type: 'array', items: ref('corner'), description: 'omit for the starting slow/typical/fast corners' },
    buses: { type: 'array', items: ref('bus') },
    waivers: {
      type: 'array',
      items: ref('waiver'),
      description: 'reviewers\' waivers of failing or tight nets (docs/workbench.md, "Waivers"); omit when none',
    },
  },
  required: ['version', 'project', 'stackup', 'parts', 'buses'],
  additionalProperties: false,
  $defs: {
    waiver: strict(
      {
        net: nameText,
        check: { type: 'string', minLength: 1, description: 'the check waived: setup margin, hold margin, timing, or a signal check\'s name' },
        status: { enum: ['fail', 'tight'], description: 'the net\'s status when waived' },
        margin: { type: ['string', 'null'], description: 'that check\'s margin when waived, with its unit (time: ps, ns; voltage: V, mV), or null' },
        comment: { type: 'string', minLength: 1 },
        author: { type: 'string', minLength: 1 },
        at: { type: 'string', minLength: 1, description: 'when it was waived, ISO 8601 UTC' },
      },
      ['net', 'check', 'status', 'margin', 'comment', 'author', 'at'],
      'a reviewer\'s waiver of one net; it changes no result',
    ),
    project: strict(
      { name: nameText, boardRevision: text, description: text, guardBand: time, settleBand: voltage },
      ['name'],
    ),
    stackup: strict({ name: text, layers: { type: 'array', minItems: 1, items: ref('layer') } }, ['layers']),
    layer: strict(
      {
        name: nameText,
        kind: { enum: ['copper', 'dielectric', 'mask'] },
        thickness: length,
        dk: ratio,
        df: ratio,
        role: { enum: ['signal', 'plane'] },
        defaultWidth: length,
      },
      ['name', 'kind', 'thickness'],
    ),
    part: strict(
      {
        name: nameText,
        description: text,
        ioStandard: { type: 'string', description: 'an I/O standard preset name, or "" for a custom part' },
        driver: { anyOf: [ref('driver'), { type: 'null' }], description: 'omit (or null) for an input-only part' },
        receiver: { anyOf: [ref('receiver'), { type: 'null' }], description: 'omit (or null) for an output-only part' },
        ibis: strict(
          { file: nameText, model: nameText, pin: { type: 'string', minLength: 1, description: 'the [Pin] whose package the part sits behind; omit for the first pin that uses the model' } },
          ['file', 'model'],
          'an IBIS model for the pin: file names an ibisFiles entry, model a [Model] in it; the linear models stay as fallback and timing data',
        ),
      },
      ['name'],
    ),
    ibisFile: strict(
      { name: nameText, path: { type: 'string', minLength: 1, description: 'the .ibs file, relative to the design file' } },
      ['name', 'path'],
    ),
    driver: strict(
      {
        vol: voltage, voh: voltage, routHigh: resistance, routLow: resistance, riseTime: time, fallTime: time,
        tcoMin: time, tcoMax: time,
        refLoad: strict({ ohms: resistance, vtt: voltage, farads: capacitance }, ['ohms', 'vtt']),
        vmeas: voltage,
      },
      ['vol', 'voh', 'routHigh', 'routLow', 'riseTime', 'fallTime', 'tcoMin', 'tcoMax', 'refLoad', 'vmeas'],
      'linear driver model (docs/design.md §4)',
    ),
    receiver: strict(
      {
        cin: capacitance, vil: voltage, vih: voltage, vref: voltage,
        odtOhms: { type: ['string', 'number', 'null'], description: 'on-die termination, or null' },
        odtVtt: voltage, vmaxAbs: voltage, vminAbs: voltage, tsetup: time, thold: time,
        derating: {
          type: 'object',
          description: 'slew-rate derating of tsetup/thold (docs/design.md §6.4): signalSlews and strobeSlews in V/s (ascending), setup and hold rows per signal slew, values per strobe slew, in s',
        },
      },
      ['cin', 'vil', 'vih', 'vmaxAbs', 'vminAbs', 'tsetup', 'thold'],
    ),
    corner: strict(
      {
        name: nameText, driverStrength: ratio, edgeRate: ratio, dk: ratio, widthDelta: length, rail: ratio, cin: ratio,
        tco: { enum: ['min', 'max', 'typ'] },
      },
      ['name', 'driverStrength', 'edgeRate', 'dk', 'widthDelta', 'rail', 'cin', 'tco'],
    ),
    allowance: strict(
      { name: nameText, value: time, appliesTo: { enum: ['setup', 'hold', 'both'] }, note: text },
      ['name', 'value', 'appliesTo'],
    ),
    bus: strict(
      {
        name: nameText,
        kind: { enum: ['common-clock', 'source-synchronous'] },
        description: text,
        referenceNet: { type: ['string', 'null'], description: 'the clock (common clock) or strobe (source synchronous) net' },
        timing: strict(
          { cycleTime: time, clockSkew: time, jitter: time, tValidBefore: time, tValidAfter: time },
          [],
          'common clock: cycleTime, clockSkew, jitter; source synchronous: tValidBefore, tValidAfter',
        ),
        allowances: { type: 'array', items: ref('allowance') },
        cornerPairing: {
          type: ['string', 'array'],
          description: '"fixed" (corners as defined), "cross" (every silicon corner with every board corner) or a list of {silicon, board} corner names (docs/design.md §6.3)',
        },
        template: ref('template'),
        nets: { type: 'array', items: ref('net') },
      },
      ['name', 'kind', 'timing', 'nets'],
    ),
    template: strict(
      {
        role: ref('role'),
        driver: templateDriver,
        rails: ref('rails'),
        path: { type: 'array', minItems: 1, items: ref('step') },
      },
      ['driver', 'path'],
      'the topology every net of the bus gets unless it lists its own elements',
    ),
    step: strict(
      {
        name: { type: 'string', minLength: 1, description: 'a label a net can refer to in "steps" to replace or drop this step' },
        node: { type: 'string', minLength: 1, description: 'name of the node this step creates (default n1, n2, ...)' },
        trace,
        series: { ...resistance, description: 'series resistor, with its unit' },
        inductor: { ...inductance, description: 'series inductor, with its unit' },
        line: strict({ z0: resistance, delay: time }, ['z0', 'delay'], 'explicit line (connector, cable)'),
        via: { ...capacitance, description: 'via as a lumped capacitance to ground at this node' },
        cap: { ...capacitance, description: 'capacitor to ground at this node' },
        receiver: templateEndpoint,
        drop: strict({ via: capacitance, stub: trace, receiver: templateEndpoint }, ['receiver'], 'one receiver on an optional via and stub'),
        flyby: strict(
          { receivers: { type: 'array', minItems: 1, items: templateEndpoint }, via: capacitance, stub: trace, between: trace },
          ['receivers', 'between'],
          'N drops (one per receiver) joined by equal "between" traces',
        ),
        terminate: strict(
          { ohms: resistance, to: nameText, farads: capacitance },
          ['ohms', 'to'],
          'resistor from this node to a rail or gnd (with farads: an RC (AC) termination)',
        ),
      },
      [],
      'one step along the path from the driver; exactly one of trace, series, inductor, line, via, cap, receiver, drop, flyby, terminate',
    ),
    role: { enum: ['data', 'strobe', 'clock', 'address', 'command', 'control'] },
    rails: {
      type: 'object',
      additionalProperties: voltage,
      description: 'named fixed-voltage nodes, e.g. vtt: 0.6V',
    },
    endpoint: strict({ part: nameText, node: nameText, designator: nameText }, ['part', 'node', 'designator']),
    segmentOverride: strict({ layer: nameText, width: length, length, spacing: length }),
    element: strict(
      {
        kind: { enum: ['segment', 'line', 'resistor', 'capacitor', 'inductor', 'via'] },
        a: nameText, b: nameText, layer: nameText, width: length, length, spacing: length,
        z0: resistance, delay: time, ohms: resistance, farads: capacitance, henries: inductance,
      },
      ['kind', 'a'],
    ),
    net: strict(
      {
        name: nameText,
        role: ref('role'),
        segments: {
          type: 'array', items: ref('segmentOverride'),
          description: 'per-net overrides of the template\'s traces, in path order',
        },
        steps: {
          type: 'object',
          additionalProperties: { anyOf: [ref('step'), { type: 'null' }] },
          description: 'labelled template steps replaced (a step) or dropped (null) for this net',
        },
        driver: ref('endpoint'),
        receivers: { type: 'array', items: ref('endpoint') },
        rails: ref('rails'),
        elements: { type: 'array', items: ref('element'), description: 'an explicit tree instead of the template' },
      },
      ['name'],
    ),
  },
};
