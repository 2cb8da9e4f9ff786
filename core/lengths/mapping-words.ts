/**
 * The length import's preview in words (docs/design-file.md §6): the mapping rule stated once, which
 * segment each written row went to, why each other row is not written, and rows naming a layer the
 * stackup does not have turned into errors with their line (such a report belongs to another board or
 * another stackup revision, so nothing of it should be written).
 */
import type { NetDefinition, Stackup } from '../project/model.js';
import type { ImportRow, LengthImportPlan } from './length-report.js';

export const MAPPING_RULE =
  'Mapping rule: rows are grouped by net and layer in file order; the Nth row of a net on a layer sets the ' +
  'Nth segment of that net on that layer, counting in the net\'s element order (a template\'s traces in path ' +
  'order, stubs and fly-by traces included). Rows with no such segment, of nets outside the project, or on a ' +
  'layer that is not copper are listed and not written.';

/** A row with the segment it maps to, or the reason it is not written. */
export interface DescribedRow extends ImportRow {
  /** "segment 3 of DQ5 (2nd on L3_SIG)" for matched and changed rows. */
  target?: string;
  /** Why the row writes nothing (matched, new, unknown-layer, unknown-net). */
  reason?: string;
}

const ordinal = (n: number): string => {
  const tens = n % 100;
  const suffix = tens >= 11 && tens <= 13 ? 'th' : ['th', 'st', 'nd', 'rd'][n % 10] ?? 'th';
  return `${n}${suffix}`;
};

/** Adds the rule, per-row targets and reasons, and the missing-layer errors to an import plan. */
export function describeImportPlan(
  plan: LengthImportPlan,
  project: { stackup: Stackup; nets: readonly NetDefinition[] },
): LengthImportPlan {
  const { preview } = plan;
  const layers = new Map(project.stackup.layers.map((l) => [l.name, l]));
  const nets = new Map(project.nets.map((n) => [n.name, n]));
  const copperNames = project.stackup.layers.filter((l) => l.kind === 'copper').map((l) => l.name);
  const missingLayer: string[] = [];
  const seen = new Map<string, number>();
  const rows: DescribedRow[] = preview.rows.map((row) => {
    const key = `${row.net}\u0000${row.layer}`;
    const nth = (seen.get(key) ?? 0) + 1;
    seen.set(key, nth);
    const net = nets.get(row.net);
    const described: DescribedRow = { ...row };
    if ((row.status === 'matched' || row.status === 'changed') && row.elementIndex != null) {
      described.target = `segment ${row.elementIndex + 1} of ${row.net} (${ordinal(nth)} on ${row.layer})`;
      if (row.status === 'matched') described.reason = `equal to ${described.target} already; nothing to write`;
    } else if (row.status === 'new' && net) {
      const onLayer = net.elements.filter((e) => e.kind === 'segment' && e.layer === row.layer).length;
      described.reason = `${row.net} has ${onLayer} segment${onLayer === 1 ? '' : 's'} on ${row.layer}; ` +
        `this ${ordinal(nth)} row has none to set (add the segment to the net or its template first)`;
    } else if (row.status === 'unknown-layer') {
      const layer = layers.get(row.layer);
      if (layer) {
        described.reason = `${row.layer} is a ${layer.kind} layer of the stackup; segments run on copper layers`;
      } else {
        described.reason = `${row.layer} is not a layer of the stackup`;
        missingLayer.push(
          `${preview.file} line ${row.line}: layer "${row.layer}" (net ${row.net}) is not in the stackup ` +
            `(copper layers: ${copperNames.join(', ') || 'none'}); is the report from another board or stackup revision?`,
        );
      }
    } else if (row.status === 'unknown-net') {
      described.reason = `${row.net} is not a net of the project`;
    }
    return described;
  });
  const errors = [...preview.errors, ...missingLayer];
  return {
    preview: { ...preview, rows, errors, rule: MAPPING_RULE },
    updates: errors.length > 0 ? [] : plan.updates,
  };
}
