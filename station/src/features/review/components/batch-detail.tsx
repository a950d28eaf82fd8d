import { Link, useParams } from 'react-router-dom';
import { useBatch } from '../api/get-batch';
import { useBenches } from '../../../lib/benches';
import { decimalsForReadability } from '../../../lib/grams';
import { deviationPctText } from '../../../lib/percent';
import { clockText, dateTimeText } from '../../../lib/dates';
import { BatchOutcome } from './batch-outcome';
import { BatchAudit } from './batch-audit';
import { DispositionPanel } from './disposition-panel';
import { PourTraceChart } from './pour-trace-chart';
import { ratioText } from '../../../lib/ratio';

/** Names of the steps the hub records, in words for the review page. */
const STEP_SHOWN: Record<string, string> = {
  created: 'Started',
  taredA: 'Tared for part A',
  confirmedA: 'Part A done',
  taredB: 'Tared for part B',
  confirmedB: 'Part B done',
  taredC: 'Tared for part C',
  confirmedC: 'Part C done',
  taredATopUp: 'Tared for the part A top-up',
  topUpA: 'Part A topped up',
  taredBTopUp: 'Tared for the part B top-up',
  topUpB: 'Part B topped up',
  rescueTaken: 'Rescue taken',
  interrupted: 'Interrupted',
  resumed: 'Resumed',
  saved: 'Saved',
  abandoned: 'Abandoned',
};

/** One batch as a lead reviews it (and as the QR code on its cup label opens it). */
export function BatchDetail() {
  const { batchId } = useParams();
  const id = Number(batchId);
  const batch = useBatch(id);
  const benches = useBenches();

  if (!Number.isInteger(id) || id <= 0) {
    return <p role="alert">“{batchId}” is not a batch number.</p>;
  }
  if (batch.isPending) return <p className="text-lg text-muted">Loading batch {id}…</p>;
  if (batch.isError) {
    return (
      <p role="alert" className="text-lg">
        Batch {id} cannot be shown: {batch.error.message}
      </p>
    );
  }
  const b = batch.data;
  const decimals = decimalsForReadability(b.readabilityG);
  // By time; steps of the same millisecond (part B done and saved) in the order they happen.
  // The hub's JSON column does not keep key order, so the order comes from STEP_SHOWN.
  // A repeated step is kept by the hub as `name.2`, `name.3`…
  const baseOf = (step: string) => step.replace(/\.\d+$/, '');
  const rank = (step: string) => {
    const i = Object.keys(STEP_SHOWN).indexOf(baseOf(step));
    return i === -1 ? Object.keys(STEP_SHOWN).length : i;
  };
  const steps = Object.entries(b.steps).sort(
    ([s1, a], [s2, z]) => a.localeCompare(z) || rank(s1) - rank(s2),
  );
  return (
    <article aria-labelledby="batch-title" className="mx-auto max-w-5xl space-y-6">
      <p>
        <Link to="/review/batches" className="underline">
          All batches
        </Link>
      </p>
      <header className="flex flex-wrap items-center gap-4">
        <h1 id="batch-title" className="text-3xl font-bold">
          Batch {b.id}
        </h1>
        <BatchOutcome batch={b} />
      </header>
      <dl className="grid grid-cols-[max-content_1fr] gap-x-6 gap-y-1 text-lg">
        <dt className="text-muted">Material</dt>
        <dd>{b.materialName}</dd>
        {b.planId && (
          <>
            <dt className="text-muted">Pour plan</dt>
            <dd>
              <Link className="underline" to={`/plans/${b.planId}`}>
                The plan it was poured from
              </Link>
            </dd>
          </>
        )}
        <dt className="text-muted">Material cost</dt>
        <dd>
          {b.cost
            ? `${b.cost.total.toFixed(2)} (${b.cost.parts.map((c, i) => `part ${'ABC'[i]} ${c.toFixed(2)}`).join(', ')}), as weighed`
            : 'no price recorded for this material'}
        </dd>
        <dt className="text-muted">Operator</dt>
        <dd>{b.operator.name}</dd>
        {b.handledBy && (
          <>
            <dt className="text-muted">Also handled by</dt>
            <dd>
              {b.handledBy.map((h) => `${h.name} (${h.role}, from ${clockText(h.at)})`).join('; ')}
            </dd>
          </>
        )}
        <dt className="text-muted">Bench</dt>
        <dd>{benches.data?.find((bench) => bench.id === b.benchId)?.name ?? b.benchId}</dd>
        <dt className="text-muted">Mix ratio by weight</dt>
        <dd>{ratioText(b.weightRatio)}</dd>
        <dt className="text-muted">Off ratio</dt>
        <dd>
          {b.ratioDeviationPct === null ? '\u2013' : deviationPctText(b.ratioDeviationPct)}{' '}
          (tolerance ±{b.tolerancePct} %)
        </dd>
        <dt className="text-muted">Scale readability</dt>
        <dd>{b.readabilityG} g</dd>
        <dt className="text-muted">Saved</dt>
        <dd>{dateTimeText(b.savedAt)}</dd>
        {b.abandonReason && (
          <>
            <dt className="text-muted">Why abandoned</dt>
            <dd>{b.abandonReason}</dd>
          </>
        )}
        {b.interruptedReason && (
          <>
            <dt className="text-muted">Why interrupted</dt>
            <dd>{b.interruptedReason}</dd>
          </>
        )}
        {b.noGoReason && (
          <>
            <dt className="text-muted">Why NO-GO whatever the scale showed</dt>
            <dd>{b.noGoReason}</dd>
          </>
        )}
      </dl>

      <table className="w-full text-left text-lg">
        <caption className="text-left text-xl font-semibold">Parts by weight</caption>
        <thead>
          <tr className="border-b border-line">
            <th scope="col">Part</th>
            <th scope="col">Target</th>
            <th scope="col">Weighed</th>
            <th scope="col">Lot</th>
          </tr>
        </thead>
        <tbody>
          {b.parts.map((part, i) => {
            const lot = b.lots.find((l) => l.part === i);
            return (
              <tr key={part.label} className="border-b border-line">
                <th scope="row">{part.label}</th>
                <td>{part.targetG.toFixed(decimals)} g</td>
                <td>
                  {part.actualG === null ? 'not poured' : `${part.actualG.toFixed(decimals)} g`}
                </td>
                <td>
                  {lot ? lot.code : '\u2013'}
                  {lot?.warnings.map((w) => (
                    <span key={w.code} className="ml-2 rounded bg-brass px-1.5 text-base text-ink">
                      {w.message}
                    </span>
                  ))}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>

      <DispositionPanel batch={b} />

      <section aria-labelledby="trace-title">
        <h2 id="trace-title" className="mb-2 text-xl font-semibold">
          Pour trace
        </h2>
        <PourTraceChart batch={b} />
      </section>

      <section aria-labelledby="steps-title">
        <h2 id="steps-title" className="mb-2 text-xl font-semibold">
          Steps
        </h2>
        <ol className="space-y-1 text-lg">
          {steps.map(([step, at]) => (
            <li key={step}>
              <time dateTime={at} className="mr-3 text-muted">
                {clockText(at)}
              </time>
              {STEP_SHOWN[baseOf(step)] ?? step}
              {/\.\d+$/.test(step) && ' again'}
            </li>
          ))}
        </ol>
      </section>

      <BatchAudit batchId={b.id} />
    </article>
  );
}
