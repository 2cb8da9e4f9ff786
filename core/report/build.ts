/**
 * Builds the design-review margin report (docs/design.md §6, §9) from a project and its solved results: cover with
 * status per bus, stackup and corner tables, per bus the budget, margin table, skew chart and length
 * windows, per failing or tight net the reason, the suggestion and the receiver waveform, and what was
 * modelled or neglected. Pure: the same inputs give the same document.
 */
import { InputError } from '../errors.js';
import { formatIn } from '../units/quantity.js';
import type { LayerProperties } from '../stackup/index.js';
import type { NetWaveforms } from '../engine/waveforms.js';
import type { BoardResult, BusResult, NetResult, CornerTiming, BudgetLineItem, QualityCheck } from '../budget/results.js';
import type { ProjectData, BusDefinition, StackupLayer } from '../project/model.js';
import { ibisModelsUsed } from '../netbuild/ibis-parts.js';
import { skewChartOption, skewChartHeight, isReferenceNet } from '../charts/skew.js';
import { waveformChartOption } from '../charts/waveform.js';
import type { ReportBlock, ReportDocument, ReportTable, ReportColumn } from './document.js';
import { psCell, formatMarginPs, lengthPair, voltsCell, statusWord, fixed, dateTimeText } from './format.js';
import { pickWaveform, plotCorner } from './waveform-input.js';
import { MODELLED, NEGLECTED, CAUTION } from './scope-text.js';
import { MARGIN_COLUMNS as COLUMN_WORDS, marginDelta, netWorstMargin } from './columns.js';
import type { PreviousMargins } from './csv.js';
import type { Waiver } from '../project/model.js';
import { waivableCheck, waivedStatusText, waiverState } from '../budget/waiver.js';

export interface ReportInput {
  project: ProjectData;
  result: BoardResult;
  /** Routing layers' computed properties, or why they could not be computed. */
  layers: LayerProperties[] | { error: string };
  /** ISO time the report is generated (passed in: core reads no clock). */
  generatedAt: string;
  /** Report only this bus. */
  bus?: string;
  /** Simulated waveforms per net name, for the failing and tight nets' plots. */
  waveforms?: Record<string, NetWaveforms>;
  /**
   * The whole-board solve before `result` (per-net worst margins), for the "Δ vs previous solve"
   * column; null or absent when none is stored (the column is then empty and the report says so).
   */
  previous?: PreviousMargins | null;
}

/** Nets per skew chart, so a chart fits on one page at a readable row height. */
export const SKEW_NETS_PER_CHART = 32;
/**
 * Chart width, px: the PDF's text width (A4 less 48 pt margins, at 0.75 pt per px), so the PDF draws a
 * chart at its own size and the PDF and HTML share one drawing (main/services/report/chart-svg.ts).
 */
const CHART_WIDTH = 666;
const WAVEFORM_HEIGHT = 340;

/** Micrometres with one decimal and the µ sign (formatIn spells it "um"). */
function micrometres(metres: number): string {
  return Number.isFinite(metres) ? `${(metres / 1e-6).toFixed(1)} µm` : '—';
}

function col(title: string, weight: number, align: ReportColumn['align'] = 'right'): ReportColumn {
  return { title, weight, align };
}

function table(caption: string, t: ReportTable): ReportBlock {
  return { kind: 'table', caption, table: t };
}

/** The buses in scope; an unknown `bus` is the caller's input error. */
export function busesInScope(result: BoardResult, bus?: string): BusResult[] {
  if (bus === undefined) return result.buses;
  const found = result.buses.filter((b) => b.bus === bus);
  if (!found.length) {
    const known = result.buses.map((b) => b.bus).join(', ') || 'none';
    throw new InputError('selected bus', `no bus named "${bus}" in the results (buses: ${known})`);
  }
  return found;
}

function counts(bus: BusResult): Record<'pass' | 'tight' | 'fail', number> {
  const c = { pass: 0, tight: 0, fail: 0 };
  for (const n of bus.nets) c[n.status]++;
  return c;
}

/** Status word of a bus; a bus without nets was not evaluated, whatever its status field says. */
export function busStatusText(bus: BusResult): string {
  return bus.nets.length ? statusWord(bus.status) : 'NOT EVALUATED';
}

function overallText(all: BusResult[]): string {
  if (!all.length) return 'This project has no buses: there are no margins to report.';
  const empty = all.length - all.filter((b) => b.nets.length).length;
  const emptyText = empty ? ` ${empty} bus${empty > 1 ? 'es have' : ' has'} no nets and ${empty > 1 ? 'were' : 'was'} not evaluated.` : '';
  const buses = all.filter((b) => b.nets.length);
  if (!buses.length) return `No bus has nets: there are no margins to report.${emptyText}`;
  return overallEvaluated(buses) + emptyText;
}

function overallEvaluated(buses: BusResult[]): string {
  const failing = buses.filter((b) => b.status === 'fail').length;
  const tight = buses.filter((b) => b.status === 'tight').length;
  if (failing) return `Overall: FAIL. ${failing} of ${buses.length} bus${buses.length > 1 ? 'es' : ''} ha${failing > 1 ? 've' : 's'} failing nets.`;
  if (tight) return `Overall: TIGHT. Every net passes, but ${tight} of ${buses.length} bus${buses.length > 1 ? 'es' : ''} ha${tight > 1 ? 've' : 's'} nets inside the guard band.`;
  return `Overall: PASS. Every net of ${buses.length} bus${buses.length > 1 ? 'es' : ''} passes with margin above the guard band.`;
}

function cover(input: ReportInput, buses: BusResult[]): ReportBlock[] {
  const { project, result } = input;
  const blocks: ReportBlock[] = [
    { kind: 'heading', level: 1, text: 'Timing margin report' },
    {
      kind: 'facts',
      items: [
        { label: 'Project', value: project.info.name },
        { label: 'Board revision', value: project.info.boardRevision || '—' },
        ...(project.info.description ? [{ label: 'Description', value: project.info.description }] : []),
        { label: 'Report date', value: dateTimeText(input.generatedAt) },
        { label: 'Results solved', value: dateTimeText(result.solvedAt) },
        { label: 'Input fingerprint', value: result.fingerprint },
        { label: 'Tool version', value: `Slackline ${result.toolVersion}` },
        { label: 'Scope', value: input.bus === undefined ? `all buses (${buses.length})` : `bus ${input.bus} only` },
        { label: 'Guard band', value: `nets with margin below ${formatIn(project.info.guardBand, 'ps', 1)} are reported as tight` },
      ],
    },
    { kind: 'paragraph', text: overallText(buses), tone: buses.some((b) => b.status === 'fail') ? 'caution' : 'normal' },
    table('Status per bus (margins in ps; worst over nets, corners, receivers and edges)', {
      columns: [
        col('Bus', 1.4, 'left'), col('Kind', 2.2, 'left'), col('Nets', 0.7), col('Pass', 0.7), col('Tight', 0.7),
        col('Fail', 0.7), col('Waived', 0.8), col('Worst setup (ps)', 1.2), col('Worst hold (ps)', 1.2), col('Worst net', 1.3, 'left'), col('Status', 0.9, 'center'),
      ],
      rows: buses.map((b) => {
        const c = counts(b);
        const empty = b.nets.length === 0;
        return {
          cells: [b.bus, b.kind, String(b.nets.length), String(c.pass), String(c.tight), String(c.fail), waivedCount(input, b),
            empty ? '—' : psCell(b.worstSetup), empty ? '—' : psCell(b.worstHold), b.worstNet ?? '—', busStatusText(b)],
          ...(empty ? {} : { status: b.status }),
        };
      }),
      emptyText: 'This project has no buses: there is nothing to evaluate.',
      statusColumn: 10,
    }),
    { kind: 'paragraph', text: 'Waived nets keep their status: they are counted under Pass, Tight or Fail as computed, and again under Waived (stale waivers in brackets). The section "Waived nets" lists each waiver.', tone: 'note' },
    { kind: 'paragraph', text: CAUTION, tone: 'note' },
  ];
  return blocks;
}

function layerKind(layer: StackupLayer): string {
  if (layer.kind === 'copper') return layer.role === 'plane' ? 'copper, plane' : 'copper, signal';
  return layer.kind;
}

function stackupSection(input: ReportInput): ReportBlock[] {
  const { stackup } = input.project;
  const blocks: ReportBlock[] = [
    { kind: 'heading', level: 2, text: `Stackup: ${stackup.name}` },
    table('Layers, top to bottom', {
      columns: [col('#', 0.4), col('Layer', 1.4, 'left'), col('Type', 1.5, 'left'), col('Thickness', 1.8), col('Dk', 0.7), col('Df', 0.7)],
      rows: stackup.layers.map((l, i) => ({
        cells: [String(i + 1), l.name, layerKind(l), `${micrometres(l.thickness)} (${formatIn(l.thickness, 'mil', 2)})`, fixed(l.dk, 2), fixed(l.df, 4)],
      })),
      emptyText: 'The stackup has no layers.',
    }),
  ];
  if ('error' in input.layers) {
    blocks.push({ kind: 'paragraph', text: `Routing-layer properties could not be computed: ${input.layers.error}`, tone: 'caution' });
  } else {
    blocks.push(table('Routing layers at their default width (Z0 and delay computed from the stackup)', {
      columns: [col('Layer', 1.2, 'left'), col('Structure', 1.8, 'left'), col('Width', 1.7), col('Z0 (Ω)', 0.9), col('εeff', 0.8), col('Delay (ps/in)', 1.1), col('Delay (ps/mm)', 1.1)],
      rows: input.layers.map((p) => ({
        cells: [p.layer, p.structure, `${formatIn(p.width, 'mm', 3)} (${formatIn(p.width, 'mil', 1)})`, fixed(p.z0, 1), fixed(p.epsEff, 2),
          formatIn(p.delayPerMetre, 'ps/in', 1, false), formatIn(p.delayPerMetre, 'ps/mm', 2, false)],
      })),
      emptyText: 'The stackup has no routing layers.',
    }));
  }
  // IBIS models the parts use (docs/ibis.md §9): each file named with the SHA-256 of its stored text.
  const ibis = ibisModelsUsed(input.project);
  if (ibis.length > 0) {
    blocks.push(table('IBIS models used (file content identified by its SHA-256)', {
      columns: [col('Part', 1.1, 'left'), col('Model', 1.1, 'left'), col('Package of pin', 1.1, 'left'), col('File', 1.3, 'left'), col('SHA-256', 3.9, 'left')],
      rows: ibis.map((m) => ({ cells: [m.part, m.model, m.pin ?? 'first using it', m.file, m.sha256 ?? 'not in the project'] })),
      emptyText: '',
    }));
  }
  return blocks;
}

function cornerSection(input: ReportInput): ReportBlock[] {
  return [
    { kind: 'heading', level: 2, text: 'Corners' },
    { kind: 'paragraph', text: 'Each corner scales the nominal values: a factor of 1 is typical. Width change is added to every trace width (negative = narrower = higher Z0).' },
    table('Corner definitions', {
      columns: [col('Corner', 1.2, 'left'), col('Driver R ×', 1), col('Edge time ×', 1), col('Dk ×', 0.8), col('Width change', 1.2), col('Rails ×', 0.8), col('Cin ×', 0.8), col('Tco used', 0.9, 'center')],
      rows: input.project.corners.map((c) => ({
        cells: [c.name, fixed(c.driverStrength, 2), fixed(c.edgeRate, 2), fixed(c.dk, 3), micrometres(c.widthDelta), fixed(c.rail, 3), fixed(c.cin, 2), c.tco],
      })),
      emptyText: 'The project defines no corners.',
    }),
  ];
}

function busFacts(bus: BusResult, def: BusDefinition | undefined): { label: string; value: string }[] {
  const items = [{ label: 'Kind', value: bus.kind }];
  if (def?.description) items.push({ label: 'Description', value: def.description });
  if (def?.referenceNet) items.push({ label: def.kind === 'source-synchronous' ? 'Strobe' : 'Clock', value: def.referenceNet });
  if (def?.timing.kind === 'common-clock') {
    items.push({ label: 'Cycle time', value: formatIn(def.timing.cycleTime, 'ps', 1) });
    items.push({ label: 'Clock skew (to driver minus to receiver)', value: formatIn(def.timing.clockSkew, 'ps', 1) });
    items.push({ label: 'Jitter', value: formatIn(def.timing.jitter, 'ps', 1) });
  } else if (def?.timing.kind === 'source-synchronous') {
    items.push({ label: 'Data valid before / after strobe', value: `${formatIn(def.timing.tValidBefore, 'ps', 1)} / ${formatIn(def.timing.tValidAfter, 'ps', 1)}` });
  }
  items.push({ label: 'Nets', value: String(bus.nets.length) });
  if (bus.nets.length) {
    items.push({ label: 'Worst setup margin', value: formatMarginPs(bus.worstSetup) });
    items.push({ label: 'Worst hold margin', value: formatMarginPs(bus.worstHold) });
    items.push({ label: 'Worst net', value: bus.worstNet ?? '—' });
  }
  return items;
}

/** The report's margin table columns, in order, with the unit of their cells (definitions: core/report/columns.ts). */
const REPORT_MARGIN_COLUMNS = [
  { key: 'net', unit: '', weight: 1.1, align: 'left' },
  { key: 'role', unit: '', weight: 0.8, align: 'left' },
  { key: 'flightMin', unit: 'ps', weight: 1 },
  { key: 'flightMax', unit: 'ps', weight: 1 },
  { key: 'skew', unit: 'ps', weight: 0.9 },
  { key: 'setup', unit: 'ps', weight: 1 },
  { key: 'hold', unit: 'ps', weight: 1 },
  { key: 'margin', unit: 'ps', weight: 1 },
  { key: 'delta', unit: 'ps', weight: 1.1 },
  { key: 'worstCorner', unit: '', weight: 1, align: 'left' },
  { key: 'status', unit: '', weight: 1.2, align: 'center' },
] as const satisfies readonly { key: keyof typeof COLUMN_WORDS; unit: string; weight: number; align?: ReportColumn['align'] }[];

const MARGIN_COLUMNS = REPORT_MARGIN_COLUMNS.map((c) =>
  col(c.unit ? `${COLUMN_WORDS[c.key].label} (${c.unit})` : COLUMN_WORDS[c.key].label, c.weight, 'align' in c ? c.align : 'right'));
const STATUS_COLUMN = REPORT_MARGIN_COLUMNS.findIndex((c) => c.key === 'status');

/** A signed ps cell: "+1.2", "-3.0", "0.0". */
function signedPsCell(seconds: number | null): string {
  const cell = psCell(seconds);
  return cell === '—' || cell.startsWith('-') || cell === '0.0' ? cell : `+${cell}`;
}

function waiverOf(input: ReportInput, net: string): Waiver | undefined {
  return input.project.waivers?.find((w) => w.net === net);
}

/** "2" or "2 (1 stale)": the waived nets of a bus. */
function waivedCount(input: ReportInput, bus: BusResult): string {
  const states = bus.nets.flatMap((n) => {
    const w = waiverOf(input, n.net);
    return w ? [waiverState(w, n).state] : [];
  });
  const stale = states.filter((s) => s === 'stale').length;
  return stale ? `${states.length} (${stale} stale)` : String(states.length);
}

function statusCell(input: ReportInput, n: NetResult): string {
  const w = waiverOf(input, n.net);
  return waivedStatusText(n.status, w ? waiverState(w, n).state : null).replace(/^(pass|tight|fail)/, (s) => s.toUpperCase());
}

function previousText(input: ReportInput): string {
  const p = input.previous;
  return p
    ? `Δ vs previous solve compares with the whole-board solve of ${dateTimeText(p.solvedAt)} (the one before these results of ${dateTimeText(input.result.solvedAt)}).`
    : 'Δ vs previous solve is empty: no earlier whole-board solve of this project is stored.';
}

function marginTable(input: ReportInput, bus: BusResult): ReportBlock[] {
  const before = input.previous?.margins ?? {};
  return [
    table(`Margin table, ${bus.bus} (worst over corners, receivers and edges)`, {
      columns: MARGIN_COLUMNS,
      rows: bus.nets.map((n) => {
        const worst = netWorstMargin(n);
        const values: Record<(typeof REPORT_MARGIN_COLUMNS)[number]['key'], string> = {
          net: n.net, role: n.role, flightMin: psCell(n.flightMin), flightMax: psCell(n.flightMax), skew: psCell(n.skew),
          setup: psCell(n.setupMargin), hold: psCell(n.holdMargin), margin: psCell(worst),
          delta: signedPsCell(marginDelta(worst, before[n.net])), worstCorner: n.worstCorner, status: statusCell(input, n),
        };
        return { cells: REPORT_MARGIN_COLUMNS.map((c) => values[c.key]), status: n.status };
      }),
      emptyText: 'This bus has no nets.',
      statusColumn: STATUS_COLUMN,
    }),
    { kind: 'paragraph', text: previousText(input), tone: 'note' },
  ];
}

/**
 * One definition per margin-table column, the same words as the workbench's header tooltips, printed
 * once ahead of the bus sections (every bus's table has the same columns).
 */
function marginColumnSection(buses: readonly BusResult[]): ReportBlock[] {
  if (!buses.some((b) => b.nets.length)) return [];
  return [
    { kind: 'heading', level: 2, text: 'Margin table columns' },
    { kind: 'paragraph', text: 'Every bus section has a margin table with these columns, each the worst over corners, receivers and edges.' },
    { kind: 'facts', items: REPORT_MARGIN_COLUMNS.map((c) => ({ label: COLUMN_WORDS[c.key].label, value: COLUMN_WORDS[c.key].definition })) },
  ];
}

/** The net and corner where `margin` is smallest, with that corner's line items. */
function worstBudget(bus: BusResult, which: 'setup' | 'hold'): { net: NetResult; corner: CornerTiming } | null {
  let best: { net: NetResult; corner: CornerTiming } | null = null;
  // A strobe/clock row repeats its data nets' margins and items; name the data net that owns them.
  const own = bus.nets.filter((n) => !n.marginsFrom);
  for (const net of own.length ? own : bus.nets) {
    for (const corner of net.corners) {
      // A clock or strobe checked for signal quality only has no budget of its own.
      if (!(which === 'setup' ? corner.setupItems : corner.holdItems).length) continue;
      const m = which === 'setup' ? corner.setupMargin : corner.holdMargin;
      if (m === null || !Number.isFinite(m)) continue;
      const bm = best ? (which === 'setup' ? best.corner.setupMargin : best.corner.holdMargin) ?? Infinity : Infinity;
      if (m < bm) best = { net, corner };
    }
  }
  return best;
}

function budgetTable(bus: BusResult, which: 'setup' | 'hold'): ReportBlock[] {
  const worst = worstBudget(bus, which);
  if (!worst) return [{ kind: 'paragraph', text: `No ${which} budget: no net of this bus has a ${which} margin at any corner.`, tone: 'note' }];
  const items: BudgetLineItem[] = which === 'setup' ? worst.corner.setupItems : worst.corner.holdItems;
  const margin = which === 'setup' ? worst.corner.setupMargin : worst.corner.holdMargin;
  return [
    table(`${which === 'setup' ? 'Setup' : 'Hold'} budget of the worst net, ${worst.net.net} at the ${worst.corner.corner} corner (signed: margin = sum of the values)`, {
      columns: [col('Line item', 1.6, 'left'), col('Value (ps)', 0.9), col('Source', 0.9, 'left'), col('Detail', 3, 'left')],
      rows: [
        ...items.map((item) => ({ cells: [item.name, psCell(item.value), item.source, item.detail] })),
        { cells: [`${which === 'setup' ? 'Setup' : 'Hold'} margin`, psCell(margin), '', ''], total: true },
      ],
      emptyText: 'The budget has no line items.',
    }),
  ];
}

function skewCharts(bus: BusResult): ReportBlock[] {
  if (!bus.nets.length) return [];
  const refs = bus.nets.filter(isReferenceNet);
  const data = bus.nets.filter((n) => !isReferenceNet(n));
  const per = Math.max(1, SKEW_NETS_PER_CHART - refs.length);
  const parts = Math.max(1, Math.ceil(data.length / per));
  const blocks: ReportBlock[] = [];
  for (let p = 0; p < parts; p++) {
    const nets = [...refs, ...data.slice(p * per, (p + 1) * per)];
    const title = parts > 1 ? `${bus.bus}: flight-time window per net (${p + 1} of ${parts})` : undefined;
    blocks.push({
      kind: 'chart',
      chart: {
        alt: `Skew chart of bus ${bus.bus}${parts > 1 ? `, part ${p + 1} of ${parts}` : ''}: minimum to maximum flight time of ${nets.length} nets in ps.`,
        option: skewChartOption({ ...bus, nets }, title ? { title } : {}),
        width: CHART_WIDTH,
        height: skewChartHeight(nets.length),
      },
    });
  }
  return blocks;
}

function lengthWindows(bus: BusResult): ReportBlock {
  const nets = bus.nets.filter((n) => n.lengthWindow);
  return table(`Length windows for layout, ${bus.bus} (the routed length that keeps both margins and the signal checks passing, rest of the bus as routed)`, {
    columns: [col('Net', 0.9, 'left'), col('Seg.', 0.45), col('Layer', 0.75, 'left'), col('Current (mm / mil)', 1.25), col('Min (mm / mil)', 1.25), col('Max (mm / mil)', 1.25), col('Note', 3.2, 'left')],
    rows: nets.map((n) => {
      const w = n.lengthWindow!;
      return { cells: [n.net, String(w.elementIndex + 1), w.layer, lengthPair(w.current), lengthPair(w.min), lengthPair(w.max), w.note], status: n.status };
    }),
    emptyText: 'No length windows were computed for this bus.',
  });
}

/**
 * One phrase per failed check kind, with the worst case spelled out and the rest counted, e.g.
 * "overshoot at U3, rising edge, fast corner: 2.68 V against a limit of 2.10 V (and 2 more cases)".
 * A fly-by net can fail one check at every receiver, edge and corner; listing each reads as noise.
 */
function failedCheckSummary(failed: QualityCheck[]): string[] {
  const byName = new Map<string, QualityCheck[]>();
  for (const q of failed) byName.set(q.name, [...(byName.get(q.name) ?? []), q]);
  return [...byName.values()].map((cases) => {
    const worst = cases.reduce((a, b) => (b.limit !== null && a.limit !== null && Math.abs(b.value - b.limit) > Math.abs(a.value - a.limit) ? b : a));
    const where = `at ${worst.receiver}, ${worst.edge} edge, ${worst.corner} corner`;
    const head = worst.limit === null
      ? `${worst.name} check failed ${where}`
      : `${worst.name} ${where}: ${voltsCell(worst.value)} against a limit of ${voltsCell(worst.limit)}`;
    const receivers = new Set(cases.map((q) => q.receiver)).size;
    const more = cases.length - 1;
    return more > 0 ? `${head} (and ${more} more case${more === 1 ? '' : 's'} over ${receivers} receiver${receivers === 1 ? '' : 's'})` : head;
  });
}

function suggestionText(net: NetResult): string | null {
  const s = net.suggestion;
  if (!s) return null;
  const kind = s.kind === 'series' ? 'series resistor at the driver' : 'parallel termination at the far end';
  const unit = s.marginUnit ?? (Math.abs(s.marginBefore) < 1e-6 && Math.abs(s.marginAfter) < 1e-6 ? 's' : 'V');
  const change = unit === 's'
    ? `worst-corner margin ${formatMarginPs(s.marginBefore)} before, ${formatMarginPs(s.marginAfter)} after`
    : `worst-corner signal margin ${voltsCell(s.marginBefore)} before, ${voltsCell(s.marginAfter)} after`;
  return `Suggested termination: ${s.ohms} Ω ${kind}; ${change}.${s.note ? ` ${s.note}` : ''}`;
}

function railsOf(input: ReportInput, netName: string, cornerName: string): { low: number; high: number } | null {
  const def = input.project.nets.find((n) => n.name === netName);
  const driver = def ? input.project.parts.find((p) => p.name === def.driver.part)?.driver : null;
  if (!driver) return null;
  const rail = input.project.corners.find((c) => c.name === cornerName)?.rail ?? 1;
  return { low: driver.vol * rail, high: driver.voh * rail };
}

function attentionSection(input: ReportInput, bus: BusResult): ReportBlock[] {
  const nets = bus.nets.filter((n) => n.status !== 'pass');
  if (!nets.length) return bus.nets.length ? [{ kind: 'paragraph', text: `Every net of ${bus.bus} passes with margin above the guard band.` }] : [];
  const blocks: ReportBlock[] = [{ kind: 'heading', level: 3, text: `Failing and tight nets of ${bus.bus} (${nets.length})` }];
  for (const net of nets) {
    blocks.push({ kind: 'heading', level: 3, text: `${net.net}: ${statusWord(net.status)}`, status: net.status });
    blocks.push({
      kind: 'facts',
      items: [
        { label: 'Worst corner', value: net.worstCorner },
        { label: 'Setup / hold margin', value: `${formatMarginPs(net.setupMargin)} / ${formatMarginPs(net.holdMargin)}` },
        { label: 'Flight time min / max', value: `${psCell(net.flightMin)} / ${psCell(net.flightMax)} ps` },
        ...waiverFact(input, net),
      ],
    });
    blocks.push({ kind: 'list', items: net.reasons.length ? net.reasons : ['No reason was recorded for this status.'] });
    const failed = failedCheckSummary(net.quality.filter((q) => !q.pass));
    if (failed.length) blocks.push({ kind: 'paragraph', text: `Failed signal checks: ${failed.join('; ')}.` });
    const suggestion = suggestionText(net);
    if (suggestion) blocks.push({ kind: 'paragraph', text: suggestion });
    const waveforms = input.waveforms?.[net.net];
    const def = input.project.nets.find((n) => n.name === net.net);
    const nodeOf = (receiver: string) => def?.receivers.find((r) => r.designator === receiver)?.node ?? receiver;
    const pick = waveforms ? pickWaveform(net, waveforms, railsOf(input, net.net, plotCorner(net)), nodeOf) : null;
    if (pick) {
      blocks.push({
        kind: 'chart',
        chart: {
          alt: `Receiver waveform of ${net.net} at ${pick.receiver}, ${pick.corner} corner: voltage in V against time in ns, rising and falling edge, with VIL, VIH and limits marked.`,
          option: waveformChartOption(pick.input),
          width: CHART_WIDTH,
          height: WAVEFORM_HEIGHT,
        },
      });
    } else {
      blocks.push({ kind: 'paragraph', text: 'No waveform was supplied for this net, so none is plotted.', tone: 'note' });
    }
  }
  return blocks;
}

function waiverFact(input: ReportInput, net: NetResult): { label: string; value: string }[] {
  const w = waiverOf(input, net.net);
  if (!w) return [];
  const state = waiverState(w, net);
  return [{ label: 'Waiver', value: `waived by ${w.author} on ${dateTimeText(w.at)}${state.state === 'stale' ? `; STALE, needs review: ${state.why}` : ''} (see "Waived nets")` }];
}

/** A check's margin with its unit: "-14.0 ps", "-12.3 mV"; "no number" without one. */
function checkMargin(margin: number | null, unit: 's' | 'V' | null): string {
  if (margin === null || unit === null) return 'no number';
  return unit === 's' ? formatMarginPs(margin) : `${(margin / 1e-3).toFixed(1)} mV`;
}

/**
 * Every waiver of a net in scope, with who, when, why and what it waives, and whether the result still
 * matches it (docs/workbench.md, "Waivers"). A waiver hides nothing: the nets stay in their tables with
 * their status.
 */
function waiverSection(input: ReportInput, buses: BusResult[]): ReportBlock[] {
  const nets = buses.flatMap((b) => b.nets.map((n) => ({ bus: b.bus, net: n, waiver: waiverOf(input, n.net) })))
    .filter((x): x is { bus: string; net: NetResult; waiver: Waiver } => x.waiver !== undefined);
  const blocks: ReportBlock[] = [{ kind: 'heading', level: 2, text: `Waived nets (${nets.length})` }];
  if (!nets.length) {
    blocks.push({ kind: 'paragraph', text: 'No net in this report is waived.', tone: 'note' });
    return blocks;
  }
  const stale = nets.filter((x) => waiverState(x.waiver, x.net).state === 'stale').length;
  blocks.push({
    kind: 'paragraph',
    text: `A waiver records a reviewer's acceptance of a failing or tight net as it was then; it changes no status or margin. ${stale ? `${stale} of ${nets.length} waiver${nets.length === 1 ? ' is' : 's are'} stale: the net's result no longer matches what was waived, so it needs review.` : 'Every waiver still matches its net\'s result.'}`,
    tone: stale ? 'caution' : 'normal',
  });
  for (const { bus, net, waiver } of nets) {
    const state = waiverState(waiver, net);
    const now = waivableCheck(net);
    blocks.push({ kind: 'heading', level: 3, text: `${net.net} (bus ${bus}): ${statusCell(input, net)}`, status: net.status });
    blocks.push({
      kind: 'facts',
      items: [
        { label: 'Waived check', value: `${waiver.check}, ${waiver.status}, margin ${checkMargin(waiver.margin, waiver.unit)} when waived` },
        { label: 'Now', value: now ? `${now.check}, ${now.status}, margin ${checkMargin(now.margin, now.unit)}` : 'the net passes every check' },
        { label: 'Waiver', value: state.state === 'stale' ? `STALE, needs review: ${state.why}` : 'current: the result matches what was waived' },
        { label: 'Author', value: waiver.author },
        { label: 'Date', value: dateTimeText(waiver.at) },
        { label: 'Comment', value: waiver.comment },
      ],
    });
  }
  return blocks;
}

function busSection(input: ReportInput, bus: BusResult): ReportBlock[] {
  const def = input.project.buses.find((b) => b.name === bus.bus);
  const blocks: ReportBlock[] = [
    { kind: 'pageBreak' },
    { kind: 'heading', level: 2, text: `Bus ${bus.bus}: ${busStatusText(bus)}`, ...(bus.nets.length ? { status: bus.status } : {}) },
    { kind: 'facts', items: busFacts(bus, def) },
  ];
  if (bus.note) blocks.push({ kind: 'paragraph', text: bus.note, tone: 'note' });
  if (!bus.nets.length) {
    blocks.push({ kind: 'paragraph', text: `Bus ${bus.bus} has no nets, so it has no margins, skew or length windows to report.`, tone: 'caution' });
    return blocks;
  }
  blocks.push(...marginTable(input, bus), ...budgetTable(bus, 'setup'), ...budgetTable(bus, 'hold'), ...skewCharts(bus), lengthWindows(bus), ...attentionSection(input, bus));
  return blocks;
}

function scopeSection(): ReportBlock[] {
  return [
    { kind: 'pageBreak' },
    { kind: 'heading', level: 2, text: 'What was modelled and what was neglected' },
    { kind: 'heading', level: 3, text: 'Modelled' },
    { kind: 'list', items: [...MODELLED] },
    { kind: 'heading', level: 3, text: 'Neglected' },
    { kind: 'list', items: [...NEGLECTED] },
    { kind: 'paragraph', text: CAUTION, tone: 'caution' },
  ];
}

/** The whole report. Throws InputError when `bus` names no bus of the results. */
export function buildReport(input: ReportInput): ReportDocument {
  const buses = busesInScope(input.result, input.bus);
  const blocks: ReportBlock[] = [
    ...cover(input, buses),
    { kind: 'pageBreak' },
    ...stackupSection(input),
    ...cornerSection(input),
    ...waiverSection(input, buses),
    ...marginColumnSection(buses),
    ...(buses.length
      ? buses.flatMap((b) => busSection(input, b))
      : [
          { kind: 'heading', level: 2, text: 'Buses' } as const,
          { kind: 'paragraph', text: 'This project has no buses, so there are no budgets, margin tables, skew charts or length windows to show.', tone: 'caution' } as const,
        ]),
    ...scopeSection(),
  ];
  const { info } = input.project;
  return {
    title: 'Timing margin report',
    subtitle: `${info.name}, board revision ${info.boardRevision || '—'}`,
    footer: `${info.name} rev ${info.boardRevision || '—'} · fingerprint ${input.result.fingerprint.slice(0, 16)} · ${dateTimeText(input.generatedAt)}`,
    blocks,
  };
}
