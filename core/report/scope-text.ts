/**
 * What the numbers in a report rest on (docs/design.md §9): what was modelled, what was neglected and which
 * way each neglect tends to push the result, and the caution that the report supports judgement only.
 */

export const MODELLED: readonly string[] = [
  'Routed segments as lossless transmission lines, one per segment, with Z0 and delay per length computed from the stackup at the trace width: published closed forms for single traces inside their validity, a 2-D finite-difference field solution of the real cross-section (copper thickness, the layer\'s own dielectrics, solder mask over outer traces) for pairs, masked or thick-copper layers and offset stripline; the method is named for every layer; explicit lines for connectors or package traces when entered.',
  'Edge-coupled differential pairs (segments with a pair gap) as one leg driven differentially: the odd-mode impedance Zodd and odd-mode velocity (from the field solution of the pair\'s cross-section, with copper thickness), with the receiver\'s leg thresholds Vcm ± Vth,diff/2; both legs simulated (the partner leg driven through the opposite edge), the pair timed at the crossing of its legs (differential zero), and its differential level checked on Vdiff against VIH,diff = VIH − VIL as its own check.',
  'Series, parallel, Thevenin, AC and VTT terminations as entered; vias as lumped capacitance to ground.',
  'Drivers as linear ramps (10-90 % rise and fall times) behind a fixed output resistance, pull-up and pull-down separately; clock-to-output (Tco) into the part\'s stated reference load, with flight time compensated to that load.',
  'Nonlinear drivers and receivers of parts given an IBIS model (docs/ibis.md): V-I tables, switching coefficients from the V-T tables, clamps and C_comp at the corner\'s IBIS column, behind the pin\'s package R, L, C as visible elements; Tco and setup/hold stay the part\'s, measured into the model\'s own reference load.',
  'Receivers as input capacitance, optional on-die termination, AC thresholds VIL/VIH for timing, and absolute overshoot/undershoot limits.',
  'Both edges at every corner of the corner table (driver strength, edge rate, Dk, etch width, rails, receiver capacitance); margins are the worst over corners, receivers and edges.',
  'Timing budgets: common-clock and source-synchronous setup and hold margins, with every line item and its source shown, and the user\'s allowances; setup at the driver\'s Tco,max and hold at its Tco,min at every corner; a common-clock bus with a clock net takes the clock\'s own Tco and simulated flight to each receiver (and to the driver where routed there) instead of an entered skew; slew-rate derating where a part gives a table; a receiver that never crosses a threshold fails with its reason, never a number.',
];

export const NEGLECTED: readonly string[] = [
  'Conductor and dielectric losses (DC resistance, skin effect, loss tangent): the simulated edges are sharper and the ringing larger than on the board; the Df values in the stackup are listed but not used.',
  'Crosstalk from neighbouring nets, simultaneous switching noise and power-delivery noise: they reduce the margins shown.',
  'Package models (bond wires, package traces, pin parasitics) of parts without an IBIS model, beyond the receiver\'s input capacitance, unless entered as explicit elements.',
  'Clamp diodes and V-I curves of parts given only linear models: clamps would limit overshoot that the linear model reports.',
  'Return-path discontinuities, plane splits, via stubs beyond their lumped capacitance, and frequency-dependent Dk.',
  'Skew and imbalance inside a differential pair (conversion to the even mode): a skewed pair switches later than its odd-mode leg shows.',
];

export const CAUTION =
  'This report supports engineering judgement. It does not replace the silicon vendors\' models and design rules, measurement on the built board, or the reviewer\'s sign-off.';

/** The same scope in two sentences, for the workbench footer and the command line. */
export const SCOPE_SUMMARY = {
  modelled:
    'lossless transmission lines (method of characteristics) with Z0 and delay from the stackup (closed forms for single traces, a 2-D field solution for pairs, solder mask and thick copper), ' +
    'linear ramp drivers behind an output resistance, or IBIS drivers and receivers with their package where a part names a model, ' +
    'receivers as input capacitance with optional on-die termination, ' +
    'differential strobes and clocks as edge-coupled pairs in the odd mode, ' +
    "vias and discrete parts as lumped elements, at every corner of the project's corner table; flight times compensated " +
    "to the driver's reference load.",
  neglected:
    'conductor and dielectric loss, crosstalk, supply noise, package parasitics not entered as elements, clamps of ' +
    'parts with only linear models, skew within a differential pair.',
  caution:
    "Results support engineering judgement: silicon vendors' models and design rules, measurement on the built board " +
    "and the reviewer's sign-off remain the authority.",
} as const;
