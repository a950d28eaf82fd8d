import { getCodec, type ScaleFormat, type ScaleLine } from '@tareline/protocol';
import { afterEach, describe, expect, it } from 'vitest';
import {
  DEFAULT_SIMULATOR_OPTIONS,
  SimulatedScale,
  SimulatorStoppedError,
  type SimulatorOptions,
} from './simulated-scale.js';

type Weight = Extract<ScaleLine, { kind: 'weight' }>;

const running: SimulatedScale[] = [];
afterEach(() => {
  for (const scale of running.splice(0)) scale.stop();
});

/** A scale whose simulated time runs 50 times faster than the wall clock. */
function fastScale(options: Partial<SimulatorOptions> = {}) {
  const scale = new SimulatedScale({ speed: 50, ...options });
  running.push(scale);
  return scale;
}

/** Every line the scale prints, decoded with its format's codec. */
function record(scale: SimulatedScale) {
  const codec = getCodec(scale.options.format);
  const lines: ScaleLine[] = [];
  scale.onLine((line) => lines.push(codec.parse(line)));
  const weights = () => lines.filter((line): line is Weight => line.kind === 'weight');
  return { lines, weights };
}

describe('SimulatedScale at speed', () => {
  it('weighs a 100:14 batch from a script: cup, tare command, two pours, settled weights', async () => {
    const scale = fastScale({ format: 'echo' });
    const { lines, weights } = record(scale);
    // The hub's side: tare as soon as the cup is on.
    const codec = getCodec('echo');
    scale.onLine((line) => {
      const parsed = codec.parse(line);
      if (parsed.kind === 'weight' && parsed.grams > 39 && !parsed.tare && lines.length < 200) {
        scale.receive(codec.command('tare')!);
      }
    });
    scale.start();
    await scale.runScript([
      { do: 'place-cup', massG: 40 },
      { do: 'wait-for-tare', timeoutS: 10 },
      { do: 'pour', grams: 100, rateGPerS: 8 },
      { do: 'settle' },
      { do: 'pour', grams: 14.1, rateGPerS: 2 },
      { do: 'settle' },
    ]);
    const tareReply = lines.find((line): line is Weight => line.kind === 'weight' && !!line.tare);
    expect(tareReply?.grams).toBeCloseTo(40, 1);
    expect(scale.netG).toBeCloseTo(114.1, 1);
    await scale.settle();
    const last = weights().at(-1)!;
    expect(last.stable).toBe(true);
    expect(Math.abs(last.grams - 114.1)).toBeLessThanOrEqual(0.03);
  });

  it('flags a pour unstable until it has settled, and tapers the flow near the end', async () => {
    const scale = fastScale({ seed: 3 });
    const { weights } = record(scale);
    scale.start();
    scale.placeCup(40);
    await scale.settle();
    const before = weights().length;
    await scale.pour(50, 10);
    const atPourEnd = weights().length;
    await scale.settle();
    const pourLines = weights().slice(before, atPourEnd);
    const settling = weights().slice(atPourEnd);
    expect(pourLines.length).toBeGreaterThan(20);
    expect(pourLines.every((line) => line.stable === false)).toBe(true);
    // Settling takes a few readings (0.4 s at least) before the first stable one.
    const firstStable = settling.findIndex((line) => line.stable);
    expect(firstStable).toBeGreaterThanOrEqual(8);
    expect(Math.abs(settling[firstStable]!.grams - 90)).toBeLessThanOrEqual(0.03);
    // Full flow mid-pour is about 10 g/s, 0.5 g a reading at 20 readings a second; the last
    // readings of the pour climb much more slowly.
    const steps = pourLines.slice(1).map((line, i) => line.grams - pourLines[i]!.grams);
    const middle = steps.slice(steps.length / 3, (2 * steps.length) / 3);
    const average = (values: number[]) => values.reduce((a, b) => a + b, 0) / values.length;
    expect(average(middle)).toBeGreaterThan(0.4);
    expect(average(middle)).toBeLessThan(0.6);
    expect(average(steps.slice(-4))).toBeLessThan(average(middle) / 2);
  });

  it('answers stable weight, immediate weight, zero, repeat and unknown commands (echo)', async () => {
    const scale = fastScale({ format: 'echo', continuous: false });
    const raw: string[] = [];
    scale.onLine((line) => raw.push(line));
    scale.start();
    scale.placeCup(25);
    await scale.settle();
    expect(raw).toEqual([]);
    scale.receive('SI');
    expect(raw).toHaveLength(1);
    scale.receive('S');
    await scale.settle();
    scale.receive('FOO');
    const codec = getCodec('echo');
    expect(codec.parse(raw[1]!)).toMatchObject({ kind: 'weight', stable: true });
    expect(Math.abs((codec.parse(raw[1]!) as Weight).grams - 25)).toBeLessThanOrEqual(0.02);
    expect(raw[2]).toBe('ES');
    scale.receive('Z');
    await new Promise((resolve) => setTimeout(resolve, 30));
    expect(raw.at(-1)).toBe('Z A');
    expect(Math.abs(scale.grossG)).toBeLessThanOrEqual(0.02);
    scale.receive('SIR');
    const count = raw.length;
    await new Promise((resolve) => setTimeout(resolve, 60));
    expect(raw.length).toBeGreaterThan(count + 10);
  });
});

describe('SimulatedScale physics (advanced by hand)', () => {
  it('prints the same lines for the same seed and different lines for another', () => {
    const run = (seed: number) => {
      const scale = new SimulatedScale({ seed });
      const lines: string[] = [];
      scale.onLine((line) => lines.push(line));
      scale.placeCup(40);
      scale.advance(3);
      return lines;
    };
    expect(run(11)).toEqual(run(11));
    expect(run(11)).not.toEqual(run(12));
  });

  it('shows noise of the order of the readability at rest', () => {
    const scale = new SimulatedScale({ readabilityG: 0.1, seed: 5 });
    const { weights } = record(scale);
    scale.placeCup(200);
    scale.advance(3);
    const resting = weights().slice(-20);
    expect(resting.every((line) => line.stable)).toBe(true);
    expect(resting.every((line) => Math.abs(line.grams - 200) <= 0.2)).toBe(true);
    expect(new Set(resting.map((line) => line.grams)).size).toBeGreaterThan(1);
  });

  it('reads the cup as negative when it is lifted after a tare, and zero when it is back', () => {
    const scale = new SimulatedScale({ format: 'headered' });
    const { weights } = record(scale);
    scale.placeCup(40);
    scale.advance(3);
    scale.pressTare();
    scale.advance(0.5);
    expect(weights().at(-1)).toMatchObject({ mode: 'net' });
    expect(scale.tareG).toBeCloseTo(40, 1);
    scale.liftCup();
    scale.advance(3);
    expect(weights().at(-1)!.grams).toBeCloseTo(-40, 1);
    scale.returnCup();
    scale.advance(3);
    expect(weights().at(-1)!.grams).toBeCloseTo(0, 1);
  });

  it('shows overload above capacity and underload far below zero', () => {
    const scale = new SimulatedScale({ capacityG: 200 });
    const { lines } = record(scale);
    scale.placeCup(150);
    scale.advance(2);
    expect(lines.at(-1)!.kind).toBe('weight');
    scale.receive('Z');
    scale.advance(1);
    expect(scale.grossG).toBeCloseTo(0, 1);
    void scale.pour(40, 20).catch(() => undefined);
    scale.advance(6);
    expect(lines.at(-1)).toMatchObject({ kind: 'weight', stable: true });
    // 150 g zeroed away and 70 g poured: it shows 70 g, but 220 g are on a 200 g pan.
    void scale.pour(30, 20).catch(() => undefined);
    scale.advance(4);
    expect(lines.at(-1)!.kind).toBe('overload');
    scale.liftCup();
    scale.advance(2);
    // Zeroed with 150 g on the pan, lifting the cup reads −150 g: beyond 5 % of capacity.
    expect(lines.at(-1)!.kind).toBe('underload');
  });

  it('drifts slowly', () => {
    const scale = new SimulatedScale({ driftGPerMin: 0.5, noiseG: 0 });
    scale.advance(120);
    expect(scale.grossG).toBeCloseTo(1, 2);
  });

  it('prints every unit with the codec', () => {
    for (const unit of ['g', 'kg', 'lb', 'oz'] as const) {
      for (const format of ['headered', 'echo', 'plain'] as ScaleFormat[]) {
        const scale = new SimulatedScale({ unit, format, noiseG: 0 });
        const { weights } = record(scale);
        scale.placeCup(453.59237);
        scale.advance(3);
        const last = weights().at(-1)!;
        expect(last.unit).toBe(unit);
        // 1 lb = 453.592 37 g (international yard and pound agreement, 1959).
        expect(Math.abs(last.grams - 453.59)).toBeLessThan(0.02);
      }
    }
  });

  it('prints nothing while unplugged and ignores commands, then resumes', () => {
    const scale = new SimulatedScale({ format: 'echo' });
    const raw: string[] = [];
    const plugs: boolean[] = [];
    scale.onLine((line) => raw.push(line));
    scale.onPlug((plugged) => plugs.push(plugged));
    scale.advance(1);
    const printed = raw.length;
    scale.unplug();
    scale.receive('SI');
    scale.advance(2);
    expect(raw.length).toBe(printed);
    scale.replug();
    scale.advance(1);
    expect(raw.length).toBe(printed + 20);
    expect(plugs).toEqual([false, true]);
  });

  it('answers busy when a tare never settles', () => {
    const scale = new SimulatedScale({ format: 'echo' });
    const raw: string[] = [];
    scale.onLine((line) => raw.push(line));
    void scale.pour(1000, 10).catch(() => undefined);
    scale.receive('T');
    scale.advance(6);
    expect(raw).toContain('T I');
    expect(scale.tareG).toBeUndefined();
  });

  it('lets a plain balance, which takes no commands, go past wait-for-tare', async () => {
    const scale = new SimulatedScale({ format: 'plain' });
    scale.receive('T');
    await scale.waitForTare(1);
    expect(scale.tareG).toBeUndefined();
  });

  it('fails a wait for a tare that never comes', async () => {
    const scale = new SimulatedScale({ format: 'headered' });
    const waiting = scale.waitForTare(2);
    scale.advance(3);
    await expect(waiting).rejects.toThrow(/No tare within 2 s/);
  });

  it('fails pending pours when stopped', async () => {
    const scale = new SimulatedScale();
    const pouring = scale.pour(10, 1);
    scale.stop();
    await expect(pouring).rejects.toBeInstanceOf(SimulatorStoppedError);
  });

  it('names a bad option and a bad script step', async () => {
    expect(() => new SimulatedScale({ rateHz: 0 })).toThrow(/rateHz/);
    expect(() => new SimulatedScale({ format: 'morse' as ScaleFormat })).toThrow(/format/);
    const scale = new SimulatedScale();
    await expect(
      scale.runScript([{ do: 'pour', grams: -1, rateGPerS: 2 }] as never),
    ).rejects.toThrow(/grams/);
    expect(scale.options.rateHz).toBe(DEFAULT_SIMULATOR_OPTIONS.rateHz);
  });
});
