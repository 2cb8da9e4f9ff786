export * from './types.js';
export * from './numbers.js';
export * from './parse.js';
export * from './corner.js';
export * from './table.js';
export * from './buffer.js';
export * from './switching.js';
export * from './fixture-response.js';
