/**
 * The engine (docs/design.md §7): runs the physics and the budget formulas for a project — simulates
 * nets at every corner, solves each net's budget, searches length windows and terminations, plans and
 * assembles board solves as independent jobs.
 */
export * from './length-window.js';
export * from './termination.js';
export * from './simulate-net.js';
export * from './solve-net.js';
export * from './board.js';
export * from './jobs.js';
export * from './waveforms.js';
export * from './sweep.js';
