/**
 * The simple closed forms of IPC-2141A, "Design Guide for High-Speed Controlled Impedance Circuit
 * Boards" (IPC, 2004), §4.2. They are offered as labelled alternatives, never as the default: against a
 * field solution the microstrip form reads 7-16 % low when copper is thick against the dielectric, and
 * the stripline form drifts once W/(b-t) exceeds 0.35 (docs/design.md §3).
 * The standard's text was not available for checking (searched for in published sources, 2026): the forms and the
 * section numbers below are as commonly reproduced, from memory. The surface-microstrip and symmetric
 * stripline forms are the widely quoted ones; the embedded and asymmetric forms carry "value from memory".
 * All lengths in metres; results in Ω.
 */

/**
 * Surface microstrip: Z0 = 87/sqrt(εr + 1.41) · ln(5.98h/(0.8W + T)) (IPC-2141A §4.2.1).
 * Stated validity: 0.1 < W/h < 2.0, 1 < εr < 15.
 */
export function ipc2141aMicrostripZ0(width: number, thickness: number, height: number, er: number): number {
  return (87 / Math.sqrt(er + 1.41)) * Math.log((5.98 * height) / (0.8 * width + thickness));
}

/**
 * Embedded microstrip effective permittivity: εr' = εr·(1 - exp(-1.55·H'/h)), where H' is the height
 * of the top of the covering dielectric above the plane (h + T + cover) (IPC-2141A §4.2.2 form,
 * value from memory). Tends to εr for a thick cover. Stated for cover >= about 25 µm (1 mil).
 * Measured against an independent spectral-domain moment-method solution (T = 0, cover Dk = substrate
 * Dk; tests/core/stackup/embedded-microstrip.test.ts): 1.4-4.7 % above the field value for covers of 0.1-2 h
 * at W/h = 1-2, so the default embedded Z0 built on it reads 0.7-2.3 % low.
 */
export function ipc2141aEmbeddedEpsEff(thickness: number, height: number, cover: number, er: number): number {
  const top = height + thickness + cover;
  return er * (1 - Math.exp((-1.55 * top) / height));
}

/**
 * Symmetric stripline: Z0 = 60/sqrt(εr) · ln(1.9b/(0.8W + T)), b = plane spacing (IPC-2141A §4.2.3).
 * Stated validity: W/(b - T) < 0.35, T/b < 0.25.
 */
export function ipc2141aStriplineZ0(width: number, thickness: number, planeSpacing: number, er: number): number {
  return (60 / Math.sqrt(er)) * Math.log((1.9 * planeSpacing) / (0.8 * width + thickness));
}

/**
 * Asymmetric stripline: Z0 = 80/sqrt(εr) · ln(1.9(2h + T)/(0.8W + T)) · (1 - h/(4h2)), with h the
 * nearer and h2 the farther trace-to-plane distance (IPC-2141A asymmetric form, value from memory).
 * Consistency check: at h = h2 it equals the symmetric form exactly (80·3/4 = 60, 2h + T = b).
 * Stated validity: W/h between 0.1 and 2.0, T/h < 0.25. Measured against an independent
 * moment-method solution at T = 0 (tests/core/stackup/offset-stripline.test.ts): 4-10 % low for
 * W/h <= 1.25 and h2/h of 2-5, 23 % low at W/h = 2.
 */
export function ipc2141aOffsetStriplineZ0(width: number, thickness: number, h1: number, h2: number, er: number): number {
  const near = Math.min(h1, h2);
  const far = Math.max(h1, h2);
  return (80 / Math.sqrt(er)) * Math.log((1.9 * (2 * near + thickness)) / (0.8 * width + thickness)) * (1 - near / (4 * far));
}
