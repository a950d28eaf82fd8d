import { useEffect, useRef, useState } from 'react';
import { BENCH_ACTIVITY_EVENT } from '../../../lib/bench-activity';

const ACTIVITY_EVENTS = ['pointerdown', 'keydown', 'touchstart', 'wheel', BENCH_ACTIVITY_EVENT];

/**
 * Seconds left before an idle screen signs out, or null while more than `warnS` remain. Any touch,
 * click or key starts the time again, and so does the scale moving under a pour. Calls `onIdle` once when it runs out.
 */
export function useIdleCountdown(
  idleMinutes: number,
  onIdle: () => void,
  warnS = 30,
): number | null {
  const [secondsLeft, setSecondsLeft] = useState<number | null>(null);
  const onIdleRef = useRef(onIdle);
  useEffect(() => {
    onIdleRef.current = onIdle;
  });

  useEffect(() => {
    const limitMs = idleMinutes * 60_000;
    let lastActivity = Date.now();
    let fired = false;
    const onActivity = () => {
      lastActivity = Date.now();
      setSecondsLeft(null);
    };
    for (const name of ACTIVITY_EVENTS) window.addEventListener(name, onActivity, true);
    const timer = setInterval(() => {
      const leftMs = lastActivity + limitMs - Date.now();
      if (leftMs <= 0) {
        if (!fired) {
          fired = true;
          onIdleRef.current();
        }
        return;
      }
      const left = Math.ceil(leftMs / 1000);
      setSecondsLeft(left <= warnS ? left : null);
    }, 250);
    return () => {
      clearInterval(timer);
      for (const name of ACTIVITY_EVENTS) window.removeEventListener(name, onActivity, true);
    };
  }, [idleMinutes, warnS]);

  return secondsLeft;
}
