import { Fragment } from 'react';
import { useSearchParams } from 'react-router-dom';
import { SelectField } from '../../../components/form/field';
import { dayText } from '../../../lib/dates';
import { deviationPctText } from '../../../lib/percent';
import { useAccuracy, type AccuracyBucket, type AccuracyGroup } from '../api/get-accuracy';
import { worstFirst, type WorstBy } from '../utils';
import { AccuracyChart } from './accuracy-chart';

const GROUPS: { value: AccuracyGroup; label: string }[] = [
  { value: 'material', label: 'material' },
  { value: 'bench', label: 'bench' },
  { value: 'operator', label: 'operator' },
];
const WORST: { value: WorstBy; label: string }[] = [
  { value: 'p95', label: 'widest 95 % of deviation' },
  { value: 'goShare', label: 'lowest GO share' },
];
const BUCKETS: { value: AccuracyBucket; label: string }[] = [
  { value: 'week', label: 'week' },
  { value: 'day', label: 'day' },
];

const pct = (v: number | null) => (v === null ? '\u2013' : deviationPctText(v));
const dayOf = (iso: string) => dayText(iso, { utc: true });

/** How close to the ratio each material, bench or operator came, worst first, by day or week. */
export function AccuracyPage() {
  const [params, setParams] = useSearchParams();
  const groupBy = GROUPS.find((g) => g.value === params.get('groupBy'))?.value ?? 'material';
  const bucket = BUCKETS.find((b) => b.value === params.get('bucket'))?.value ?? 'week';
  const worstBy = WORST.find((w) => w.value === params.get('worst'))?.value ?? 'p95';
  const accuracy = useAccuracy(groupBy, bucket);
  const set = (key: string, value: string) => {
    const next = new URLSearchParams(params);
    next.set(key, value);
    setParams(next, { replace: true });
  };
  const groups = worstFirst(accuracy.data?.rows ?? [], worstBy);
  return (
    <section aria-labelledby="accuracy-title" className="mx-auto max-w-6xl space-y-4">
      <h1 id="accuracy-title" className="text-3xl font-bold">
        Accuracy over time
      </h1>
      <div className="flex flex-wrap gap-4">
        <SelectField
          label="Per"
          options={GROUPS}
          value={groupBy}
          onPick={(v) => set('groupBy', v)}
        />
        <SelectField label="By" options={BUCKETS} value={bucket} onPick={(v) => set('bucket', v)} />
        <SelectField
          label="Worst first by"
          options={WORST}
          value={worstBy}
          onPick={(v) => set('worst', v)}
        />
      </div>
      {accuracy.isPending && <p className="text-muted">Loading…</p>}
      {accuracy.isError && <p role="alert">Accuracy cannot be shown: {accuracy.error.message}</p>}
      {accuracy.isSuccess && groups.length === 0 && (
        <p className="text-lg">No saved batches yet.</p>
      )}
      {groups.length > 0 && (
        <div aria-label="Charts" role="group" className="grid gap-4 md:grid-cols-2">
          {groups.map((g) => (
            <AccuracyChart key={g.groupId} name={g.rows[0]!.groupName} rows={g.rows} />
          ))}
        </div>
      )}
      {groups.length > 0 && (
        <table className="w-full text-left text-lg">
          <thead>
            <tr className="border-b border-line">
              <th scope="col">{bucket === 'week' ? 'Week of (UTC)' : 'Day (UTC)'}</th>
              <th scope="col">Batches</th>
              <th scope="col">GO</th>
              <th scope="col">Mean off ratio</th>
              <th scope="col">Spread (SD)</th>
              <th scope="col">95 % within</th>
              <th scope="col">Rescues</th>
            </tr>
          </thead>
          <tbody>
            {groups.map((g) => (
              <Fragment key={g.groupId}>
                <tr className="border-b border-line bg-panel">
                  <th scope="rowgroup" colSpan={7} className="pt-3 text-xl">
                    {g.rows[0]!.groupName}
                  </th>
                </tr>
                {g.rows.map((r) => (
                  <tr key={r.bucketStart} className="border-b border-line">
                    <td>{dayOf(r.bucketStart)}</td>
                    <td>{r.count}</td>
                    <td>{Math.round(r.goShare * 100)} %</td>
                    <td>{pct(r.meanDeviationPct)}</td>
                    <td>
                      {r.sdDeviationPct === null
                        ? '\u2013'
                        : `${r.sdDeviationPct.toFixed(2)}\u00a0%`}
                    </td>
                    <td>
                      {r.p95AbsDeviationPct === null
                        ? '\u2013'
                        : `±${r.p95AbsDeviationPct.toFixed(2)}\u00a0%`}
                    </td>
                    <td>{r.rescues}</td>
                  </tr>
                ))}
              </Fragment>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
