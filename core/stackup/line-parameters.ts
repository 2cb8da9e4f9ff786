/**
 * Per-length parameters of a lossless TEM/quasi-TEM line from Z0 and eps_eff (docs/design.md §2):
 * vp = c/sqrt(eps_eff), delay per metre = 1/vp, L = Z0/vp, C = 1/(Z0·vp), so Z0 = sqrt(L/C) and
 * vp = 1/sqrt(LC) (telegrapher's equations; any transmission-line text, e.g. Pozar, Microwave
 * Engineering, §2.1).
 */
import { C0 } from './constants.js';

export interface LineParameters {
  /** Ω */
  z0: number;
  epsEff: number;
  /** m/s */
  velocity: number;
  /** s/m */
  delayPerMetre: number;
  /** H/m */
  inductancePerMetre: number;
  /** F/m */
  capacitancePerMetre: number;
}

export function lineParameters(z0: number, epsEff: number): LineParameters {
  const velocity = C0 / Math.sqrt(epsEff);
  return {
    z0,
    epsEff,
    velocity,
    delayPerMetre: 1 / velocity,
    inductancePerMetre: z0 / velocity,
    capacitancePerMetre: 1 / (z0 * velocity),
  };
}
