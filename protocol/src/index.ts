export * from './health.js';
export * from './errors.js';
export * from './text.js';
export * from './roles.js';
export * from './live.js';
export * from './scale/index.js';
export * from './mix/index.js';
export * from './materials.js';
export * from './materials-desk.js';
export * from './batches.js';
export * from './auth.js';
export * from './scale-link.js';
export * from './benches.js';
export * from './scale-stability.js';
export * from './alerts.js';
export * from './audit.js';
export * from './page.js';
export * from './cost.js';
export * from './pour-plans.js';
export * from './documents.js';
// Scale checks are imported as '@tareline/protocol/scale-checks': only the pages that use them
// load their schemas, not the bench screen's first chunk.
