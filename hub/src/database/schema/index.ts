// The hub's whole database schema; drizzle-kit reads this file to generate migrations.
export * from './benches.js';
export * from './people.js';
