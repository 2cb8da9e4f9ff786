/**
 * Stackup impedance engine: classify routing layers from a layer stack and compute Z0, eps_eff,
 * velocity, delay, L and C per metre with published closed forms (docs/design.md §3). SI units throughout.
 */

export * from './elliptic.js';
export * from './constants.js';
export * from './hammerstad-jensen.js';
export * from './ipc-2141a.js';
export * from './cohn-stripline.js';
export * from './wheeler-stripline.js';
export * from './offset-stripline.js';
export * from './kirschning-jansen.js';
export * from './line-parameters.js';
export * from './geometry.js';
export * from './inverse.js';
export * from './classify.js';
export * from './parse.js';
export * from './layer-on-stackup.js';
export * from './field-choice.js';
export * from './layer-section.js';
export * from './layer-inverse.js';
