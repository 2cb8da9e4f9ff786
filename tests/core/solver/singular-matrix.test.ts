/**
 * A singular nodal matrix names where it is singular: the node and the elements attached to it.
 * parseNetFile refuses floating nodes first; circuits built in code (core/netbuild) reach the solver
 * without that check, so the solver's own guard must be as specific. Wording is this program's own
 * (common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/errors.js';
import { parseNetFile } from '../../../core/circuit/parse.js';
import type { Circuit } from '../../../core/circuit/types.js';
import { simulateEdge } from '../../../core/solver/transient.js';
import { luFactor, singularColumn } from '../../../core/solver/lu.js';

function circuit(): Circuit {
  return parseNetFile({
    driver: { node: 'drv', vlow: 0, vhigh: 1.8, rout: 25, riseTime: 4e-10, fallTime: 4e-10 },
    elements: [
      { kind: 'line', a: 'drv', b: 'rx', z0: 50, delay: 1e-9 },
      { kind: 'resistor', a: 'rx', b: 'vtt', ohms: 50 },
    ],
    rails: { vtt: 0.9 },
    receivers: [{ node: 'rx', vil: 0.8, vih: 1.0 }],
    stop: 2e-8,
  }, 'net.json');
}

describe('a singular nodal matrix', () => {
  it('names the floating node and its elements (a node reached only through capacitors has no DC solution)', () => {
    const c = circuit();
    // rx -C- mid -C- gnd: at DC both capacitors are open, so "mid" has no equation (a zero row).
    c.elements.push({ kind: 'capacitor', a: 'rx', b: 'mid', farads: 1e-12 }, { kind: 'capacitor', a: 'mid', b: 'gnd', farads: 1e-12 });
    let error: unknown;
    try {
      simulateEdge(c, 'rising');
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(InputError);
    expect((error as Error).message).toMatch(/singular at node "mid" \(elements\[2\] \(capacitor rx->mid\), elements\[3\] \(capacitor mid->gnd\)\)/);
  });

  it('singularColumn finds the column whose pivot vanished, and -1 for a regular matrix', () => {
    // [[1, 1, 0], [1, 1, 0], [0, 0, 1]]: rows 1 and 2 equal, so after one elimination step column 1 has no pivot (hand calculation).
    const a = Float64Array.from([1, 1, 0, 1, 1, 0, 0, 0, 1]);
    expect(luFactor(a, 3)).toBeNull();
    expect(singularColumn(a, 3)).toBe(1);
    expect(singularColumn(Float64Array.from([2, 0, 0, 3]), 2)).toBe(-1);
  });
});
