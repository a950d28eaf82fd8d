export * from './health.js';
export * from './errors.js';
export * from './roles.js';
export * from './live.js';
export * from './scale/index.js';
export * from './scale-link.js';
export * from './benches.js';
export * from './scale-stability.js';
