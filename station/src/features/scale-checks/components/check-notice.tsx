import { Link } from 'react-router-dom';
import { useCheckStatus } from '../api/scale-checks';

/**
 * What the bench says at sign-in when its scale wants a check (due, or the last one failed) or
 * its calibration date has come: in words, with the way to the check. Otherwise only the way.
 */
export function CheckNotice({ benchId }: { benchId: string }) {
  const status = useCheckStatus(benchId).data;
  if (!status) return null;
  if (!status.message && !status.calibrationOverdue) {
    return (
      <Link to={`/bench/${encodeURIComponent(benchId)}/checks`} className="text-lg underline">
        Check the scale with a reference weight
      </Link>
    );
  }
  return (
    <div
      role="status"
      className={`rounded-xl border-2 p-4 text-xl ${status.blocked ? 'border-over' : 'border-steel'}`}
    >
      {status.message && <p className="font-semibold">{status.message}.</p>}
      {status.calibrationOverdue && (
        <p>The scale&apos;s calibration was due on {status.calibrationDueOn}: tell a lead.</p>
      )}
      {status.message && (
        <Link
          to={`/bench/${encodeURIComponent(benchId)}/checks`}
          className="mt-3 inline-flex min-h-14 items-center rounded-xl border-2 border-steel px-4 font-semibold"
        >
          Check the scale now
        </Link>
      )}
    </div>
  );
}
