import { batchStateSchema, type BatchState } from '@tareline/protocol';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { useBatches } from '../api/get-batches';
import { deviationPctText } from '../../../lib/percent';
import { shownTime } from '../utils';
import { BatchOutcome } from './batch-outcome';

const STATE_SHOWN: Record<BatchState, string> = {
  'weighing-a': 'weighing part A',
  'weighing-b': 'weighing part B',
  'weighing-c': 'weighing part C',
  saved: 'saved',
  abandoned: 'abandoned',
  interrupted: 'interrupted',
};

/** Every batch, newest first, for leads: what was mixed, by whom, and how close to the ratio. */
export function BatchesPage() {
  const [state, setState] = useState<BatchState | ''>('');
  const batches = useBatches({ state: state || undefined, limit: 200 });
  return (
    <section aria-labelledby="batches-title" className="mx-auto max-w-6xl space-y-4">
      <h1 id="batches-title" className="text-3xl font-bold">
        Batches
      </h1>
      <label className="flex items-center gap-3 text-lg">
        Show
        <select
          value={state}
          onChange={(e) => {
            const parsed = batchStateSchema.safeParse(e.target.value);
            setState(parsed.success ? parsed.data : '');
          }}
          className="min-h-12 rounded-lg border border-line bg-panel px-3"
        >
          <option value="">all batches</option>
          {batchStateSchema.options.map((s) => (
            <option key={s} value={s}>
              {STATE_SHOWN[s]}
            </option>
          ))}
        </select>
      </label>
      {batches.isPending && <p className="text-muted">Loading batches…</p>}
      {batches.isError && <p role="alert">Batches cannot be listed: {batches.error.message}</p>}
      {batches.data?.length === 0 && <p className="text-lg">No batches yet.</p>}
      {batches.data && batches.data.length > 0 && (
        <table className="w-full text-left text-lg">
          <thead>
            <tr className="border-b border-line">
              <th scope="col">No.</th>
              <th scope="col">Started</th>
              <th scope="col">Material</th>
              <th scope="col">Operator</th>
              <th scope="col">Bench</th>
              <th scope="col">Total</th>
              <th scope="col">Off ratio</th>
              <th scope="col">Outcome</th>
            </tr>
          </thead>
          <tbody>
            {batches.data.map((b) => (
              <tr key={b.id} className="border-b border-line">
                <td>
                  <Link to={`/review/batches/${b.id}`} className="font-semibold underline">
                    {b.id}
                  </Link>
                </td>
                <td>{shownTime(b.createdAt)}</td>
                <td>{b.materialName}</td>
                <td>{b.operator.name}</td>
                <td>{b.benchId}</td>
                <td>{b.totalMassG} g</td>
                <td>
                  {b.ratioDeviationPct === null ? '\u2013' : deviationPctText(b.ratioDeviationPct)}
                </td>
                <td>
                  <BatchOutcome batch={b} />
                  {!['saved', 'abandoned'].includes(b.state) && (
                    <span className="ml-2 text-muted">{STATE_SHOWN[b.state]}</span>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
