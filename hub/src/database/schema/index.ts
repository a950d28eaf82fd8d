// The hub's whole database schema; drizzle-kit reads this file to generate migrations.
export * from './benches.js';
export * from './materials.js';
export * from './batches.js';
export * from './people.js';
export * from './alerts.js';
export * from './dispositions.js';
export * from './audit.js';
export * from './accuracy.js';
export * from './pour-plans.js';
export * from './documents.js';
export * from './scale-checks.js';
export * from './hubs.js';
