import { useEffect, useRef } from 'react';

/**
 * A reader types a whole code within a few ms per key; a person is far slower. Readers send keys
 * well under 80 ms apart (common practice, no published source).
 */
const MAX_KEY_GAP_MS = 80;

function isTextField(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  if (target.isContentEditable) return true;
  if (target instanceof HTMLTextAreaElement || target instanceof HTMLSelectElement) return true;
  return (
    target instanceof HTMLInputElement &&
    !['button', 'checkbox', 'radio', 'submit'].includes(target.type)
  );
}

/**
 * Catches a keyboard-wedge reader (badges, lot labels): quick keys then Enter, anywhere on the
 * page while no text box has the focus (typing into a box is left to the box). Slow keys start
 * over, so stray presses never count as a scan; codes shorter than `minLength` are ignored.
 */
export function useCodeScanner(
  onScan: (code: string) => void,
  { enabled = true, minLength = 4 }: { enabled?: boolean; minLength?: number } = {},
): void {
  const onScanRef = useRef(onScan);
  useEffect(() => {
    onScanRef.current = onScan;
  });

  useEffect(() => {
    if (!enabled) return;
    let buffer = '';
    let lastKeyAt = 0;
    const onKeyDown = (event: KeyboardEvent) => {
      if (isTextField(event.target) || event.ctrlKey || event.metaKey || event.altKey) return;
      const now = performance.now();
      if (now - lastKeyAt > MAX_KEY_GAP_MS) buffer = '';
      lastKeyAt = now;
      if (event.key === 'Enter') {
        const code = buffer.trim();
        buffer = '';
        if (code.length >= minLength) {
          event.preventDefault();
          onScanRef.current(code);
        }
        return;
      }
      if (event.key.length === 1) buffer += event.key;
    };
    window.addEventListener('keydown', onKeyDown);
    return () => window.removeEventListener('keydown', onKeyDown);
  }, [enabled, minLength]);
}
