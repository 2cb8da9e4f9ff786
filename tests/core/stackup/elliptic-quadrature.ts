/**
 * Independent reference for the stackup tests: K(k) = ½∫₀^π dθ / sqrt(1 - k² sin²θ) (A&S 17.3.1) by the
 * trapezoidal rule. The integrand is smooth and π-periodic, so the rule converges geometrically;
 * 100 000 panels and more are far more than enough for k' >= 1e-3. Written apart from the AGM code under test.
 */
export function kByQuadrature(k: number, panels = 200_000): number {
  const h = Math.PI / panels;
  let sum = 0;
  for (let i = 0; i < panels; i++) {
    const s = Math.sin(i * h);
    sum += 1 / Math.sqrt(1 - k * k * s * s);
  }
  return 0.5 * sum * h;
}
