import { describe, expect, it } from 'vitest';
import { ratioText } from './ratio';

describe('ratioText', () => {
  it('shows a ratio as a person writes it', () => {
    expect(ratioText([100, 14])).toBe('100 : 14');
    expect(ratioText([100, 80, 2])).toBe('100 : 80 : 2');
    // 1 : 1 by volume at specific gravities 1.16 and 1.04: 1.04 / 1.16 = 0.8966 by weight.
    expect(ratioText([1, 0.8965517241379312])).toBe('1 : 0.8966');
  });
});
