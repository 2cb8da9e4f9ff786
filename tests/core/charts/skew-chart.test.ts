import { describe, expect, it } from 'vitest';
import { skewChartOption, skewChartHeight, referenceWindow } from '../../../core/charts/skew.js';
import { STATUS_COLOR, LEVEL_COLOR } from '../../../core/charts/style.js';
import type { BusResult, NetResult, Status } from '../../../core/budget/results.js';

// Invented nets: flight windows in ps, as the budget engine would report them in s.
function net(name: string, role: string, status: Status, minPs: number, maxPs: number): NetResult {
  return {
    net: name, bus: 'L0', role, status, reasons: [], worstCorner: 'slow', flightMin: minPs * 1e-12, flightMax: maxPs * 1e-12,
    skew: 0, setupMargin: 0, holdMargin: 0, corners: [], quality: [], lengthWindow: null, suggestion: null, inputHash: '',
  };
}

function bus(nets: NetResult[]): BusResult {
  return { bus: 'L0', kind: 'source-synchronous', status: 'fail', worstSetup: 0, worstHold: 0, worstNet: null, nets, note: null };
}

type Any = Record<string, any>;

const sample = bus([
  net('DQS0_P', 'strobe', 'pass', 250, 310),
  net('DQ0', 'data', 'pass', 240, 300),
  net('DQ1', 'data', 'tight', 260, 330),
  net('DQ2', 'data', 'fail', 300, 420),
]);

describe('skewChartOption', () => {
  it('draws one [min, max] bar per net in ps, coloured by status, the strobe in the reference colour', () => {
    const o = skewChartOption(sample) as Any;
    const data = o.series[0].data;
    expect(o.yAxis.data).toEqual(['DQS0_P', 'DQ0', 'DQ1', 'DQ2']);
    expect(data.map((d: Any) => d.value[1])).toEqual([250, 240, 260, 300].map((x) => expect.closeTo(x, 9)));
    expect(data.map((d: Any) => d.value[2])).toEqual([310, 300, 330, 420].map((x) => expect.closeTo(x, 9)));
    expect(data.map((d: Any) => d.itemStyle.color)).toEqual([LEVEL_COLOR.reference, STATUS_COLOR.pass, STATUS_COLOR.tight, STATUS_COLOR.fail]);
    expect(o.xAxis.name).toBe('Flight time (ps)');
    expect(o.animation).toBe(false);
  });

  it('shades the strobe window and keeps every bar and the window inside the axis', () => {
    const o = skewChartOption(sample) as Any;
    const area = o.series[0].markArea.data[0];
    expect(area[0].xAxis).toBeCloseTo(250, 9);
    expect(area[1].xAxis).toBeCloseTo(310, 9);
    expect(o.xAxis.min).toBeLessThanOrEqual(240);
    expect(o.xAxis.max).toBeGreaterThanOrEqual(420);
  });

  it('spans several reference nets (both halves of a differential strobe)', () => {
    const w = referenceWindow(bus([net('S_P', 'strobe', 'pass', 250, 300), net('S_N', 'strobe', 'pass', 255, 320), net('D', 'data', 'pass', 1, 2)]));
    expect(w![0]).toBeCloseTo(250e-12, 20);
    expect(w![1]).toBeCloseTo(320e-12, 20);
  });

  it('renders each bar as a rectangle between the coordinates of min and max, at least 2 px wide', () => {
    const o = skewChartOption(sample) as Any;
    // A stand-in for ECharts' render API: 1 ps = 1 px, rows 20 px apart.
    const values = [1, 300, 300];
    const api = {
      value: (dim: number) => values[dim],
      coord: ([x, row]: number[]) => [x, row * 20],
      size: () => [0, 20],
      visual: () => '#123456',
    };
    const shape = o.series[0].renderItem({}, api);
    expect(shape.type).toBe('rect');
    expect(shape.shape).toEqual({ x: 300, y: 20 - 5.5, width: 2, height: 11 });
    expect(shape.style.fill).toBe('#123456');
  });

  it('says so when the bus has no nets instead of drawing an empty axis', () => {
    const o = skewChartOption(bus([])) as Any;
    expect(o.series).toBeUndefined();
    expect(o.graphic[0].style.text).toMatch(/No nets/);
  });

  it('gives each net a row of at least 18 px', () => {
    expect(skewChartHeight(40) - skewChartHeight(20)).toBe(360);
  });
});

describe('niceStep', () => {
  it('rounds up to 1, 2 or 5 times a power of ten (tick steps; common practice, no source)', async () => {
    const { niceStep } = await import('../../../core/charts/skew.js');
    expect([0.7, 3, 31.7, 180, 499].map(niceStep)).toEqual([1, 5, 50, 200, 500]);
  });
});
