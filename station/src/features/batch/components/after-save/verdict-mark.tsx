import type { BatchVerdict } from '@tareline/protocol';

/**
 * The saved verdict as a shape and a word, readable without colour: on a monochrome label
 * printer, and for anyone who cannot tell green from red.
 */
export function VerdictMark({ verdict, className }: { verdict: BatchVerdict; className: string }) {
  return (
    <span className="inline-flex items-center gap-3">
      <svg
        viewBox="0 0 24 24"
        aria-hidden="true"
        className={`shrink-0 ${className}`}
        fill="none"
        stroke="currentColor"
        strokeWidth="2.5"
        strokeLinecap="round"
        strokeLinejoin="round"
      >
        {verdict === 'GO' ? (
          // A tick in a circle: weighed within the band.
          <>
            <circle cx="12" cy="12" r="9.5" />
            <path d="M7 12.5 L10.5 16 L17 8.5" />
          </>
        ) : (
          // A cross in an octagon: stop, this batch is off ratio.
          <>
            <path d="M8 2.5 H16 L21.5 8 V16 L16 21.5 H8 L2.5 16 V8 Z" />
            <path d="M8.5 8.5 L15.5 15.5 M15.5 8.5 L8.5 15.5" />
          </>
        )}
      </svg>
      <span className="font-bold tracking-wide">{verdict}</span>
    </span>
  );
}
