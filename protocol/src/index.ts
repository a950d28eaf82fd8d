export * from './health.js';
export * from './errors.js';
export * from './roles.js';
export * from './live.js';
export * from './scale/index.js';
export * from './mix/index.js';
export * from './materials.js';
export * from './batches.js';
