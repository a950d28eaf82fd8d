import { useEffect, useRef } from 'react';

/**
 * Lot labels are read by the same kind of keyboard-wedge reader as badges: a burst of keys
 * (a few ms apart) and Enter. Caught on the whole page unless a text box has the focus (then the
 * box takes the code itself). A person typing is too slow to count as a scan.
 */
export function useLabelScanner(onScan: (code: string) => void, enabled = true): void {
  const latest = useRef(onScan);
  useEffect(() => {
    latest.current = onScan;
  });
  useEffect(() => {
    if (!enabled) return;
    let code = '';
    let at = 0;
    const listener = (e: KeyboardEvent) => {
      const el = e.target as HTMLElement | null;
      if (el?.closest('input, textarea, select, [contenteditable="true"]')) return;
      const now = performance.now();
      // Readers send keys well under 80 ms apart (common practice, no published source).
      if (now - at > 80) code = '';
      at = now;
      if (e.key !== 'Enter') {
        if (e.key.length === 1 && !e.ctrlKey && !e.metaKey && !e.altKey) code += e.key;
        return;
      }
      const scanned = code.trim();
      code = '';
      if (scanned.length >= 3) {
        e.preventDefault();
        latest.current(scanned);
      }
    };
    window.addEventListener('keydown', listener);
    return () => window.removeEventListener('keydown', listener);
  }, [enabled]);
}
