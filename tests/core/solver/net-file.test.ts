/**
 * Net file format v1 (docs/design.md §8.1): what it accepts, and that each kind of bad input gets a message naming
 * the element or field. Expected messages are this program's own wording (common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/errors.js';
import { parseNetFile } from '../../../core/circuit/parse.js';

function base(): Record<string, unknown> {
  return {
    driver: { node: 'drv', vlow: 0, vhigh: 1.8, rout: 25, riseTime: 4e-10, fallTime: 4e-10 },
    elements: [
      { kind: 'line', a: 'drv', b: 'rx', z0: 50, delay: 1e-9 },
      { kind: 'resistor', a: 'rx', b: 'vtt', ohms: 50 },
      { kind: 'capacitor', a: 'rx', b: 'gnd', farads: 2e-12 },
    ],
    rails: { vtt: 0.9 },
    receivers: [{ node: 'rx', vil: 0.8, vih: 1.0 }],
    stop: 2e-8,
  };
}

function withElements(...extra: unknown[]) {
  const net = base();
  net.elements = [...(net.elements as unknown[]), ...extra];
  return net;
}

/** Expects an InputError whose message contains every fragment. */
function rejects(json: unknown, ...fragments: string[]) {
  let error: unknown;
  try {
    parseNetFile(json, 'net.json');
  } catch (e) {
    error = e;
  }
  expect(error).toBeInstanceOf(InputError);
  for (const fragment of fragments) expect((error as Error).message).toContain(fragment);
}

describe('net file v1: accepted input', () => {
  it('reads the example of docs/design.md §8.1 in SI numbers', () => {
    const c = parseNetFile(base(), 'net.json');
    expect(c.driver.routHigh).toBe(25);
    expect(c.driver.routLow).toBe(25);
    expect(c.elements[0]).toEqual({ kind: 'line', a: 'drv', b: 'rx', z0: 50, delay: 1e-9 });
    expect(c.rails).toEqual({ vtt: 0.9 });
    expect(c.stop).toBe(2e-8);
  });

  it('accepts strings with units and the optional additions', () => {
    const net = base();
    net.driver = {
      node: 'drv', vlow: '0V', vhigh: '1.8 V', routHigh: '30ohm', routLow: '20 ohm', riseTime: '400ps', fallTime: '0.35ns',
      refLoad: { ohms: '50ohm', vtt: '0.9V', farads: '2pF' }, vmeas: '0.9V',
    };
    net.elements = [
      { kind: 'line', a: 'drv', b: 'rx', z0: '50ohm', delay: '1ns' },
      { kind: 'via', a: 'rx', farads: '0.3pF' },
      { kind: 'inductor', a: 'rx', b: 'x', henries: '1nH' },
      { kind: 'resistor', a: 'x', b: 'vtt', ohms: 50 },
    ];
    net.receivers = [{ node: 'rx', vil: '0.8V', vih: '1.0V', cin: '1.5pF', odt: { ohms: 60, vtt: 0.9 }, vmaxAbs: 2.3, vminAbs: -0.5 }];
    delete net.stop;
    const c = parseNetFile(net, 'net.json');
    expect(c.driver.fallTime).toBeCloseTo(0.35e-9, 21); // unit conversion only
    expect(c.driver.refLoad).toEqual({ ohms: 50, vtt: 0.9, farads: 2e-12 });
    expect(c.elements[1]).toEqual({ kind: 'via', a: 'rx', farads: 0.3e-12 });
    expect(c.receivers[0].cin).toBeCloseTo(1.5e-12, 24);
    expect(c.stop).toBeNull();
  });
});

describe('net file v1: bad input names the element or field', () => {
  it('unknown node: a resistor to a rail that is not declared', () => {
    const net = base();
    net.rails = {};
    rejects(net, 'net.json: elements[1] (resistor rx->vtt)', 'unknown node "vtt"');
  });

  it('floating node: only capacitors reach it', () => {
    rejects(
      withElements({ kind: 'capacitor', a: 'rx', b: 'mid', farads: 1e-12 }, { kind: 'capacitor', a: 'mid', b: 'gnd', farads: 1e-12 }),
      'elements[3] (capacitor rx->mid)', 'node "mid" is floating',
    );
  });

  it('receiver on no element', () => {
    const net = base();
    net.receivers = [{ node: 'rx2', vil: 0.8, vih: 1 }];
    rejects(net, 'receivers[0].node', 'receiver node "rx2" is on no element');
  });

  it('z0 <= 0', () => {
    const net = base();
    (net.elements as Record<string, unknown>[])[0].z0 = 0;
    rejects(net, 'elements[0] (line drv->rx).z0', 'must be greater than');
  });

  it('negative delay', () => {
    const net = base();
    (net.elements as Record<string, unknown>[])[0].delay = '-1ns';
    rejects(net, 'elements[0] (line drv->rx).delay', 'negative time');
  });

  it('negative value of a lumped element', () => {
    const net = base();
    (net.elements as Record<string, unknown>[])[2].farads = -1e-12;
    rejects(net, 'elements[2] (capacitor rx->gnd).farads', 'negative capacitance');
  });

  it('a loop of ideal elements that makes the matrix singular: inductor across a rail', () => {
    rejects(withElements({ kind: 'inductor', a: 'vtt', b: 'gnd', henries: 1e-9 }), 'elements[3] (inductor vtt->gnd)', 'loop of ideal elements', 'singular');
  });

  it('a loop of ideal elements: two lines in parallel', () => {
    rejects(withElements({ kind: 'line', a: 'drv', b: 'rx', z0: 60, delay: 1e-9 }), 'elements[3] (line drv->rx)', 'loop of ideal elements');
  });

  it('stop time too short for one round trip', () => {
    const net = base();
    net.stop = '1ns';
    rejects(net, 'net.json: stop', 'too short', 'round trip');
  });

  it('unknown unit, unknown element kind, unknown field', () => {
    const a = base();
    (a.elements as Record<string, unknown>[])[0].z0 = '50 furlongs';
    rejects(a, 'elements[0] (line drv->rx).z0', 'unknown resistance unit');
    rejects(withElements({ kind: 'diode', a: 'rx', b: 'gnd' }), 'elements[3] (diode rx->gnd).kind', 'unknown element kind');
    const c = base();
    (c.driver as Record<string, unknown>).rot = 25;
    rejects(c, 'driver.rot', 'unknown field');
  });

  it('thresholds and levels in the wrong order', () => {
    const a = base();
    a.receivers = [{ node: 'rx', vil: 1.0, vih: 0.8 }];
    rejects(a, 'receivers[0].vih', 'must be above vil');
    const b = base();
    (b.driver as Record<string, unknown>).vhigh = 0;
    rejects(b, 'driver.vhigh', 'must be above vlow');
  });

  it('driver on ground, element from a node to itself, missing driver resistance', () => {
    const a = base();
    (a.driver as Record<string, unknown>).node = 'gnd';
    rejects(a, 'driver.node', 'ground or a rail');
    rejects(withElements({ kind: 'resistor', a: 'rx', b: 'rx', ohms: 10 }), 'elements[3] (resistor rx->rx)', 'to itself');
    const c = base();
    delete (c.driver as Record<string, unknown>).rout;
    rejects(c, 'driver.routHigh', 'missing resistance value');
  });

  it('no receivers', () => {
    const net = base();
    net.receivers = [];
    rejects(net, 'net.json: receivers', 'non-empty array');
  });

  it('not an object at all', () => {
    rejects([1, 2], 'net.json', 'expected an object');
  });
});

describe('simulation limits name the field', () => {
  it('a step longer than the shortest line delay, and a stop time beyond the memory limit', async () => {
    const { simulateEdge } = await import('../../../core/solver/transient.js');
    const c = parseNetFile(base(), 'net.json');
    expect(() => simulateEdge(c, 'rising', { step: 2e-9 })).toThrow(/options\.step: .*exceeds the shortest line delay/);
    expect(() => simulateEdge(c, 'rising', { stop: 1 })).toThrow(/options\.stop: .*shorten the stop time/);
  });
});
