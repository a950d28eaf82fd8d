import type { ReactNode } from 'react';
import type { GaugeVerdict } from './types';

const SHOWN: Record<
  GaugeVerdict,
  { word: string; hint: string; className: string; icon: ReactNode }
> = {
  UNDER: {
    word: 'UNDER',
    hint: 'keep pouring',
    className: 'bg-under text-paper',
    // An arrow pointing up: more to come.
    icon: <path d="M12 4 L20 14 H15 V20 H9 V14 H4 Z" fill="currentColor" />,
  },
  SETTLING: {
    word: 'SETTLING',
    hint: 'hold still',
    className: 'bg-brass text-ink',
    // An hourglass: wait.
    icon: <path d="M6 3 H18 L13 12 L18 21 H6 L11 12 Z" fill="currentColor" />,
  },
  GO: {
    word: 'GO',
    hint: 'in the band',
    className: 'bg-go text-paper',
    // A check mark.
    icon: (
      <path
        d="M4 12.5 L9.5 18 L20 6"
        fill="none"
        stroke="currentColor"
        strokeWidth="3.5"
        strokeLinecap="round"
        strokeLinejoin="round"
      />
    ),
  },
  OVER: {
    word: 'OVER',
    hint: 'too much poured',
    className: 'bg-over text-paper',
    // A cross in a square: stop.
    icon: (
      <>
        <rect
          x="2.5"
          y="2.5"
          width="19"
          height="19"
          rx="3"
          fill="none"
          stroke="currentColor"
          strokeWidth="2.5"
        />
        <path
          d="M8 8 L16 16 M16 8 L8 16"
          stroke="currentColor"
          strokeWidth="3"
          strokeLinecap="round"
        />
      </>
    ),
  },
};

/** The hub's verdict by colour, shape and word together, so no one needs to tell colours apart. */
export function VerdictBadge({ verdict }: { verdict: GaugeVerdict }) {
  const shown = SHOWN[verdict];
  return (
    <div
      className={`flex items-center gap-4 rounded-xl px-6 py-3 ${shown.className}`}
      data-verdict={verdict}
    >
      <svg viewBox="0 0 24 24" aria-hidden="true" className="h-14 w-14 shrink-0">
        {shown.icon}
      </svg>
      <div className="leading-tight">
        <div className="text-5xl font-bold tracking-wide">{shown.word}</div>
        <div className="text-xl font-medium">{shown.hint}</div>
      </div>
    </div>
  );
}
