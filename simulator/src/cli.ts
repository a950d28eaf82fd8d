#!/usr/bin/env node
import { parseArgs, usage } from './usage.js';

const args = parseArgs(process.argv.slice(2));
if (args.unknown.length > 0) {
  process.stderr.write(`Unknown option(s): ${args.unknown.join(' ')}\n\n${usage}`);
  process.exitCode = 2;
} else {
  process.stdout.write(usage);
}
