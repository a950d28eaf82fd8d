import { describe, expect, it } from 'vitest';
import { describeScaleLink, parseScaleUrl, ScaleUrlError } from './scale-link.js';

function problemsOf(url: string): readonly string[] {
  try {
    parseScaleUrl(url);
  } catch (e) {
    if (e instanceof ScaleUrlError) return e.problems;
    throw e;
  }
  throw new Error(`${url} was accepted`);
}

describe('parseScaleUrl', () => {
  it('reads a full serial link', () => {
    const link = parseScaleUrl(
      'serial:///dev/ttyUSB0?baud=2400&parity=even&dataBits=7&stopBits=1&rtscts=true&format=echo',
    );
    expect(link).toMatchObject({
      transport: 'serial',
      path: '/dev/ttyUSB0',
      baudRate: 2400,
      parity: 'even',
      dataBits: 7,
      stopBits: 1,
      rtscts: true,
      format: 'echo',
    });
    expect(describeScaleLink(link)).toBe('serial /dev/ttyUSB0 2400 7E1 RTS/CTS');
  });

  it('defaults a bare serial link to 9600 8N1, no flow control, auto format', () => {
    expect(parseScaleUrl('serial:///dev/ttyS0')).toMatchObject({
      baudRate: 9600,
      dataBits: 8,
      parity: 'none',
      stopBits: 1,
      rtscts: false,
      format: 'auto',
      stabilityWindowS: 1,
    });
    expect(parseScaleUrl('serial://COM3')).toMatchObject({ path: 'COM3' });
  });

  it('reads tcp and simulated links', () => {
    expect(parseScaleUrl('tcp://127.0.0.1:4001?format=plain')).toMatchObject({
      transport: 'tcp',
      host: '127.0.0.1',
      port: 4001,
      format: 'plain',
    });
    expect(parseScaleUrl('sim://?format=headered&rateHz=10&seed=3&continuous=false')).toEqual({
      transport: 'simulated',
      format: 'headered',
      stabilityWindowS: 1,
      simulator: { rateHz: 10, seed: 3, continuous: false },
    });
    expect(parseScaleUrl('sim://')).toMatchObject({ transport: 'simulated', format: 'auto' });
  });

  it('names every problem at once', () => {
    const problems = problemsOf('serial:///dev/ttyUSB0?baud=300&parity=mark&colour=red');
    expect(problems).toHaveLength(3);
    expect(problems.join('\n')).toMatch(/unknown parameter "colour"/);
    expect(problems.join('\n')).toMatch(/baud must be between 1200 and 115200/);
    expect(problems.join('\n')).toMatch(/parity must be none, even or odd/);
  });

  it('refuses unknown schemes, missing ports and non-URLs with a hint', () => {
    expect(problemsOf('usb://scale')).toEqual(['unknown scheme "usb:"; use serial:, tcp: or sim:']);
    expect(problemsOf('tcp://10.0.0.5')).toEqual([
      'a tcp link needs a port, e.g. tcp://127.0.0.1:4001',
    ]);
    expect(problemsOf('/dev/ttyUSB0')[0]).toMatch(/not a URL; write it like serial:/);
    expect(problemsOf('sim://?format=fancy')[0]).toMatch(/format/);
  });
});
