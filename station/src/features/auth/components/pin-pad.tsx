import { useEffect, useState } from 'react';

const KEYS = ['1', '2', '3', '4', '5', '6', '7', '8', '9'] as const;
const MAX_DIGITS = 8;

interface PinPadProps {
  onSubmit: (pin: string) => void;
  onCancel: () => void;
  busy?: boolean;
}

/**
 * PIN entry for gloved hands: keys of at least 56 px (here 80 px), digits shown as dots. A
 * keyboard's digits, Backspace and Enter work too.
 */
export function PinPad({ onSubmit, onCancel, busy = false }: PinPadProps) {
  const [pin, setPin] = useState('');
  const press = (digit: string) => setPin((p) => (p.length < MAX_DIGITS ? p + digit : p));
  const erase = () => setPin((p) => p.slice(0, -1));
  const submit = () => {
    if (pin.length >= 4 && !busy) onSubmit(pin);
  };

  useEffect(() => {
    const onKey = (event: KeyboardEvent) => {
      if (/^\d$/.test(event.key)) press(event.key);
      else if (event.key === 'Backspace') erase();
      else if (event.key === 'Enter') submit();
      else if (event.key === 'Escape') onCancel();
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  });

  const key =
    'flex h-20 min-h-14 w-24 min-w-14 items-center justify-center rounded-xl border-2 border-line bg-panel text-3xl font-bold shadow-sm active:bg-brass disabled:opacity-50';
  return (
    <div role="group" aria-label="PIN pad" className="flex flex-col items-center gap-4">
      <output aria-label="PIN entered" className="flex h-10 items-center gap-3 text-4xl">
        {pin.length === 0 ? (
          <span className="text-lg text-muted">Enter your PIN</span>
        ) : (
          Array.from(pin, (_, i) => (
            <span key={i} aria-hidden="true">
              ●
            </span>
          ))
        )}
        <span className="sr-only">{pin.length} digits</span>
      </output>
      <div className="grid grid-cols-3 gap-3">
        {KEYS.map((d) => (
          <button key={d} type="button" className={key} onClick={() => press(d)} disabled={busy}>
            {d}
          </button>
        ))}
        <button type="button" className={key} onClick={erase} disabled={busy} aria-label="Erase">
          ⌫
        </button>
        <button type="button" className={key} onClick={() => press('0')} disabled={busy}>
          0
        </button>
        <button
          type="button"
          className={`${key} bg-go text-paper`}
          onClick={submit}
          disabled={busy || pin.length < 4}
        >
          OK
        </button>
      </div>
      <button
        type="button"
        className="min-h-14 rounded-xl px-6 text-xl font-semibold underline"
        onClick={onCancel}
      >
        Cancel
      </button>
    </div>
  );
}
