import { requirePositive } from './errors.js';

export interface PumpStrokes {
  /** Exact strokes for the mass, usually not a whole number. */
  strokes: number;
  /** The nearest whole number of strokes (at least 1). */
  wholeStrokes: number;
  /** Mass the whole strokes deliver. */
  deliveredG: number;
}

/** Strokes of a metered pump for a mass, given the mass one stroke delivers (weighed). */
export function pumpStrokes(massG: number, gramsPerStroke: number): PumpStrokes {
  requirePositive(massG, 'massG', 'mass');
  requirePositive(gramsPerStroke, 'gramsPerStroke', 'mass per stroke');
  const strokes = massG / gramsPerStroke;
  const wholeStrokes = Math.max(1, Math.round(strokes));
  return { strokes, wholeStrokes, deliveredG: wholeStrokes * gramsPerStroke };
}
