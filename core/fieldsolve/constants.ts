/**
 * Physical constants of the field solver (SI). The speed of light is shared with the closed forms.
 * ε0 = 1/(μ0·c²) with μ0 = 4π·10⁻⁷·(1 + 5.5·10⁻¹⁰) H/m (CODATA 2018).
 */
import { C0 as SPEED_OF_LIGHT } from '../stackup/constants.js';

export const C0 = SPEED_OF_LIGHT;
/** Vacuum permeability, H/m (CODATA 2018: 1.256 637 062 12·10⁻⁶). */
export const MU0 = 1.25663706212e-6;
/** Vacuum permittivity, F/m, 1/(μ0·c²) (CODATA 2018: 8.854 187 8128·10⁻¹²). */
export const EPS0 = 1 / (MU0 * SPEED_OF_LIGHT * SPEED_OF_LIGHT);
