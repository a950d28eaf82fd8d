import { describe, expect, it } from 'vitest';
import { decodeTrace, encodeTrace, TRACE_BYTES_PER_POINT } from './pour-trace.js';

describe('pour trace', () => {
  it('round-trips readings to the milligram in 8 bytes each', () => {
    const points: [number, number][] = [
      [0, 0],
      [50, 12.345],
      [100, -0.02],
      [125_000, 3999.999],
    ];
    const bytes = encodeTrace(points);
    expect(bytes.byteLength).toBe(points.length * TRACE_BYTES_PER_POINT);
    expect(decodeTrace(bytes)).toEqual(points);
  });

  it('rounds to the milligram and survives a buffer that is a slice of a larger one', () => {
    const bytes = encodeTrace([[10.4, 1.23456]]);
    const padded = new Uint8Array(bytes.byteLength + 3);
    padded.set(bytes, 3);
    expect(decodeTrace(padded.subarray(3))).toEqual([[10, 1.235]]);
  });

  it('decodes nothing from an empty or missing trace', () => {
    expect(decodeTrace(null)).toEqual([]);
    expect(decodeTrace(new Uint8Array())).toEqual([]);
  });
});
