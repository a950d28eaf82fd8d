import { hasRole, useSession } from '../../../lib/auth';
import { useBatchAudit } from '../api/get-audit';
import { dateTimeText } from '../../../lib/dates';

/** What the audit trail holds about a batch: for leads and admins, who may read the trail. */
export function BatchAudit({ batchId }: { batchId: number }) {
  const session = useSession();
  const mayRead = hasRole(session, ['lead', 'admin']);
  const audit = useBatchAudit(batchId, mayRead);
  if (!mayRead) return null;
  return (
    <section aria-labelledby="audit-title" className="space-y-2">
      <h2 id="audit-title" className="text-xl font-semibold">
        Audit trail
      </h2>
      {audit.isError && <p role="alert">The audit trail cannot be read: {audit.error.message}</p>}
      {audit.data?.items.length === 0 && <p className="text-lg">No entries yet.</p>}
      {audit.data && audit.data.items.length > 0 && (
        <ol className="space-y-1 text-lg">
          {audit.data.items.map((e) => (
            <li key={e.id}>
              <time dateTime={e.at} className="mr-3 text-muted">
                {dateTimeText(e.at)}
              </time>
              {e.action} by {e.actor?.name ?? 'the hub'}
              <span className="ml-2 font-mono text-base text-muted" title={e.hash}>
                #{e.id} {e.hash.slice(0, 12)}
              </span>
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}
