/** A project net at a corner as a circuit for the solver (docs/design.md §4), and its stackup-derived view. */
export * from './build-circuit.js';
export * from './project-view.js';
export * from './ibis-parts.js';
export * from './warm-lines.js';
