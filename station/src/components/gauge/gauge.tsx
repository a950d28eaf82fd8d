import type { ReadingEvent, ScaleState, ScaleStatusEvent } from '@tareline/protocol';
import { useRef, type ReactNode } from 'react';
import { useEasedScaleX } from '../../hooks/use-eased-scale';
import type { GaugeBand, GaugeVerdict } from './types';
import { decimalsForReadability, formatGrams } from '../../lib/grams';
import { fineWindow, trackEndG, trackFraction } from './track';
import { VerdictBadge } from './verdict-badge';

export interface GaugeProps {
  reading?: ReadingEvent | undefined;
  status: ScaleStatusEvent;
  targetG?: number | undefined;
  band?: GaugeBand | undefined;
  /** From this net weight on, the pour is near the target: the gauge asks to slow down. */
  slowDownFromG?: number | undefined;
  /** What the hub judged; shown only while the scale is online. */
  verdict?: GaugeVerdict | null | undefined;
  /** What is being weighed, e.g. "Part B". */
  label?: string | undefined;
  /** The scale interval d in grams, for the decimals shown (default 0.01 g). */
  readabilityG?: number | undefined;
  /** The operator's controls for this pour, beside the verdict (kept on one screen at 1280 × 800). */
  actions?: ReactNode;
}

const STATE_SHOWN: Record<ScaleState, { word: string; dot: string }> = {
  connecting: { word: 'connecting', dot: 'bg-line' },
  online: { word: 'online', dot: 'bg-go' },
  stale: { word: 'not sending', dot: 'bg-brass' },
  offline: { word: 'offline', dot: 'bg-over' },
  error: { word: 'error', dot: 'bg-over' },
};

const percent = (fraction: number) => `${(fraction * 100).toFixed(3)}%`;

/**
 * The bench gauge: the net weight in very large digits, a track with the target line, the band
 * around it and the slow-down zone before it, and the hub's verdict. Draws only what the hub
 * sent: no verdict unless the scale is online.
 */
export function Gauge({
  reading,
  status,
  targetG,
  band,
  slowDownFromG,
  verdict,
  label,
  readabilityG = 0.01,
  actions,
}: GaugeProps) {
  const fillRef = useRef<HTMLDivElement>(null);
  const online = status.state === 'online';
  const netG = reading?.netG ?? 0;
  // Inside the slow-down zone (and beyond) the track shows only the grams around the target,
  // magnified so the band is wide enough to aim at.
  const fine =
    online &&
    !!reading &&
    !reading.outOfRange &&
    targetG !== undefined &&
    band !== undefined &&
    slowDownFromG !== undefined &&
    netG >= slowDownFromG;
  const { startG, endG } =
    fine && band && targetG !== undefined
      ? fineWindow(targetG, band)
      : { startG: 0, endG: trackEndG(netG, targetG, band?.highG) };
  const at = (grams: number) => trackFraction(grams, endG, startG);
  useEasedScaleX(fillRef, reading && !reading.outOfRange ? at(netG) : 0);

  const decimals = decimalsForReadability(readabilityG);
  const digits = !reading
    ? '—'
    : reading.outOfRange === 'overload'
      ? 'OVERLOAD'
      : reading.outOfRange === 'underload'
        ? 'UNDERLOAD'
        : formatGrams(netG, decimals);
  const nearTarget =
    online &&
    slowDownFromG !== undefined &&
    band !== undefined &&
    netG >= slowDownFromG &&
    netG < band.lowG;
  const state = STATE_SHOWN[status.state];
  const toGoG = online && reading && targetG !== undefined ? targetG - netG : undefined;

  return (
    <section
      aria-label={label ? `Gauge: ${label}` : 'Gauge'}
      className="rounded-2xl bg-panel p-6 shadow-sm ring-1 ring-line"
    >
      <div className="flex items-center justify-between gap-4">
        <h2 className="text-4xl font-semibold">{label ?? 'Net weight'}</h2>
        <div
          role="status"
          aria-live="polite"
          className="flex items-center gap-2 text-lg"
          title={status.detail}
        >
          <span
            aria-hidden="true"
            className={`inline-block h-3.5 w-3.5 rounded-full ${state.dot}`}
          />
          <span className="font-semibold">Scale: {state.word}</span>
        </div>
      </div>
      {!online && <p className="mt-1 text-lg text-muted">{status.detail}</p>}

      <p
        className={`mt-2 flex items-baseline justify-end gap-4 font-bold tabular-nums leading-none ${online ? '' : 'text-muted'}`}
      >
        {toGoG !== undefined && toGoG > 0 && (
          // What is still to pour, beside the big figure, at the decimals the scale shows.
          <span data-testid="to-go" className="mr-auto self-center text-5xl text-steel">
            {formatGrams(toGoG, decimals)} g to go
          </span>
        )}
        <span className="sr-only">Net weight</span>
        <span data-testid="net-weight" className="text-[12rem] tracking-tight">
          {digits}
        </span>
        <span className="text-6xl">g</span>
      </p>
      {reading && (
        <p className="text-right text-[2rem] leading-tight">
          <span className="text-muted">
            {reading.stable ? 'stable' : 'moving'} · gross {formatGrams(reading.grossG, decimals)} g
          </span>
          {targetG !== undefined && (
            <strong data-testid="target-line"> · target {formatGrams(targetG, decimals)} g</strong>
          )}
        </p>
      )}

      <div
        data-testid="gauge-track"
        data-view={fine ? 'fine' : 'whole'}
        className="relative mt-6 h-16 overflow-hidden rounded-lg bg-paper ring-1 ring-line"
        aria-hidden="true"
      >
        {!fine && slowDownFromG !== undefined && band && (
          <div
            data-zone="slow-down"
            className="absolute inset-y-0 bg-[repeating-linear-gradient(135deg,var(--color-brass)_0_6px,transparent_6px_14px)] opacity-60"
            style={{
              left: percent(at(slowDownFromG)),
              width: percent(at(band.lowG) - at(slowDownFromG)),
            }}
          />
        )}
        {band && (
          <div
            data-zone="band"
            className="absolute inset-y-0 bg-go/25 ring-2 ring-go ring-inset"
            style={{
              left: percent(at(band.lowG)),
              width: percent(at(band.highG) - at(band.lowG)),
            }}
          />
        )}
        <div
          ref={fillRef}
          data-zone="fill"
          className={`absolute inset-y-3 left-0 w-full origin-left will-change-transform ${online ? 'bg-steel' : 'bg-line'}`}
          style={{ transform: 'scaleX(0)' }}
        />
        {targetG !== undefined && (
          <div
            data-zone="target"
            className="absolute inset-y-0 w-1 -translate-x-1/2 bg-ink"
            style={{ left: percent(at(targetG)) }}
          />
        )}
      </div>
      {fine && (
        // The magnified track says so, with the grams at its ends.
        <p className="mt-1 flex justify-between text-2xl text-muted tabular-nums">
          <span>{formatGrams(startG, decimals + 1)} g</span>
          <span className="font-semibold text-ink">Close-up around the target</span>
          <span>{formatGrams(endG, decimals + 1)} g</span>
        </p>
      )}

      <div className="mt-5 flex min-h-24 items-center gap-6">
        {online && verdict ? (
          <VerdictBadge verdict={verdict} />
        ) : verdict !== undefined ? (
          <p className="text-2xl font-semibold text-muted">
            No verdict while the scale is {state.word}
          </p>
        ) : null}
        {nearTarget && (
          <p className="flex items-center gap-3 text-4xl font-bold">
            <svg viewBox="0 0 24 24" aria-hidden="true" className="h-10 w-10">
              <path
                d="M3 20 L12 4 L21 20 Z"
                fill="var(--color-brass)"
                stroke="currentColor"
                strokeWidth="1.5"
              />
              <path
                d="M12 10 V14 M12 16.5 V17"
                stroke="currentColor"
                strokeWidth="2.2"
                strokeLinecap="round"
              />
            </svg>
            Slow down: near the target
          </p>
        )}
        {actions && (
          <div className="ml-auto flex flex-wrap items-center justify-end gap-4">{actions}</div>
        )}
      </div>
    </section>
  );
}
