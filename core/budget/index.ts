/**
 * Per-bus timing budgets (docs/design.md §6): result shapes and the budget arithmetic as pure
 * formulas. What runs them (simulation, searches, board assembly) is core/engine.
 */
export * from './results.js';
export * from './measures.js';
export * from './timing.js';
export * from './quality.js';
export * from './net-budget.js';
