import { useEffect, useState } from 'react';

/**
 * The time now (ms), refreshed a few times a second until `untilMs`, so a countdown turns over
 * close to the real second boundary and stops once there is nothing left to count.
 */
export function useNow(untilMs: number, everyMs = 250): number {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    const timer = setInterval(() => {
      const at = Date.now();
      setNow(at);
      if (at >= untilMs) clearInterval(timer);
    }, everyMs);
    return () => clearInterval(timer);
  }, [untilMs, everyMs]);
  return now;
}
