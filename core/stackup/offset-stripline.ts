/**
 * Offset (asymmetric) stripline between two planes by the parallel-combination approximation: the
 * strip's capacitance to each plane is taken as half that of a symmetric stripline whose plane spacing
 * is twice that trace-to-plane distance plus the strip thickness, so
 * Z0 = 2·Z(2h1+t)·Z(2h2+t) / (Z(2h1+t) + Z(2h2+t)), with Z(b) the symmetric stripline of spacing b.
 * Source: the parallel-combination estimate for offset stripline in B. C. Wadell, "Transmission Line
 * Design Handbook", Artech House 1991 (section and equation number from memory, not checked against the text).
 * Reduces to the symmetric stripline when h1 = h2. Accuracy measured against an independent
 * moment-method solution of the zero-thickness strip (tests/core/stackup/offset-stripline.test.ts):
 * it reads HIGH because the fringing between the two halves is not shared, by about +1.4 % at
 * h2/h1 = 2, +2.8 to +3.7 % at 3 and +7 % at 5 (W/h1 = 0.3-2). Treat results beyond h2/h1 of about 3 as rough.
 */
import { wheelerStriplineZ0 } from './wheeler-stripline.js';

/**
 * Offset stripline Z0, Ω, with each half computed by Wheeler 1978 (thickness-corrected).
 * @param h1 dielectric between the strip and one plane, m; @param h2 between the strip and the other, m.
 */
export function parallelCombinationOffsetStriplineZ0(width: number, thickness: number, h1: number, h2: number, er: number): number {
  const za = wheelerStriplineZ0(width, thickness, 2 * h1 + thickness, er);
  const zb = wheelerStriplineZ0(width, thickness, 2 * h2 + thickness, er);
  return (2 * za * zb) / (za + zb);
}
