/**
 * Symmetric stripline with strip thickness after H. A. Wheeler, "Transmission-Line Properties of a
 * Strip Line Between Parallel Planes", IEEE Trans. MTT-26, no. 11, 1978, pp. 866-876 (Z0 with the
 * thickness-corrected width W'; the same form is reproduced in Wadell's handbook, 1991, section from memory).
 * Stated accuracy about 0.5 % for W'/(b - t) < 10; t < b. At t = 0 it approximates Cohn's exact result.
 */
import { ETA0 } from './constants.js';

/**
 * Wheeler 1978 stripline Z0, Ω.
 * @param width strip width W, m (> 0)
 * @param thickness strip thickness t, m (0 <= t < b)
 * @param planeSpacing b, distance between the planes, m
 * @param er relative permittivity (>= 1)
 */
export function wheelerStriplineZ0(width: number, thickness: number, planeSpacing: number, er: number): number {
  const bt = planeSpacing - thickness;
  let wEff = width;
  if (thickness > 0) {
    const x = thickness / planeSpacing;
    const m = 2 / (1 + ((2 / 3) * x) / (1 - x));
    // Wheeler 1978: ΔW/(b-t) = x/(π(1-x)) · {1 - ½ ln[(x/(2-x))² + (0.0796x/(W/b + 1.1x))^m]}
    const dw =
      (x / (Math.PI * (1 - x))) *
      (1 - 0.5 * Math.log(Math.pow(x / (2 - x), 2) + Math.pow((0.0796 * x) / (width / planeSpacing + 1.1 * x), m)));
    wEff = width + dw * bt;
  }
  const inv = bt / wEff; // 1/(W'/(b-t))
  const p = (8 / Math.PI) * inv;
  // Wheeler 1978: Z0 = (η0/(4π√εr)) ln{1 + (4/π)(b-t)/W' [p + sqrt(p² + 6.27)]}
  return (ETA0 / (4 * Math.PI * Math.sqrt(er))) * Math.log(1 + (4 / Math.PI) * inv * (p + Math.sqrt(p * p + 6.27)));
}
