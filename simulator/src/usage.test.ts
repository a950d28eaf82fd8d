import { describe, expect, it } from 'vitest';
import { parseArgs, usage } from './usage.js';

describe('simulator usage', () => {
  it('recognises --help and reports unknown options', () => {
    expect(parseArgs(['--help'])).toEqual({ help: true, unknown: [] });
    expect(parseArgs(['--frobnicate'])).toEqual({ help: false, unknown: ['--frobnicate'] });
  });

  it('tells how to start it', () => {
    expect(usage).toContain('npm run simulator');
  });
});
