/** Physical constants used by the line models (SI). */

/** Speed of light in vacuum, m/s (exact, SI definition of the metre). */
export const C0 = 299_792_458;
/** Impedance of free space μ0·c, Ω (CODATA 2018: 376.730 313 668). */
export const ETA0 = 376.730313668;
