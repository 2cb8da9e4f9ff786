import { describe, expect, it } from 'vitest';
import { marginCsvRecords, MARGIN_CSV_COLUMNS } from '../../../core/report/csv.js';
import { loadResult } from './fixture.js';

describe('marginCsvRecords', () => {
  it('has one row per net and a unit in every numeric column name', () => {
    const result = loadResult();
    const rows = marginCsvRecords(result);
    expect(rows).toHaveLength(result.buses.reduce((n, b) => n + b.nets.length, 0));
    for (const column of MARGIN_CSV_COLUMNS) {
      const numeric = rows.some((r) => typeof r[column] === 'number');
      if (numeric) expect(column).toMatch(/_(ps|mm)$/);
    }
  });

  it('writes times in ps and lengths in mm, rounded to 0.001', () => {
    const dq2 = marginCsvRecords(loadResult(), 'LANE0').find((r) => r.net === 'DQ2')!;
    expect(dq2.setup_margin_ps).toBe(-11.496); // fixture value -11.496 ps (fixtures/report/generate-heron-ridge.ts)
    expect(dq2.length_current_mm).toBe(52);
    expect(dq2.status).toBe('fail');
    expect(dq2.reasons).toBe('setup margin -11.5 ps at slow corner');
  });

  it('leaves missing values empty, never NaN', () => {
    const result = loadResult();
    result.buses[0].nets[0].flightMin = Number.NaN;
    const strobe = marginCsvRecords(result)[0];
    expect(strobe.flight_min_ps).toBe('');
    expect(strobe.length_min_mm).toBe(''); // the strobe has no length window in the fixture
  });

  it('gives no rows for a project without buses', () => {
    expect(marginCsvRecords({ ...loadResult(), buses: [] })).toEqual([]);
  });
});
