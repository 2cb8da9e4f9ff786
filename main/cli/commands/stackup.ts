/**
 * `slackline stackup FILE.json`: classifies every routing layer of a JSON stackup and prints its
 * structure, Z0, eps_eff and delay per length at the layer's default width.
 */
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import { classifyStackup, layerProperties, stackupFromJson } from '../../../core/stackup/index.js';
import { formatIn } from '../../../core/units/index.js';
import { printJson, type CliCommand, type CliIo } from '../command.js';

const usage = `Usage: slackline stackup FILE.json [--json]

FILE.json holds {"name": ..., "layers": [...]} with layers listed top to bottom. Each layer has
"name", "kind" (copper | dielectric | mask), "thickness"; copper layers a "role" (signal | plane) and,
for signal layers, a "defaultWidth"; dielectric and mask layers "dk" (and optionally "df").
Lengths take units ("4.5mil", "0.1mm", "1oz"); bare numbers are metres.
--json prints the layers in SI units (m, ohm, m/s, s/m).`;

/**
 * Offset of the first JSON syntax error in `text` (RFC 8259 grammar), or the text length when the
 * document ends early. Node 20's JSON.parse does not always report a position, so we find it ourselves.
 */
function firstJsonErrorOffset(text: string): number {
  let i = 0;
  const ws = (): void => {
    while (i < text.length && ' \t\n\r'.includes(text[i])) i++;
  };
  const fail = (): never => {
    throw i;
  };
  const literal = (word: string): void => {
    if (text.startsWith(word, i)) i += word.length;
    else fail();
  };
  const string = (): void => {
    i++; // opening quote
    while (i < text.length && text[i] !== '"') {
      if (text[i] === '\\') i++;
      else if (text.charCodeAt(i) < 0x20) fail();
      i++;
    }
    if (i >= text.length) fail();
    i++;
  };
  const number = (): void => {
    const m = /^-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][-+]?\d+)?/.exec(text.slice(i));
    if (!m) fail();
    i += (m as RegExpExecArray)[0].length;
  };
  const value = (): void => {
    ws();
    const c = text[i];
    if (c === '{') {
      i++;
      ws();
      if (text[i] === '}') { i++; return; }
      for (;;) {
        ws();
        if (text[i] !== '"') fail();
        string();
        ws();
        if (text[i] !== ':') fail();
        i++;
        value();
        ws();
        if (text[i] === ',') { i++; continue; }
        if (text[i] === '}') { i++; return; }
        fail();
      }
    } else if (c === '[') {
      i++;
      ws();
      if (text[i] === ']') { i++; return; }
      for (;;) {
        value();
        ws();
        if (text[i] === ',') { i++; continue; }
        if (text[i] === ']') { i++; return; }
        fail();
      }
    } else if (c === '"') string();
    else if (c === 't') literal('true');
    else if (c === 'f') literal('false');
    else if (c === 'n') literal('null');
    else number();
  };
  try {
    value();
    ws();
    if (i < text.length) fail();
  } catch (offset) {
    if (typeof offset === 'number') return offset;
    throw offset;
  }
  return text.length;
}

function parseJsonText(text: string, file: string): unknown {
  try {
    return JSON.parse(text);
  } catch (error) {
    const message = error instanceof Error ? error.message.split('\n')[0] : String(error);
    const before = text.slice(0, firstJsonErrorOffset(text));
    const line = before.split('\n').length;
    const column = before.length - before.lastIndexOf('\n');
    throw new InputError(`${file} line ${line} column ${column}`, `not valid JSON (${message})`);
  }
}

async function run(argv: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    strict: true,
    allowPositionals: true,
    options: { json: { type: 'boolean', default: false } },
  });
  if (positionals.length !== 1) throw new InputError('FILE.json', positionals.length === 0 ? 'is required' : 'give exactly one stackup file');
  const file = positionals[0];
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    const code = error instanceof Error && 'code' in error ? String((error as { code: unknown }).code) : '';
    throw new InputError(file, code === 'ENOENT' ? 'file not found' : `cannot be read (${code || String(error)})`);
  }
  const stackup = stackupFromJson(parseJsonText(text, file), file);
  const sections = classifyStackup(stackup);
  const layers = layerProperties(stackup);
  if (values.json) {
    printJson(io, {
      stackup: stackup.name,
      layers: layers.map((p, i) => ({
        ...p,
        dk: sections[i].er,
        thickness: sections[i].thickness,
        below: sections[i].below,
        above: sections[i].above ?? null,
        cover: sections[i].cover ?? null,
      })),
    });
    return 0;
  }
  const rows = [
    `Stackup "${stackup.name}": ${layers.length} routing layer(s), default widths`,
    `${'layer'.padEnd(10)} ${'structure'.padEnd(20)} ${'width'.padStart(9)} ${'H1'.padStart(9)} ${'H2/cover'.padStart(9)} ${'Dk'.padStart(5)} ${'Z0'.padStart(8)} ${'eps_eff'.padStart(7)} ${'delay'.padStart(11)} ${'delay'.padStart(11)}`,
  ];
  layers.forEach((p, i) => {
    const s = sections[i];
    const other = s.above ?? s.cover;
    rows.push(
      `${p.layer.padEnd(10)} ${p.structure.padEnd(20)} ${formatIn(p.width, 'mil', 2).padStart(9)} ${formatIn(s.below, 'mil', 2).padStart(9)} ${(other === undefined ? '—' : formatIn(other, 'mil', 2)).padStart(9)} ${s.er.toFixed(2).padStart(5)} ${formatIn(p.z0, 'Ω', 1).padStart(8)} ${p.epsEff.toFixed(3).padStart(7)} ${formatIn(p.delayPerMetre, 'ps/in', 1).padStart(11)} ${formatIn(p.delayPerMetre, 'ps/mm', 2).padStart(11)}`,
    );
  });
  rows.push(
    'Models: Hammerstad & Jensen 1980 (microstrip), IPC-2141A cover correction (embedded), Wheeler 1978',
    '(stripline), parallel combination (offset stripline). Dk: thickness-weighted average of the layers',
    'between trace and plane(s). Closed-form estimates: field solver, vendor data and coupons remain the authority.',
  );
  io.out(rows.join('\n'));
  return 0;
}

export const command: CliCommand = {
  name: 'stackup',
  summary: 'classify the routing layers of a JSON stackup and print their Z0 and delay',
  usage,
  run,
};
