/**
 * The behavioural buffer at its pad (docs/ibis.md §4): the current into the pin at pad voltage V,
 *     I(V) = Ku·Ipu(Vpu − V) + Kd·Ipd(V − Vpd) + Igc(V − Vgc) + Ipc(Vpc − V)
 * (ANSI/EIA-656: every V-I table gives the current into the pin; [Pullup] and [POWER Clamp] are
 * tabulated against the voltage below their rail, [Pulldown] and [GND Clamp] against the voltage above
 * theirs). C_comp is a linear capacitor from the pad to ground, handled by the caller.
 */
import type { PadCurve, PadTables } from '../circuit/types.js';
import { lookupExtended, slopeExtended } from './table.js';

/** Static pad current into the pin (A) and its derivative dI/dV (S) at one pair of coefficients. */
export interface PadCurrent {
  i: number;
  didv: number;
}

const term = (c: PadCurve | null, x: number) => (c ? lookupExtended(c.v, c.i, x) : 0);
const slope = (c: PadCurve | null, x: number) => (c ? slopeExtended(c.v, c.i, x) : 0);

/** Pull-up and pull-down currents alone (unscaled), A, at pad voltage v. */
export function pullCurrents(b: PadTables, v: number): { pu: number; pd: number } {
  return { pu: term(b.pullup, b.pullupRef - v), pd: term(b.pulldown, v - b.pulldownRef) };
}

/** Clamp currents into the pin at pad voltage v, A. */
export function clampCurrent(b: PadTables, v: number): number {
  return term(b.gndClamp, v - b.gndClampRef) + term(b.powerClamp, b.powerClampRef - v);
}

/** Current into the pin at pad voltage v with switching coefficients ku, kd (out: i, didv). */
export function padCurrent(b: PadTables, v: number, ku: number, kd: number, out: PadCurrent): PadCurrent {
  const xu = b.pullupRef - v;
  const xd = v - b.pulldownRef;
  const xg = v - b.gndClampRef;
  const xp = b.powerClampRef - v;
  out.i = ku * term(b.pullup, xu) + kd * term(b.pulldown, xd) + term(b.gndClamp, xg) + term(b.powerClamp, xp);
  out.didv = -ku * slope(b.pullup, xu) + kd * slope(b.pulldown, xd) + slope(b.gndClamp, xg) - slope(b.powerClamp, xp);
  return out;
}
