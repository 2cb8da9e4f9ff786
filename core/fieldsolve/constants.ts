/**
 * Physical constants of the field solver (SI, CODATA 2018). ε0 = 1/(μ0·c²).
 */

/** Speed of light in vacuum, m/s (exact, SI definition of the metre). */
export const C0 = 299_792_458;
/** Vacuum permeability, H/m (CODATA 2018: 1.256 637 062 12·10⁻⁶). */
export const MU0 = 1.25663706212e-6;
/** Vacuum permittivity, F/m, 1/(μ0·c²) (CODATA 2018: 8.854 187 8128·10⁻¹²). */
export const EPS0 = 1 / (MU0 * C0 * C0);
