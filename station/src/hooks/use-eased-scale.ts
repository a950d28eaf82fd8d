import { useEffect, useRef, type RefObject } from 'react';

/** How quickly the fill catches up with a new reading: about 63 % of the way in this time. */
const EASE_MS = 60;

/**
 * Moves an element's `scaleX` towards `fraction` frame by frame (requestAnimationFrame), writing
 * only `style.transform`, so 25 readings a second draw at 60 frames a second without React
 * re-rendering or the browser laying the page out again. Stops when it has arrived.
 */
export function useEasedScaleX(ref: RefObject<HTMLElement | null>, fraction: number): void {
  const goal = useRef(fraction);
  const shown = useRef(fraction);
  const frame = useRef<number | undefined>(undefined);

  useEffect(() => {
    goal.current = fraction;
    const element = ref.current;
    if (!element) return;
    if (typeof requestAnimationFrame !== 'function') {
      element.style.transform = `scaleX(${fraction})`;
      return;
    }
    if (frame.current !== undefined) return;
    let last: number | undefined;
    const tick = (now: number) => {
      const dt = last === undefined ? 16 : now - last;
      last = now;
      const step = 1 - Math.exp(-dt / EASE_MS);
      shown.current += (goal.current - shown.current) * step;
      if (Math.abs(goal.current - shown.current) < 0.0005) shown.current = goal.current;
      element.style.transform = `scaleX(${shown.current})`;
      frame.current = shown.current === goal.current ? undefined : requestAnimationFrame(tick);
    };
    frame.current = requestAnimationFrame(tick);
  }, [fraction, ref]);

  useEffect(
    () => () => {
      if (frame.current !== undefined) cancelAnimationFrame(frame.current);
      frame.current = undefined;
    },
    [],
  );
}
