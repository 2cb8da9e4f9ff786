/**
 * ibisCurvesAt: a model's tables at a column for a V-I / V-T view (docs/ibis.md §9). Values read
 * from the invented fixtures/ibis/wren_mc7.ibs text itself.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { ibisCurvesAt } from '../../../core/ibis/curves.js';
import { parseIbis } from '../../../core/ibis/parse.js';

const text = readFileSync(new URL('../../../fixtures/ibis/wren_mc7.ibs', import.meta.url), 'utf8');
const model = parseIbis(text, 'wren_mc7.ibs').models.find((m) => m.name === 'dq_drv40')!;

describe('ibisCurvesAt', () => {
  it('gives each column of the tables with their references and the waveforms with fixtures', () => {
    const typ = ibisCurvesAt(model, 'typ');
    const min = ibisCurvesAt(model, 'min');
    // The parsed table's own columns (docs/ibis.md §3: min is the min column where not NA).
    expect(typ.pulldown!.i).toEqual(model.pulldown!.i.typ);
    expect(min.pulldown!.i).toEqual(model.pulldown!.i.min ?? model.pulldown!.i.typ);
    expect(typ.pulldown!.v).toEqual(model.pulldown!.v);
    // Pull-up referenced to [Voltage Range] typ, pull-down to 0 V (docs/ibis.md §4 defaults).
    expect(typ.pullup!.reference).toBe(model.pullupReference?.typ ?? model.voltageRange!.typ);
    expect(typ.pulldown!.reference).toBe(model.pulldownReference?.typ ?? 0);
    expect(typ.rising.length).toBe(model.rising.length);
    expect(typ.rising[0].t).toEqual(model.rising[0].t);
    expect(typ.rising[0].rFixture).toBe(model.rising[0].fixture.rFixture);
    expect(typ.cComp).toBe(model.cComp!.typ);
  });
});
