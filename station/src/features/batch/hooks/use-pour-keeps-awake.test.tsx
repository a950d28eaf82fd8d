import type { ReadingEvent } from '@tareline/protocol';
import { renderHook } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { BENCH_ACTIVITY_EVENT } from '../../../lib/bench-activity';
import { usePourKeepsAwake } from './use-pour-keeps-awake';

const reading = (netG: number): ReadingEvent => ({
  benchId: 'bench-1',
  seq: 1,
  t: 0,
  grossG: netG + 40,
  netG,
  stable: false,
});

let seen = 0;
const count = () => (seen += 1);
afterEach(() => {
  window.removeEventListener(BENCH_ACTIVITY_EVENT, count);
  seen = 0;
});

describe('a pour keeps the bench awake', () => {
  it('counts a moving weight as activity while weighing, but not noise or an idle scale', () => {
    window.addEventListener(BENCH_ACTIVITY_EVENT, count);
    const { rerender } = renderHook(
      ({ g, weighing }: { g: number; weighing: boolean }) =>
        usePourKeepsAwake(reading(g), 0.01, weighing),
      { initialProps: { g: 0, weighing: true } },
    );
    // ±0.02 g of noise on a 0.01 g scale: below five intervals, nobody is pouring.
    rerender({ g: 0.02, weighing: true });
    rerender({ g: -0.01, weighing: true });
    expect(seen).toBe(0);
    rerender({ g: 3.5, weighing: true });
    rerender({ g: 7.0, weighing: true });
    expect(seen).toBe(2);
    // No batch being weighed: the scale moving is not a reason to stay signed in.
    rerender({ g: 20, weighing: false });
    expect(seen).toBe(2);
  });
});
