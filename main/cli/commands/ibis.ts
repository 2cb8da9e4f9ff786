/**
 * `slackline ibis FILE.ibs [--json]`: reads an IBIS file (docs/ibis.md), lists its components, pins and
 * models, reports skipped keywords by line, and prints the V-I/V-T end-point check per waveform.
 * A malformed file exits 2 with file, line and keyword.
 */
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import { parseIbis } from '../../../core/ibis/parse.js';
import { type IbisSummary, summariseIbis } from '../../../core/ibis/summary.js';
import type { Triple } from '../../../core/ibis/types.js';
import { formatIn } from '../../../core/units/quantity.js';
import { type CliCommand, type CliIo, printJson } from '../command.js';
import { ProjectStore } from '../../services/project/project-store.js';

const usage = `Usage: slackline ibis FILE.ibs [--json] [--into PROJECT]

Reads an IBIS buffer-model file (ANSI/EIA-656): lists the components, pins and models (Model_type,
C_comp, voltage range, which tables are present, how the switching coefficients are found), names every
keyword it skips by line, and compares the V-I operating points into each waveform's fixture with the
waveform's end points (mismatch in % of the rail voltage).

  --json           print the same as JSON (SI units: V, A, s, ohm, F, H)
  --into PROJECT   also store the file in the project file PROJECT (docs/ibis.md §9): checked
                   completely first, nothing is written when it has an error`;

const pf = (x: number | null) => (x === null ? 'NA' : formatIn(x, 'pF', 2));
const v = (x: number | null) => (x === null ? '—' : formatIn(x, 'V', 3));
const triple = (t: Triple | null, f: (x: number | null) => string) => (t ? `${f(t.typ)} / ${f(t.min)} / ${f(t.max)}` : '—');

function text(s: IbisSummary): string {
  const lines = [`${s.source}: IBIS ${s.version}, ${s.components.length} component(s), ${s.models.length} model(s)`];
  for (const c of s.components) {
    lines.push('', `component ${c.name}${c.manufacturer ? ` (${c.manufacturer})` : ''}`);
    if (c.package) {
      lines.push(`  package R ${triple(c.package.rPkg, (x) => (x === null ? 'NA' : formatIn(x, 'Ω', 3)))}, ` +
        `L ${triple(c.package.lPkg, (x) => (x === null ? 'NA' : formatIn(x, 'nH', 2)))}, C ${triple(c.package.cPkg, pf)} (typ / min / max)`);
    }
    lines.push(`  pins: ${c.pins.map((p) => `${p.pin} ${p.signal} -> ${p.model}`).join(', ')}`);
  }
  for (const sel of s.selectors) lines.push('', `model selector ${sel.name}: ${sel.models.join(', ')}`);
  for (const m of s.models) {
    lines.push('', `model ${m.name} (line ${m.line}): ${m.modelType}`);
    lines.push(`  C_comp ${triple(m.cComp, pf)}, voltage range ${triple(m.voltageRange, v)} (typ / min / max)`);
    if (m.vinl !== null || m.vinh !== null) lines.push(`  Vinl ${v(m.vinl)}, Vinh ${v(m.vinh)}${m.vmeas !== null ? `, Vmeas ${v(m.vmeas)}` : ''}`);
    lines.push(`  tables: ${m.tables.join(', ') || 'none'}`);
    if (m.switching) lines.push(`  switching coefficients: rising ${m.switching.rising}, falling ${m.switching.falling}`);
    for (const n of m.notes) lines.push(`  note: ${n}`);
    for (const e of m.endPoints) {
      lines.push(`  ${e.edge} waveform (line ${e.line}) ${e.corner}, ${formatIn(e.rFixture, 'Ω', 1)} to ${v(e.vFixture)}: ` +
        `table ${v(e.tableStart)} -> ${v(e.tableEnd)}, V-I ${v(e.viStart)} -> ${v(e.viEnd)}, mismatch ${e.mismatchPercent.toFixed(2)} %`);
    }
  }
  if (s.skipped.length) {
    lines.push('', 'skipped (not read by this program):');
    for (const k of s.skipped) lines.push(`  line ${k.line} [${k.keyword}]`);
  }
  return lines.join('\n');
}

export const command: CliCommand = {
  name: 'ibis',
  summary: 'read an IBIS buffer-model file: components, pins, models and end-point checks',
  usage,
  async run(argv: string[], io: CliIo): Promise<number> {
    const { values, positionals } = parseArgs({ args: argv, allowPositionals: true, options: { json: { type: 'boolean' }, into: { type: 'string' } } });
    if (positionals.length !== 1) throw new InputError('arguments', `expected one IBIS file, got ${positionals.length}\n\n${usage}`);
    const file = positionals[0];
    let content: string;
    try {
      content = readFileSync(file, 'utf8');
    } catch (error) {
      const code = error instanceof Error && 'code' in error ? String((error as { code: unknown }).code) : '';
      throw new InputError(file, code === 'ENOENT' ? 'file not found' : `cannot be read (${code || String(error)})`);
    }
    const summary = summariseIbis(parseIbis(content, file));
    let stored: ReturnType<ProjectStore['importIbis']> | null = null;
    if (values.into) {
      const store = ProjectStore.open(values.into);
      try {
        stored = store.importIbis(file, content);
      } finally {
        store.close();
      }
    }
    if (values.json) printJson(io, stored ? { ...summary, stored: { project: values.into, ...stored } } : summary);
    else {
      io.out(text(summary));
      if (stored) {
        io.out(`\n${stored.replaced ? 'replaced' : 'stored'} ${stored.name} in ${values.into} (sha256 ${stored.sha256}); ` +
          `a part uses a model with ibis: { file: ${stored.name}, model: NAME }`);
      }
    }
    return 0;
  },
};
