/**
 * A pin's package as visible elements of a net (docs/ibis.md §4, "Package"): R and L in series from
 * the die pad to the pin, C from the pin to ground, at one corner. Per-pin values of [Pin] replace the
 * [Package] values where given (the standard's rule). For the integrator: a project part adds these
 * to the net's topology where the user can see and remove them.
 */
import { InputError } from '../errors.js';
import type { CircuitElement } from '../circuit/types.js';
import { pick } from './corner.js';
import type { Corner, IbisComponent } from './types.js';

export interface PinPackage {
  rPkg: number;
  lPkg: number;
  cPkg: number;
  /** 'pin' when the [Pin] row gave all three values, else 'package'. */
  from: 'pin' | 'package';
}

/** R, L, C of one pin at a corner (per-pin values apply to every corner: [Pin] has one column). */
export function pinPackage(component: IbisComponent, pin: string, corner: Corner): PinPackage {
  const row = component.pins.find((p) => p.pin === pin);
  if (!row) throw new InputError(`component ${component.name}`, `no pin "${pin}" in [Pin]`);
  const pkg = component.package;
  const r = row.rPin ?? (pkg ? pick(pkg.rPkg, corner) : null);
  const l = row.lPin ?? (pkg ? pick(pkg.lPkg, corner) : null);
  const c = row.cPin ?? (pkg ? pick(pkg.cPkg, corner) : null);
  if (r === null || l === null || c === null) {
    throw new InputError(`component ${component.name} pin ${pin}`, 'no package values: [Pin] gives none and there is no [Package]');
  }
  return { rPkg: r, lPkg: l, cPkg: c, from: row.rPin !== null && row.lPin !== null && row.cPin !== null ? 'pin' : 'package' };
}

/**
 * The elements between the die pad node `pad` and the pin node `pin`: R_pkg pad → `${pad}#pkg`, L_pkg
 * on to the pin, C_pkg pin → ground. Zero values are left out (an R or L of 0 joins the nodes instead).
 */
export function packageElements(p: PinPackage, pad: string, pin: string): CircuitElement[] {
  const out: CircuitElement[] = [];
  const mid = p.rPkg > 0 && p.lPkg > 0 ? `${pad}#pkg` : pin;
  if (p.rPkg > 0) out.push({ kind: 'resistor', a: pad, b: mid, ohms: p.rPkg });
  if (p.lPkg > 0) out.push({ kind: 'inductor', a: p.rPkg > 0 ? mid : pad, b: pin, henries: p.lPkg });
  if (p.rPkg <= 0 && p.lPkg <= 0) throw new InputError(`package ${pad}->${pin}`, 'R_pkg and L_pkg are both 0: the pad is the pin (write no package)');
  if (p.cPkg > 0) out.push({ kind: 'capacitor', a: pin, b: 'gnd', farads: p.cPkg });
  return out;
}
