export * from './model.js';
export * from './io-standards.js';
