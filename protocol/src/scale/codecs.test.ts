import { describe, expect, it } from 'vitest';
import { detectFormat, getCodec } from './codecs.js';
import type { EncodableReading, ScaleFormat } from './types.js';

const reading = (over: Partial<EncodableReading> = {}): EncodableReading => ({
  grams: 123.45,
  stable: true,
  mode: 'gross',
  unit: 'g',
  decimals: 2,
  ...over,
});

describe('headered codec', () => {
  const codec = getCodec('headered');

  it('reads stable gross, unstable net and negative lines', () => {
    expect(codec.parse('ST,GS,+00123.45  g')).toMatchObject({
      kind: 'weight',
      value: 123.45,
      grams: 123.45,
      unit: 'g',
      stable: true,
      mode: 'gross',
    });
    expect(codec.parse('US,NT,-00000.20  g')).toMatchObject({
      kind: 'weight',
      grams: -0.2,
      stable: false,
      mode: 'net',
    });
  });

  it('reads overload and underload whatever digits follow', () => {
    expect(codec.parse('OL,GS,+99999.99  g').kind).toBe('overload');
    expect(codec.parse('OL,NT,-99999.99  g').kind).toBe('underload');
  });

  it('reads every unit and converts to grams', () => {
    expect(codec.parse('ST,GS,+01.23450 kg')).toMatchObject({ unit: 'kg', grams: 1234.5 });
    // 1 lb = 453.592 37 g (international yard and pound agreement, 1959).
    expect(codec.parse('ST,GS,+0.50000 lb')).toMatchObject({ unit: 'lb', grams: 226.796185 });
    // 1 oz = 28.349 523 125 g (1/16 of the 1959 pound).
    const oz = codec.parse('ST,GS,+002.0000 oz');
    expect(oz.kind === 'weight' && oz.grams).toBeCloseTo(56.69904625, 9);
  });

  it('prints what it reads, in the fixed layout', () => {
    expect(codec.encode(reading())).toBe('ST,GS,+00123.45  g');
    expect(codec.encode(reading({ grams: -0.2, stable: false, mode: 'net' }))).toBe(
      'US,NT,-00000.20  g',
    );
    expect(codec.encode(reading({ overload: true }))).toBe('OL,GS,+99999.99  g');
    expect(codec.parse(codec.encode(reading({ underload: true }))).kind).toBe('underload');
    expect(codec.encode(reading({ grams: 1234.5, unit: 'kg', decimals: 5 }))).toBe(
      'ST,GS,+01.23450 kg',
    );
    // A reading that rounds to zero prints +0, never -0.
    expect(codec.encode(reading({ grams: -0.001 }))).toBe('ST,GS,+00000.00  g');
  });

  it('speaks its commands and their answers', () => {
    expect(codec.command('tare')).toBe('T');
    expect(codec.command('zero')).toBe('Z');
    expect(codec.parseCommand('Q\r')).toBe('immediate-weight');
    expect(codec.parseCommand('HELLO')).toBeUndefined();
    expect(codec.parse(codec.encodeTareReply(40, reading()))).toMatchObject({
      kind: 'ack',
      command: 'tare',
    });
    expect(codec.parse(codec.encodeAck('zero'))).toMatchObject({ kind: 'ack', command: 'zero' });
    expect(codec.parse(codec.encodeBusy('stable-weight')).kind).toBe('busy');
    expect(codec.parse(codec.encodeRefusal('HELLO')).kind).toBe('refused');
  });

  it('refuses half lines, wrong units and the other families', () => {
    for (const line of [
      'ST,GS,+00123.4',
      ',GS,+00123.45  g',
      'ST,GS,+00123.45  ct',
      'ST,GS,+001.23.45  g',
      'ST,XX,+00123.45  g',
      'S S     123.45 g',
      '+    123.45 g',
      '',
    ]) {
      expect(codec.parse(line), line).toEqual({ kind: 'unreadable', raw: line });
    }
  });
});

describe('echo codec', () => {
  const codec = getCodec('echo');

  it('reads stable and dynamic weights', () => {
    expect(codec.parse('S S     123.45 g')).toMatchObject({
      kind: 'weight',
      grams: 123.45,
      stable: true,
      mode: 'unknown',
    });
    expect(codec.parse('S D     123.47 g')).toMatchObject({ grams: 123.47, stable: false });
    expect(codec.parse('S D      -0.20 g')).toMatchObject({ grams: -0.2 });
    expect(codec.parse('S S    0.12345 kg')).toMatchObject({ unit: 'kg', grams: 123.45 });
    expect(codec.parse('S S    0.27216 lb')).toMatchObject({ unit: 'lb' });
    expect(codec.parse('S S     4.3546 oz')).toMatchObject({ unit: 'oz' });
  });

  it('reads overload, underload, busy, refusal and cannot-execute replies', () => {
    expect(codec.parse('S +').kind).toBe('overload');
    expect(codec.parse('S -').kind).toBe('underload');
    expect(codec.parse('S I').kind).toBe('busy');
    expect(codec.parse('T I').kind).toBe('busy');
    expect(codec.parse('ES').kind).toBe('refused');
    expect(codec.parse('EL').kind).toBe('refused');
    expect(codec.parse('T L').kind).toBe('refused');
    expect(codec.parse('Z +').kind).toBe('overload');
  });

  it('reads a tare reply with the tare value and a zero acknowledgement', () => {
    expect(codec.parse('T S      40.00 g')).toMatchObject({
      kind: 'weight',
      grams: 40,
      tare: true,
      stable: true,
    });
    expect(codec.parse('Z A')).toEqual({ kind: 'ack', command: 'zero', raw: 'Z A' });
  });

  it('prints readings and replies that read back the same', () => {
    expect(codec.encode(reading())).toBe('S S     123.45 g');
    expect(codec.encode(reading({ grams: 123.47, stable: false }))).toBe('S D     123.47 g');
    expect(codec.encode(reading({ overload: true }))).toBe('S +');
    expect(codec.encode(reading({ underload: true }))).toBe('S -');
    expect(codec.encodeTareReply(40, reading())).toBe('T S      40.00 g');
    expect(codec.encodeAck('zero')).toBe('Z A');
    expect(codec.encodeBusy('stable-weight')).toBe('S I');
    expect(codec.encodeRefusal('XYZ')).toBe('ES');
  });

  it('knows the five commands and no others', () => {
    const commands = [
      'stable-weight',
      'immediate-weight',
      'repeat-weight',
      'tare',
      'zero',
    ] as const;
    expect(commands.map((command) => codec.command(command))).toEqual(['S', 'SI', 'SIR', 'T', 'Z']);
    for (const command of commands) {
      expect(codec.parseCommand(codec.command(command)!)).toBe(command);
    }
    expect(codec.parseCommand('SX')).toBeUndefined();
  });

  it('refuses half lines and wrong units', () => {
    for (const line of [
      'S S     123.45',
      'S S     123.45 dwt',
      'S',
      'S Q',
      'S S 12.3.4 g',
      'Z S 1 g',
    ]) {
      expect(codec.parse(line).kind, line).toBe('unreadable');
    }
  });
});

describe('plain codec', () => {
  const codec = getCodec('plain');

  it('reads stable and unstable values', () => {
    expect(codec.parse('+    123.45 g')).toMatchObject({
      kind: 'weight',
      grams: 123.45,
      stable: true,
      mode: 'unknown',
    });
    expect(codec.parse('+    123.47 g ?')).toMatchObject({ grams: 123.47, stable: false });
    expect(codec.parse('-      0.20 g')).toMatchObject({ grams: -0.2 });
    expect(codec.parse('+   0.12345 kg')).toMatchObject({ unit: 'kg', grams: 123.45 });
    // 0.25 lb = 113.398 092 5 g (1959 pound).
    const lb = codec.parse('+   0.25000 lb');
    expect(lb.kind === 'weight' && lb.grams).toBeCloseTo(113.3980925, 9);
    expect(codec.parse('+    1.0000 oz ?')).toMatchObject({ unit: 'oz', stable: false });
  });

  it('reads overload and underload', () => {
    expect(codec.parse('+  OVERLOAD').kind).toBe('overload');
    expect(codec.parse('- UNDERLOAD').kind).toBe('underload');
  });

  it('prints the fixed-width layout', () => {
    expect(codec.encode(reading())).toBe('+    123.45 g');
    expect(codec.encode(reading({ grams: 123.47, stable: false }))).toBe('+    123.47 g ?');
    expect(codec.encode(reading({ grams: -40 }))).toBe('-     40.00 g');
  });

  it('has no commands, so the hub must keep a software tare', () => {
    expect(codec.command('tare')).toBeUndefined();
    expect(codec.command('zero')).toBeUndefined();
    expect(codec.parseCommand('T')).toBeUndefined();
    expect(codec.parse(codec.encodeRefusal('T')).kind).toBe('refused');
  });

  it('refuses garbage', () => {
    for (const line of ['+    123.45', '+ 12.3.4 g', 'g', '+    123.45 g !', '++ 1 g']) {
      expect(codec.parse(line).kind, line).toBe('unreadable');
    }
  });
});

describe('every codec', () => {
  const formats: ScaleFormat[] = ['headered', 'echo', 'plain'];

  it.each(formats)('%s reads back what it prints in every unit', (format) => {
    const codec = getCodec(format);
    const cases: Array<[EncodableReading['unit'], number]> = [
      ['g', 2],
      ['kg', 5],
      ['lb', 5],
      ['oz', 4],
    ];
    for (const [unit, decimals] of cases) {
      for (const grams of [0, 12.34, -40.5, 3999.99]) {
        const line = codec.encode(reading({ grams, unit, decimals, stable: false }));
        const parsed = codec.parse(line);
        expect(parsed.kind, line).toBe('weight');
        if (parsed.kind !== 'weight') continue;
        expect(parsed.unit).toBe(unit);
        expect(parsed.stable).toBe(false);
        // Printing rounds to `decimals` places of the unit: at most half a last digit off.
        // Factors: 1 lb = 453.592 37 g, 1 oz = 1/16 lb (international yard and pound agreement, 1959).
        const expectedValue = grams / { g: 1, kg: 1000, lb: 453.59237, oz: 453.59237 / 16 }[unit];
        expect(Math.abs(parsed.value - expectedValue)).toBeLessThanOrEqual(
          10 ** -decimals / 2 + 1e-12,
        );
        expect(parsed.grams).toBeCloseTo(grams, decimals - 3);
      }
    }
  });
});

describe('detectFormat', () => {
  it('recognises each family from its first lines, even when the first is cut', () => {
    expect(detectFormat(['00.12  g', 'ST,GS,+00123.45  g', 'US,GS,+00123.47  g'])).toBe('headered');
    expect(detectFormat(['  123.45 g', 'S S     123.45 g', 'S D     123.47 g'])).toBe('echo');
    expect(detectFormat(['+    123.45 g', '+    123.47 g ?'])).toBe('plain');
  });

  it('waits for more lines when it cannot tell', () => {
    expect(detectFormat([])).toBeUndefined();
    expect(detectFormat(['', '  '])).toBeUndefined();
    expect(detectFormat(['garbage', '#$%^'])).toBeUndefined();
    // One readable line among three unreadable ones is not enough to decide.
    expect(detectFormat(['x', 'y', 'z', '+    1.00 g'])).toBeUndefined();
  });

  it('never decides on one line, so the cut first line after opening a port cannot pick the family', () => {
    // The tail of a headered line reads as a plain weight of 3.45 g on its own.
    expect(getCodec('plain').parse('3.45  g').kind).toBe('weight');
    expect(detectFormat(['3.45  g'])).toBeUndefined();
    expect(detectFormat(['3.45  g', 'ST,GS,+00123.45  g'])).toBeUndefined();
    expect(detectFormat(['3.45  g', 'ST,GS,+00123.45  g', 'ST,GS,+00123.45  g'])).toBe('headered');
  });

  it('recognises the family as soon as two good lines follow a burst of noise', () => {
    const noise = Array.from({ length: 20 }, (_, i) => `\u00f8\u00e5#${i}\u00ff`);
    expect(detectFormat(noise)).toBeUndefined();
    expect(detectFormat([...noise, 'S S     123.45 g', 'S D     123.47 g'])).toBe('echo');
  });

  it('recognises an echo balance from its answers to commands', () => {
    expect(detectFormat(['S S      0.00 g', 'Z A'])).toBe('echo');
  });
});
