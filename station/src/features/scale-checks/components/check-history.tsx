import { useCheckHistory, useCheckStatus } from '../api/scale-checks';
import { gramsText } from '../../../lib/grams';
import { KIND_WORDS, outcomeText, STATE_WORDS } from './check-words';

const when = (iso: string) =>
  new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' });

/** The bench's calibration due date and its record of scale checks: who, when, what, result. */
export function CheckHistory({ benchId }: { benchId: string }) {
  const status = useCheckStatus(benchId);
  const history = useCheckHistory(benchId);
  const s = status.data;
  return (
    <section aria-labelledby={`check-history-${benchId}`} className="space-y-3">
      <h2 id={`check-history-${benchId}`} className="text-2xl font-semibold">
        Check record
      </h2>
      {s && (
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-lg">
          <dt className="text-muted">Calibration due</dt>
          <dd className={s.calibrationOverdue ? 'font-semibold text-over' : undefined}>
            {s.calibrationDueOn ?? 'not entered'}
            {s.calibrationOverdue ? ' — overdue' : ''}
          </dd>
          <dt className="text-muted">Routine checks</dt>
          <dd>
            {s.checkEveryHours === null ? 'no schedule' : `every ${s.checkEveryHours} h`}
            {s.blockWhenDue ? '; batches wait while one is due' : ''}
          </dd>
          <dt className="text-muted">Repeatability s</dt>
          <dd>
            {s.repeatabilitySdG === null
              ? 'not measured'
              : `${gramsText(s.repeatabilitySdG, 0.0001)}${s.repeatabilityAt ? `, ${when(s.repeatabilityAt)}` : ''}`}
          </dd>
        </dl>
      )}
      {history.isError && (
        <p role="alert" className="text-over">
          {history.error.message}
        </p>
      )}
      {history.data && history.data.length === 0 && (
        <p className="text-lg text-muted">No scale check has been run at this bench.</p>
      )}
      {history.data && history.data.length > 0 && (
        <table className="w-full text-left text-lg">
          <thead className="text-muted">
            <tr>
              <th className="py-1 pr-3 font-semibold">When</th>
              <th className="py-1 pr-3 font-semibold">Who</th>
              <th className="py-1 pr-3 font-semibold">Check</th>
              <th className="py-1 pr-3 font-semibold">Reference</th>
              <th className="py-1 pr-3 font-semibold">Result</th>
              <th className="py-1 font-semibold">Found</th>
            </tr>
          </thead>
          <tbody>
            {history.data.map((c) => (
              <tr key={c.id} className="border-t border-line">
                <td className="py-1 pr-3">{when(c.startedAt)}</td>
                <td className="py-1 pr-3">{c.by.name}</td>
                <td className="py-1 pr-3">{KIND_WORDS[c.kind]}</td>
                <td className="py-1 pr-3 tabular-nums">
                  {gramsText(c.referenceG, c.readabilityG)}
                </td>
                <td
                  className={`py-1 pr-3 font-semibold ${c.state === 'failed' ? 'text-over' : ''}`}
                >
                  {STATE_WORDS[c.state]}
                </td>
                <td className="py-1">{outcomeText(c)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
