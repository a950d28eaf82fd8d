import { describe, expect, it } from 'vitest';
import { fieldErrors } from '../errors.js';
import { simulatorScriptSchema } from './simulator-script.js';

describe('simulatorScriptSchema', () => {
  it('accepts the weighing of a 100:14 batch in a 40 g cup', () => {
    const script = simulatorScriptSchema.parse([
      { do: 'place-cup', massG: 40 },
      { do: 'wait-for-tare', timeoutS: 10 },
      { do: 'pour', grams: 100, rateGPerS: 8 },
      { do: 'settle' },
      { do: 'pour', grams: 14.1, rateGPerS: 2 },
      { do: 'settle' },
      { do: 'wait', seconds: 1 },
      { do: 'lift-cup' },
      { do: 'return-cup' },
      { do: 'tare' },
      { do: 'unplug' },
      { do: 'replug' },
    ]);
    expect(script).toHaveLength(12);
    expect(script[2]).toEqual({ do: 'pour', grams: 100, rateGPerS: 8 });
  });

  it('names the bad field of each bad step', () => {
    const result = simulatorScriptSchema.safeParse([
      { do: 'pour', grams: -5, rateGPerS: 8 },
      { do: 'dance' },
      { do: 'place-cup' },
    ]);
    expect(result.success).toBe(false);
    expect(fieldErrors(result.error!).map((e) => e.path)).toEqual(['0.grams', '1.do', '2.massG']);
  });
});
