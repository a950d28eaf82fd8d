export * from './types.js';
export * from './units.js';
export * from './codecs.js';
export * from './line-splitter.js';
export { headeredCodec } from './headered-codec.js';
export { echoCodec } from './echo-codec.js';
export { plainCodec } from './plain-codec.js';
export * from './simulator-script.js';
