export {
  DEFAULT_SIMULATOR_OPTIONS,
  SimulatedScale,
  SimulatorStoppedError,
  type ScaleErrors,
  type SimulatorOptions,
} from './simulated-scale.js';
export { usage, parseArgs } from './usage.js';
export { serveTcp, type TcpAdapter } from './transports/tcp-adapter.js';
export { openPty, SocatMissingError, type PtyLink } from './transports/pty-link.js';
