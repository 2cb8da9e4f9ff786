export * from './api.js';
export * from './methods.js';
export * from './transport.js';
