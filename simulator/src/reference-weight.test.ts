import { describe, expect, it } from 'vitest';
import { SimulatedScale } from './simulated-scale.js';

/** A quiet 0.01 g balance, run by `advance` (no wall clock). */
function quietScale() {
  return new SimulatedScale({ noiseG: 0, driftGPerMin: 0, seed: 3 });
}

describe('the reference weight and the balance’s own faults', () => {
  it('reads a placed weight, and zero again once it is lifted', () => {
    const scale = quietScale();
    scale.placeWeight(200);
    scale.advance(3);
    expect(scale.stable).toBe(true);
    expect(scale.grossG).toBe(200);
    scale.liftWeight();
    scale.advance(3);
    expect(scale.grossG).toBe(0);
  });

  it('adds the offset and the span error to the load, not to the empty pan', () => {
    const scale = quietScale();
    // 200 g × 500 ppm = 0.1 g, plus 0.05 g offset: 200.15 g.
    scale.setScaleErrors({ offsetG: 0.05, spanPpm: 500 });
    scale.advance(1);
    expect(scale.grossG).toBe(0);
    scale.placeWeight(200);
    scale.advance(3);
    expect(scale.grossG).toBe(200.15);
  });

  it('spreads the reading from one placement to the next by the spread set', () => {
    const scale = quietScale();
    scale.setScaleErrors({ spreadG: 0.05 });
    const readings: number[] = [];
    for (let i = 0; i < 10; i++) {
      scale.placeWeight(100);
      scale.advance(3);
      readings.push(scale.grossG);
      scale.liftWeight();
      scale.advance(3);
    }
    expect(new Set(readings).size).toBeGreaterThan(3);
    for (const r of readings) expect(Math.abs(r - 100)).toBeLessThan(0.3);
  });

  it('runs the new script steps', async () => {
    const scale = quietScale();
    const done = scale.runScript([
      { do: 'set-scale-error', offsetG: -0.3 },
      { do: 'place-weight', massG: 50 },
      { do: 'settle' },
    ]);
    // The script takes its steps between ticks: let it, tick, and repeat until it is done.
    let finished = false;
    void done.then(() => (finished = true));
    for (let i = 0; i < 100 && !finished; i++) {
      await new Promise((resolve) => setTimeout(resolve, 0));
      scale.advance(0.2);
    }
    await done;
    expect(scale.weightPlaced).toBe(true);
    expect(scale.grossG).toBe(49.7);
    expect(scale.scaleErrors).toEqual({ offsetG: -0.3, spanPpm: 0, spreadG: 0 });
  });
});
