/**
 * Prints the deviation K&J 1984 - MoM (in %) of Z0e, Z0o, εeff,e, εeff,o at the points of
 * tests/core/stackup/coupled-microstrip.test.ts, in the form of that test's `points` table (the recorded
 * values its regression bound pins). Run: npx tsx tests/core/stackup/reference/kj-deviations.ts
 */
import { fileURLToPath } from 'node:url';
import { kirschningJansenCoupledMicrostrip } from '../../../../core/stackup/kirschning-jansen.js';
import { momCoupled } from './microstrip-mom.js';

/** W/h, S/h, εr across the stated range 0.1 <= W/h, S/h <= 10, εr <= 18, including its corners. */
export const KJ_POINTS: [number, number, number][] = [
  [1, 1, 9.8], [0.5, 0.2, 9.8], [2, 0.5, 4.3], [1, 0.1, 4.3], [5, 3, 2.2], [0.2, 2, 12], [1, 1, 1],
  [0.1, 0.1, 18], [10, 10, 18], [0.3, 5, 3.5], [1.25, 1.25, 4.2],
];

/** Signed deviations K&J - MoM in % (40 MoM segments per strip): Z0e, Z0o, εeff,e, εeff,o. */
export function kjDeviations(u: number, g: number, er: number): [number, number, number, number] {
  const kj = kirschningJansenCoupledMicrostrip(u, g, 1, er);
  const mom = momCoupled(u, g, er);
  const d = (a: number, b: number) => (a / b - 1) * 100;
  return [d(kj.zeven, mom.zeven), d(kj.zodd, mom.zodd), d(kj.epsEffEven, mom.epsEffEven), d(kj.epsEffOdd, mom.epsEffOdd)];
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  for (const [u, g, er] of KJ_POINTS) {
    const row = kjDeviations(u, g, er).map((x) => (Object.is(Number(x.toFixed(3)), -0) ? 0 : x).toFixed(3));
    console.log(`    [${u}, ${g}, ${er}, [${row.join(', ')}]],`);
  }
}
