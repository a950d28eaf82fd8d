export {
  DEFAULT_SIMULATOR_OPTIONS,
  SimulatedScale,
  SimulatorStoppedError,
  type SimulatorOptions,
} from './simulated-scale.js';
export { usage, parseArgs } from './usage.js';
