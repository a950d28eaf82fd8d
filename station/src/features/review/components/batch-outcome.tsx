import type { Batch } from '@tareline/protocol';

type Outcome = { word: string; className: string; mark: string };

/** What became of a batch, by colour, mark and word together (readable without colour). */
export function outcomeOf(batch: Pick<Batch, 'state' | 'verdict'>): Outcome {
  if (batch.state === 'saved') {
    return batch.verdict === 'GO'
      ? { word: 'GO', className: 'bg-go text-paper', mark: '\u2714' }
      : { word: 'NO-GO', className: 'bg-over text-paper', mark: '\u2716' };
  }
  if (batch.state === 'abandoned') {
    return { word: 'Abandoned', className: 'bg-line text-ink', mark: '\u2013' };
  }
  if (batch.state === 'interrupted') {
    return { word: 'Interrupted', className: 'bg-brass text-ink', mark: '!' };
  }
  return { word: 'Weighing', className: 'bg-under text-paper', mark: '\u2026' };
}

export function BatchOutcome({ batch }: { batch: Pick<Batch, 'state' | 'verdict'> }) {
  const outcome = outcomeOf(batch);
  return (
    <span
      className={`inline-flex items-center gap-1.5 rounded-md px-2.5 py-0.5 font-bold ${outcome.className}`}
    >
      <span aria-hidden="true">{outcome.mark}</span>
      {outcome.word}
    </span>
  );
}
