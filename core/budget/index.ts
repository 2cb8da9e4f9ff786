/**
 * Per-bus timing budgets (issue 5): result shapes, the budget arithmetic, the whole-net solve with its
 * length window and termination suggestion, and board planning/assembly for the services.
 */
export * from './results.js';
export * from './measures.js';
export * from './timing.js';
export * from './quality.js';
export * from './net-budget.js';
export * from './length-window.js';
export * from './termination.js';
export * from './simulate-net.js';
export * from './solve-net.js';
export * from './board.js';
export * from './jobs.js';
export * from './waveforms.js';
