import { describe, expect, it } from 'vitest';
import { DEFAULT_BAUD, DEFAULT_PTY_LINK, parseArgs, usage } from './usage.js';

describe('simulator command line', () => {
  it('reads every option into simulator options', () => {
    const parsed = parseArgs([
      '--tcp',
      '4001',
      '--format',
      'echo',
      '--rate',
      '10',
      '--readability',
      '0.1',
      '--capacity',
      '600',
      '--noise',
      '0',
      '--drift',
      '0',
      '--unit',
      'oz',
      '--seed',
      '42',
      '--speed',
      '5',
      '--on-request',
      '--script',
      'batch.json',
    ]);
    expect(parsed).toEqual({
      ok: true,
      options: {
        help: false,
        pty: false,
        ptyLink: DEFAULT_PTY_LINK,
        tcpPort: 4001,
        host: '127.0.0.1',
        baud: DEFAULT_BAUD,
        script: 'batch.json',
        scale: {
          format: 'echo',
          rateHz: 10,
          readabilityG: 0.1,
          capacityG: 600,
          noiseG: 0,
          driftGPerMin: 0,
          unit: 'oz',
          seed: 42,
          speed: 5,
          continuous: false,
        },
      },
    });
  });

  it('takes --pty with a link path and a baud rate, and --help', () => {
    const parsed = parseArgs(['--pty', '--pty-link', '/tmp/x', '--baud', '2400', '-h']);
    expect(parsed.ok && parsed.options).toMatchObject({
      pty: true,
      ptyLink: '/tmp/x',
      baud: 2400,
      help: true,
    });
  });

  it('reports every bad option by name at once', () => {
    const parsed = parseArgs([
      '--format',
      'morse',
      '--rate',
      '0',
      '--baud',
      '300',
      '--tcp',
      '70000',
      '--unit',
      'ct',
    ]);
    expect(parsed.ok).toBe(false);
    const errors = parsed.ok ? [] : parsed.errors;
    expect(errors).toHaveLength(5);
    for (const flag of ['--format', '--rate', '--baud', '--tcp', '--unit']) {
      expect(errors.some((error) => error.startsWith(flag))).toBe(true);
    }
  });

  it('refuses unknown options and two transports at once', () => {
    const unknown = parseArgs(['--frobnicate']);
    expect(unknown.ok === false && unknown.errors[0]).toMatch(/frobnicate/);
    const both = parseArgs(['--pty', '--tcp', '4001']);
    expect(both.ok === false && both.errors).toEqual(['choose one of --pty and --tcp']);
  });

  it('tells how to start it and how to get socat', () => {
    expect(usage).toContain('npm run simulator');
    expect(usage).toContain('apt-get install socat');
  });
});
