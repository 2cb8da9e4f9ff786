/**
 * Quasi-static 2-D field solver for PCB cross-sections (docs/field-solver.md): finite-difference
 * Laplace solution on a graded grid, capacitance with and without dielectrics, L from the vacuum
 * capacitance, Richardson extrapolation over nested meshes. SI units throughout.
 */
export * from './cross-section.js';
export * from './build.js';
export * from './grid.js';
export * from './capacitance.js';
export * from './extract.js';
export * from './solve.js';
export * from './lines.js';
export * from './inverse.js';
export * from './potential-map.js';
export { EPS0, MU0 } from './constants.js';
export * from './memo.js';
