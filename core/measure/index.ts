export * from './crossings.js';
export * from './edge.js';
export * from './net.js';
export * from './reference-load.js';
