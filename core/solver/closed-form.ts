/**
 * Lattice-diagram closed forms for a lossless line between resistive ends (docs/design.md §2; Bakoglu,
 * "Circuits, Interconnections, and Packaging for VLSI", 1990, ch. 6 — chapter from memory).
 */

/** Launched step at the source end, V: V+ = Vs·Z0/(Z0 + Zs). Valid before any reflection returns. */
export function launchStep(vs: number, z0: number, zs: number): number {
  return (vs * z0) / (z0 + zs);
}

/** Reflection coefficient of a termination Zt on a line Z0: Γ = (Zt − Z0)/(Zt + Z0) (Zt = Infinity: 1). */
export function reflection(zt: number, z0: number): number {
  return zt === Infinity ? 1 : (zt - z0) / (zt + z0);
}
