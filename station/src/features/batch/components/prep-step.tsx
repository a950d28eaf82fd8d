import { SCALE_TOO_COARSE_PATH, type LoginRequest, type Material } from '@tareline/protocol';
import { useEffect, useState } from 'react';
import { ApiRequestError } from '../../../lib/api-client';
import { formatCountdown } from '../../../lib/countdown';
import { latestSds, useMaterialDocuments } from '../../../lib/material-documents';
import { dangerButton, primaryButton, secondaryButton } from './buttons';
import { HubError } from './hub-error';
import { LeadOverride } from './lead-override';

/** Said for every material, beside its own cautions; the SDS and local rules come first. */
const GENERAL_CAUTIONS = [
  'Resins and hardeners can sensitise skin and lungs: wear chemical-resistant gloves and eye protection, and work with ventilation.',
  'A large mass in one cup heats itself (exotherm) and can smoke or crack: mix no more than you can pour within the pot life.',
];

type Agitation =
  | { kind: 'waiting' }
  | { kind: 'running'; endsAt: number }
  | { kind: 'done' }
  | { kind: 'skipped' };

/**
 * Step 4: the material's cautions and where its safety data sheet is, the general cautions, and
 * for filled materials that settle a stirring timer. "Start" asks the hub to open the batch.
 */
export function PrepStep({
  material,
  starting,
  startError,
  onStart,
}: {
  material: Material;
  starting: boolean;
  startError: Error | null;
  /** Starts the batch; with a lead's e-mail and password when the scale is too coarse for it. */
  onStart: (override?: LoginRequest) => void;
}) {
  // Once the hub has said the scale is too coarse, the lead's form stays until the batch starts
  // (a mistyped password is refused, and the lead tries again).
  const [needsLead, setNeedsLead] = useState(false);
  const tooCoarse =
    startError instanceof ApiRequestError &&
    startError.body.errors.some((e) => e.path === SCALE_TOO_COARSE_PATH);
  if (tooCoarse && !needsLead) setNeedsLead(true);
  const needsAgitation = material.agitateMin > 0;
  const [agitation, setAgitation] = useState<Agitation>({ kind: 'waiting' });
  const ready = !needsAgitation || agitation.kind === 'done' || agitation.kind === 'skipped';
  const sds = latestSds(useMaterialDocuments(material.id).data);

  return (
    <div className="grid items-start gap-6 lg:grid-cols-[3fr_2fr]">
      <section
        aria-labelledby="cautions-title"
        className="rounded-2xl bg-panel p-6 ring-1 ring-line"
      >
        <h3 id="cautions-title" className="flex items-center gap-3 text-2xl font-bold">
          <span aria-hidden="true">⚠</span> Before you open the containers
        </h3>
        <ul className="mt-3 list-disc space-y-2 pl-7 text-lg">
          {material.cautions.map((c) => (
            <li key={c}>{c}</li>
          ))}
          {GENERAL_CAUTIONS.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
        <p className="mt-4 text-lg">
          <strong>Safety data sheet:</strong>{' '}
          {sds
            ? 'open it with the button below'
            : (material.sdsRef ?? 'not recorded for this material: ask a lead before you pour')}
          . It and your local rules come before anything this screen says.
        </p>
        {sds && (
          // A plain link: one touch opens the PDF in a new tab, signed for a few minutes.
          <a
            href={sds.openUrl}
            target="_blank"
            rel="noopener"
            className={`${secondaryButton} mt-3 inline-flex items-center`}
          >
            Open the safety data sheet (PDF)
          </a>
        )}
      </section>

      <div className="flex flex-col gap-6">
        {needsAgitation && (
          <AgitationTimer minutes={material.agitateMin} state={agitation} onState={setAgitation} />
        )}
        <HubError error={startError} what="The batch did not start" />
        {(tooCoarse || needsLead) && ready && <LeadOverride busy={starting} onOverride={onStart} />}
        <div>
          <button
            type="button"
            disabled={!ready || starting}
            onClick={() => onStart()}
            className={primaryButton}
          >
            {starting ? 'Starting…' : 'Start weighing'}
          </button>
          {!ready && <p className="mt-2 text-lg text-muted">Stir first, or skip the timer.</p>}
        </div>
      </div>
    </div>
  );
}

function AgitationTimer({
  minutes,
  state,
  onState,
}: {
  minutes: number;
  state: Agitation;
  onState: (state: Agitation) => void;
}) {
  const [now, setNow] = useState(() => Date.now());
  const [confirmSkip, setConfirmSkip] = useState(false);
  const running = state.kind === 'running';
  useEffect(() => {
    if (!running) return;
    const timer = setInterval(() => setNow(Date.now()), 250);
    return () => clearInterval(timer);
  }, [running]);
  const leftS = running ? Math.max(0, (state.endsAt - now) / 1000) : minutes * 60;
  useEffect(() => {
    if (running && leftS <= 0) onState({ kind: 'done' });
  }, [running, leftS, onState]);

  return (
    <section aria-labelledby="stir-title" className="rounded-2xl bg-panel p-6 ring-1 ring-line">
      <h3 id="stir-title" className="text-2xl font-bold">
        Stir the settled filler back in: {minutes} min
      </h3>
      <p className="mt-1 text-lg text-muted">
        Stir the filled part from the bottom of its container until the colour is even.
      </p>
      <div className="mt-4 flex flex-wrap items-center gap-4">
        <p role="timer" aria-label="Stirring time left" className="text-6xl font-bold tabular-nums">
          {state.kind === 'done'
            ? 'Done'
            : state.kind === 'skipped'
              ? 'Skipped'
              : formatCountdown(leftS)}
        </p>
        {state.kind === 'waiting' && (
          <button
            type="button"
            onClick={() => {
              setNow(Date.now());
              onState({ kind: 'running', endsAt: Date.now() + minutes * 60_000 });
            }}
            className={secondaryButton}
          >
            Start the stirring timer
          </button>
        )}
        {(state.kind === 'waiting' || running) &&
          (confirmSkip ? (
            <>
              <button
                type="button"
                onClick={() => onState({ kind: 'skipped' })}
                className={dangerButton}
              >
                Yes, skip: it is stirred
              </button>
              <button
                type="button"
                onClick={() => setConfirmSkip(false)}
                className={secondaryButton}
              >
                Keep the timer
              </button>
            </>
          ) : (
            <button type="button" onClick={() => setConfirmSkip(true)} className={secondaryButton}>
              Skip stirring…
            </button>
          ))}
      </div>
    </section>
  );
}
