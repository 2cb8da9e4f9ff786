/**
 * Project -> design file text. Every field of the model is written, every net as an explicit tree
 * under its bus, every dimensioned value with a unit and exactly the digits that read back to the
 * same number, so design -> project -> design -> project is lossless (docs/design-file.md §7, Round trip).
 */
import { Document, isMap, isSeq, visit } from 'yaml';
import { parseQuantity, type Dimension } from '../units/quantity.js';
import type { NetElement, PartModel, ProjectData, StackupLayer, Waiver } from '../project/model.js';

/** Units tried in order; the first that writes the value exactly in few digits wins. */
const UNITS: Record<Exclude<Dimension, 'ratio' | 'frequency'>, { unit: string; factor: number; above: number }[]> = {
  length: [{ unit: 'mm', factor: 1e-3, above: 0 }],
  time: [{ unit: 'ns', factor: 1e-9, above: 1e-9 }, { unit: 'ps', factor: 1e-12, above: 0 }],
  voltage: [{ unit: 'V', factor: 1, above: 0 }],
  resistance: [{ unit: 'ohm', factor: 1, above: 0 }],
  capacitance: [{ unit: 'pF', factor: 1e-12, above: 0 }],
  inductance: [{ unit: 'nH', factor: 1e-9, above: 0 }],
};
const SI_UNIT = { length: 'm', time: 's', voltage: 'V', resistance: 'ohm', capacitance: 'F', inductance: 'H' } as const;

/** "0.16mm", "2.5ns", "-0.3V"; the shortest text that parses back to exactly `si`. */
export function exactQuantity(si: number, dimension: keyof typeof UNITS): string | number {
  if (si === 0) return 0;
  const candidates = UNITS[dimension].filter((u) => Math.abs(si) >= u.above);
  for (const maxDigits of [7, 17]) {
    for (const { unit, factor } of candidates) {
      for (let digits = 1; digits <= maxDigits; digits += 1) {
        const text = `${Number((si / factor).toPrecision(digits))}${unit}`;
        if (parseQuantity(text, dimension, '') === si) return text;
      }
    }
  }
  return `${si}${SI_UNIT[dimension]}`; // a bare SI number times 1 always reads back exactly
}

const L = (v: number) => exactQuantity(v, 'length');
const T = (v: number) => exactQuantity(v, 'time');
const V = (v: number) => exactQuantity(v, 'voltage');
const R = (v: number) => exactQuantity(v, 'resistance');
const C = (v: number) => exactQuantity(v, 'capacitance');
const H = (v: number) => exactQuantity(v, 'inductance');

function layerValue(l: StackupLayer): Record<string, unknown> {
  const out: Record<string, unknown> = { name: l.name, kind: l.kind, thickness: L(l.thickness) };
  if (l.role !== undefined) out.role = l.role;
  if (l.dk !== undefined) out.dk = l.dk;
  if (l.df !== undefined) out.df = l.df;
  if (l.defaultWidth !== undefined) out.defaultWidth = L(l.defaultWidth);
  return out;
}

function partValue(p: PartModel): Record<string, unknown> {
  const out: Record<string, unknown> = { name: p.name, description: p.description, ioStandard: p.ioStandard };
  const d = p.driver;
  if (d) {
    out.driver = {
      vol: V(d.vol), voh: V(d.voh), routHigh: R(d.routHigh), routLow: R(d.routLow),
      riseTime: T(d.riseTime), fallTime: T(d.fallTime), tcoMin: T(d.tcoMin), tcoMax: T(d.tcoMax),
      refLoad: { ohms: R(d.refLoad.ohms), vtt: V(d.refLoad.vtt), farads: C(d.refLoad.farads) },
      vmeas: V(d.vmeas),
    };
  }
  const r = p.receiver;
  if (r) {
    out.receiver = {
      cin: C(r.cin), vil: V(r.vil), vih: V(r.vih), vref: V(r.vref),
      odtOhms: r.odtOhms === null ? null : R(r.odtOhms), odtVtt: V(r.odtVtt),
      vmaxAbs: V(r.vmaxAbs), vminAbs: V(r.vminAbs), tsetup: T(r.tsetup), thold: T(r.thold),
    };
    // the derating table in plain SI numbers (V/s, s)
    if (r.derating) (out.receiver as Record<string, unknown>).derating = JSON.parse(JSON.stringify(r.derating));
  }
  if (p.ibis) out.ibis = p.ibis.pin ? { file: p.ibis.file, model: p.ibis.model, pin: p.ibis.pin } : { file: p.ibis.file, model: p.ibis.model };
  return out;
}

function elementValue(e: NetElement): Record<string, unknown> {
  switch (e.kind) {
    case 'segment': {
      const out: Record<string, unknown> = { kind: e.kind, a: e.a, b: e.b, layer: e.layer, width: L(e.width), length: L(e.length) };
      if (e.spacing !== undefined) out.spacing = L(e.spacing);
      return out;
    }
    case 'line': return { kind: e.kind, a: e.a, b: e.b, z0: R(e.z0), delay: T(e.delay) };
    case 'resistor': return { kind: e.kind, a: e.a, b: e.b, ohms: R(e.ohms) };
    case 'capacitor': return { kind: e.kind, a: e.a, b: e.b, farads: C(e.farads) };
    case 'inductor': return { kind: e.kind, a: e.a, b: e.b, henries: H(e.henries) };
    case 'via': return { kind: e.kind, a: e.a, farads: C(e.farads) };
  }
}

/** A waiver with its margin as a quantity; a zero margin keeps its unit ("0ps") so it reads back as the same kind. */
function waiverValue(w: Waiver): Record<string, unknown> {
  const margin = w.margin === null || w.unit === null ? null
    : w.margin === 0 ? (w.unit === 's' ? '0ps' : '0V') : w.unit === 's' ? T(w.margin) : V(w.margin);
  return { net: w.net, check: w.check, status: w.status, margin, comment: w.comment, author: w.author, at: w.at };
}

/** The design file's data (plain values with units) for a project. */
export function projectToDesignValue(project: ProjectData): Record<string, unknown> {
  return {
    version: 1,
    project: {
      name: project.info.name,
      boardRevision: project.info.boardRevision,
      description: project.info.description,
      guardBand: T(project.info.guardBand),
      settleBand: V(project.info.settleBand),
    },
    stackup: { name: project.stackup.name, layers: project.stackup.layers.map(layerValue) },
    parts: project.parts.map(partValue),
    // Each IBIS file is referenced by its name as a path beside the design file: the host writes the
    // stored text there (core/design writes no files).
    ...(project.ibisFiles && project.ibisFiles.length > 0 ? { ibisFiles: project.ibisFiles.map((f) => ({ name: f.name, path: f.name })) } : {}),
    corners: project.corners.map((c) => ({
      name: c.name, driverStrength: c.driverStrength, edgeRate: c.edgeRate, dk: c.dk,
      widthDelta: L(c.widthDelta), rail: c.rail, cin: c.cin, tco: c.tco,
    })),
    buses: project.buses.map((b) => ({
      name: b.name,
      kind: b.kind,
      description: b.description,
      referenceNet: b.referenceNet,
      timing: b.timing.kind === 'common-clock'
        ? { cycleTime: T(b.timing.cycleTime), clockSkew: T(b.timing.clockSkew), jitter: T(b.timing.jitter) }
        : { tValidBefore: T(b.timing.tValidBefore), tValidAfter: T(b.timing.tValidAfter) },
      allowances: b.allowances.map((a) => ({ name: a.name, value: T(a.value), appliesTo: a.appliesTo, note: a.note })),
      ...(b.cornerPairing === undefined ? {} : { cornerPairing: typeof b.cornerPairing === 'string' ? b.cornerPairing : b.cornerPairing.map((x) => ({ ...x })) }),
      nets: project.nets.filter((n) => n.bus === b.name).map((n) => ({
        name: n.name,
        role: n.role,
        driver: { ...n.driver },
        receivers: n.receivers.map((r) => ({ ...r })),
        ...(Object.keys(n.rails).length > 0 ? { rails: Object.fromEntries(Object.entries(n.rails).map(([k, v]) => [k, V(v)])) } : {}),
        elements: n.elements.map(elementValue),
      })),
    })),
    ...(project.waivers && project.waivers.length > 0 ? { waivers: project.waivers.map(waiverValue) } : {}),
  };
}

/** Keys whose map values are short enough to read best on one line. */
const FLOW_PARENTS = new Set(['ibisFiles', 'ibis', 'layers', 'corners', 'allowances', 'receivers', 'elements', 'driver', 'refLoad', 'timing', 'rails']);

/** Design file text for a project (YAML, one element per line). */
export function projectToDesignText(project: ProjectData, header?: string): string {
  const doc = new Document(projectToDesignValue(project));
  visit(doc, {
    Pair(_, pair) {
      const key = String((pair.key as { value?: unknown })?.value ?? '');
      if (!FLOW_PARENTS.has(key)) return;
      if (isSeq(pair.value)) {
        for (const item of pair.value.items) if (isMap(item)) item.flow = true;
      } else if (isMap(pair.value)) {
        // A part's driver model is long: keep it in block style; a net's driver endpoint is short.
        const long = pair.value.items.length > 4;
        if (!long) pair.value.flow = true;
      }
    },
  });
  if (header) doc.commentBefore = header;
  return doc.toString({ lineWidth: 0, flowCollectionPadding: false });
}
