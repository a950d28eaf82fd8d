export * from './health.js';
export * from './errors.js';
export * from './roles.js';
