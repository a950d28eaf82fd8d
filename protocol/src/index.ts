export * from './health.js';
export * from './errors.js';
