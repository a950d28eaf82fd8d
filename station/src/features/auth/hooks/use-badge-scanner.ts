import { useEffect, useRef } from 'react';

/** A reader types a whole code within a few ms per key; a person is far slower. */
const MAX_KEY_GAP_MS = 80;
const MIN_CODE_LENGTH = 4;

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
 * Catches a badge reader that types like a keyboard: quick keys then Enter, anywhere on the page
 * while no text box has the focus (typing into a box is left to the box). Slow keys start over,
 * so stray presses never sign anyone in.
 */
export function useBadgeScanner(onScan: (code: string) => void, enabled = true): void {
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
        if (code.length >= MIN_CODE_LENGTH) {
          event.preventDefault();
          onScanRef.current(code);
        }
        return;
      }
      if (event.key.length === 1) buffer += event.key;
    };
    window.addEventListener('keydown', onKeyDown);
    return () => window.removeEventListener('keydown', onKeyDown);
  }, [enabled]);
}
