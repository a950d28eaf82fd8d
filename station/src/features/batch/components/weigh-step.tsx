import type { Batch, PourEvent, Rescue } from '@tareline/protocol';
import { lazy, Suspense, useState, type ReactNode } from 'react';
import { Gauge } from '../../../components/gauge/gauge';
import type { LiveBench } from '../../../hooks/use-live-bench';
import { formatGrams } from '../../../lib/grams';
import { useBatchIntent, type BatchIntent } from '../api/batch-intents';
import { partLetter, partName } from '../../../lib/parts';
import { dangerButton, primaryButton, secondaryButton } from './buttons';
import { HubError } from './hub-error';

// The dialog (and the dialog library under it) loads the first time someone abandons a batch,
// not with the bench screen.
const AbandonDialog = lazy(() =>
  import('./abandon-dialog').then((m) => ({ default: m.AbandonDialog })),
);

/**
 * Step 5: weighing each part on the live gauge against the hub's active pour. The hub tares,
 * judges and saves; this screen draws what it sent and passes on the operator's presses.
 */
export function WeighStep({
  batch,
  live,
  onAnswer,
}: {
  batch: Batch;
  live: LiveBench;
  onAnswer: (batch: Batch) => void;
}) {
  const intent = useBatchIntent({ onSuccess: onAnswer });
  const [abandoning, setAbandoning] = useState(false);
  // Once opened it stays mounted, so a reason typed and closed is still there when reopened.
  const [dialogLoaded, setDialogLoaded] = useState(false);
  const send = (what: BatchIntent) => intent.mutate({ batchId: batch.id, intent: what });
  const online = live.status.state === 'online';
  const abandonButton = (
    <button
      type="button"
      onClick={() => {
        setDialogLoaded(true);
        setAbandoning(true);
      }}
      className={secondaryButton}
    >
      Abandon batch…
    </button>
  );

  return (
    <div className="flex flex-col gap-5">
      <LotWarnings batch={batch} />
      <HubError error={intent.error} what="The hub said no" />
      {batch.state === 'interrupted' ? (
        <Interrupted
          batch={batch}
          online={online}
          scaleDetail={live.status.detail}
          busy={intent.isPending}
          onResume={() => send('resume')}
          abandonButton={abandonButton}
        />
      ) : (
        <ActivePour
          batch={batch}
          live={live}
          busy={intent.isPending}
          send={send}
          abandonButton={abandonButton}
        />
      )}
      {dialogLoaded && (
        <Suspense fallback={null}>
          <AbandonDialog
            open={abandoning}
            batchId={batch.id}
            onClose={() => setAbandoning(false)}
            onAbandoned={(b) => {
              setAbandoning(false);
              onAnswer(b);
            }}
          />
        </Suspense>
      )}
    </div>
  );
}

function ActivePour({
  batch,
  live,
  busy,
  send,
  abandonButton,
}: {
  batch: Batch;
  live: LiveBench;
  busy: boolean;
  send: (intent: BatchIntent) => void;
  abandonButton: ReactNode;
}) {
  const active = batch.active;
  if (!active) return <p className="text-xl">Waiting for the hub…</p>;
  const online = live.status.state === 'online';
  const part = batch.parts[active.part];
  const name = partName(active.part, part?.label);
  const letter = partLetter(active.part);
  // Only the hub's judgement of this very pour counts; an older one (another part) is dropped.
  const pour: PourEvent | undefined =
    live.pour && live.pour.batchId === batch.id && live.pour.part === active.part
      ? live.pour
      : undefined;
  const judged = active.band !== null;
  // Part A's own pour has a band and a verdict as advice; the operator says when it is done.
  const operatorConfirms = !judged || (active.part === 0 && active.kind === 'first');
  const moving = !live.reading?.stable;
  const verdict = online && active.tared ? (pour?.verdict ?? null) : null;
  const lastToPour = batch.parts.every((p, i) => i === active.part || p.actualG !== null);
  const title = active.kind === 'top-up' ? `Top up ${name}` : `Weigh ${name}`;

  let actions;
  if (!active.tared) {
    actions = (
      <>
        <p className="text-[2rem] leading-tight">
          {active.part === 0 && active.kind === 'first'
            ? 'Put the lined cup on the scale, then tare.'
            : 'Tare the scale with the cup as it is.'}
        </p>
        <button
          type="button"
          disabled={busy}
          onClick={() => send('tare')}
          className={primaryButton}
        >
          Tare
        </button>
      </>
    );
  } else if (operatorConfirms) {
    actions = (
      <>
        <p role="status" className="text-[2rem] leading-tight">
          {moving
            ? 'The reading is moving: wait until it is steady.'
            : 'Press done once the reading is steady.'}
        </p>
        <button
          type="button"
          disabled={busy || !online || moving}
          onClick={() => send('next')}
          className={primaryButton}
        >
          Part {letter} done
        </button>
      </>
    );
  } else if (pour?.saveProblem) {
    // The hub could not write the batch: it is not saved, and the cup must stay as it is.
    actions = (
      <p role="alert" className="rounded-xl bg-brass px-4 py-3 text-2xl font-bold text-ink">
        Not saved yet: {pour.saveProblem}. Leave the cup on the scale.
      </p>
    );
  } else if (verdict === 'GO' && pour?.saveInMs != null) {
    actions = (
      <p role="status" className="text-4xl font-bold">
        Steady in the band: {lastToPour ? 'saving' : `part ${letter} done`} in{' '}
        {(pour.saveInMs / 1000).toFixed(1)} s
      </p>
    );
  } else if (verdict === 'OVER' && pour?.rescue) {
    actions = <RescueOffer batch={batch} rescue={pour.rescue} busy={busy} send={send} />;
  } else {
    actions = (
      <p className="text-[2rem] leading-tight">
        Pour into the band and hold still: the batch {lastToPour ? 'saves' : 'moves on'} by itself.
      </p>
    );
  }

  return (
    <Gauge
      reading={live.reading}
      status={live.status}
      label={`${title}: ${formatGrams(active.targetG, 2)} g`}
      targetG={active.targetG}
      band={active.band ?? undefined}
      slowDownFromG={active.slowDownFromG}
      verdict={judged ? verdict : undefined}
      readabilityG={batch.readabilityG}
      actions={
        <>
          {batch.noGoReason && (
            // After a hub restart the cup could not be read back: whatever the gauge shows, the
            // record will say NO-GO and a lead decides.
            <p role="alert" className="rounded-xl bg-brass px-4 py-3 text-2xl font-bold text-ink">
              This batch will be saved NO-GO: {batch.noGoReason}. A lead decides what happens to it.
            </p>
          )}
          {actions}
          {abandonButton}
        </>
      }
    />
  );
}

function RescueOffer({
  batch,
  rescue,
  busy,
  send,
}: {
  batch: Batch;
  rescue: Rescue;
  busy: boolean;
  send: (intent: BatchIntent) => void;
}) {
  const additions = rescue.addG.map((g, part) => ({ g, part })).filter(({ g }) => g > 0);
  const only = additions.length === 1 ? additions[0] : undefined;
  const [confirmingNoGo, setConfirmingNoGo] = useState(false);
  return (
    <section aria-labelledby="rescue-title" className="flex flex-wrap items-center gap-4">
      <div className="text-xl">
        <h4 id="rescue-title" className="text-[2rem] leading-tight font-bold">
          {rescue.fits === false
            ? 'Over the band: the rescue does not fit on the scale'
            : 'Over the band: the ratio can be restored'}
        </h4>
        <ul className="text-2xl">
          {additions.map(({ g, part }) => (
            <li key={part}>
              Add <strong>{formatGrams(g, 2)} g</strong> of{' '}
              {partName(part, batch.parts[part]?.label)}
            </li>
          ))}
        </ul>
        <p>
          {rescue.fits === true
            ? `It fits on the scale (${formatGrams(rescue.totalAfterG, 1)} g in the cup after).`
            : rescue.fits === false
              ? 'It does not fit on the scale: save the batch as NO-GO.'
              : `The scale's capacity is unknown: check the cup can take ${formatGrams(rescue.totalAfterG, 1)} g.`}
        </p>
      </div>
      <button
        type="button"
        disabled={busy || rescue.fits === false}
        onClick={() => send('rescue')}
        className={primaryButton}
      >
        {only ? `Add part ${partLetter(only.part)}` : 'Add the parts'}
      </button>
      {confirmingNoGo ? (
        // A NO-GO cup is kept apart for a lead: one press by mistake should not decide that.
        <div role="group" aria-label="Confirm NO-GO" className="flex items-center gap-4">
          <p className="text-[2rem] leading-tight font-bold">Save this batch as NO-GO?</p>
          <button
            type="button"
            disabled={busy}
            onClick={() => send('save-no-go')}
            className={dangerButton}
          >
            Yes, save as NO-GO
          </button>
          <button
            type="button"
            onClick={() => setConfirmingNoGo(false)}
            className={secondaryButton}
          >
            No, go back
          </button>
        </div>
      ) : (
        <button
          type="button"
          disabled={busy}
          onClick={() => setConfirmingNoGo(true)}
          className={dangerButton}
        >
          Save as NO-GO…
        </button>
      )}
    </section>
  );
}

function Interrupted({
  batch,
  online,
  scaleDetail,
  busy,
  onResume,
  abandonButton,
}: {
  batch: Batch;
  online: boolean;
  scaleDetail: string;
  busy: boolean;
  onResume: () => void;
  abandonButton: ReactNode;
}) {
  return (
    <section
      aria-labelledby="interrupted-title"
      className="rounded-2xl border-l-8 border-brass bg-panel p-6"
    >
      <h3 id="interrupted-title" className="text-3xl font-bold">
        Batch {batch.id} was interrupted
      </h3>
      <p className="mt-2 text-2xl">
        {batch.interruptedReason ?? 'The hub lost the scale mid-pour.'}
      </p>
      <p className="mt-2 text-xl">
        Nothing weighed so far is lost. Leave the cup where it is; when the scale is back, resume
        and the hub carries on from what it recorded. Or abandon the batch with a reason.
      </p>
      <div className="mt-4 flex flex-wrap items-center gap-4">
        <button
          type="button"
          disabled={busy || !online}
          onClick={onResume}
          className={primaryButton}
        >
          Resume
        </button>
        {!online && (
          <p role="status" className="text-xl text-muted">
            Resume needs the scale online. Scale now: {scaleDetail}
          </p>
        )}
        <div className="ml-auto">{abandonButton}</div>
      </div>
    </section>
  );
}

function LotWarnings({ batch }: { batch: Batch }) {
  const warnings = batch.lots.flatMap((l) => l.warnings);
  if (warnings.length === 0) return null;
  return (
    <ul aria-label="Lot warnings" className="flex flex-col gap-2">
      {warnings.map((w) => (
        <li
          key={w.message}
          className="rounded-lg bg-brass px-4 py-2 text-xl font-semibold text-ink"
        >
          <span aria-hidden="true">⚠ </span>
          {w.message}
        </li>
      ))}
    </ul>
  );
}
