export { usage, parseArgs } from './usage.js';
