import type { ReadingEvent } from '@tareline/protocol';
import { useEffect, useRef } from 'react';
import { reportBenchActivity } from '../../../lib/bench-activity';

/**
 * While a batch is being weighed, a weight that moves by more than noise counts as someone at the
 * bench, so a slow part B pour does not end in an idle sign-out.
 */
export function usePourKeepsAwake(
  reading: ReadingEvent | undefined,
  readabilityG: number,
  weighing: boolean,
): void {
  const lastG = useRef<number | undefined>(undefined);
  // Five scale intervals: noise and drift stay below it, any real pour goes past it at once.
  const stepG = Math.max(5 * readabilityG, 0.05);
  const netG = reading?.netG;
  useEffect(() => {
    if (!weighing || netG === undefined) return;
    if (lastG.current === undefined || Math.abs(netG - lastG.current) >= stepG) {
      if (lastG.current !== undefined) reportBenchActivity();
      lastG.current = netG;
    }
  }, [weighing, netG, stepG]);
}
