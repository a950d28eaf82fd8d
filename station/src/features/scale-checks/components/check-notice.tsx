import { Link } from 'react-router-dom';
import { useCheckStatus } from '../api/scale-checks';

/**
 * What the bench says at sign-in when its scale wants a check (due, or the last one failed) or
 * its calibration date has come: in words, with the way to the check. Nothing otherwise: the
 * flow starts at the top of the screen ({@link CheckLink} is the way to a check then).
 */
export function CheckNotice({ benchId }: { benchId: string }) {
  const status = useCheckStatus(benchId).data;
  if (!status || (!status.message && !status.calibrationOverdue)) return null;
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

/** The way to a check when none is due: below the flow, a button-sized link for gloved hands. */
export function CheckLink({ benchId }: { benchId: string }) {
  const status = useCheckStatus(benchId).data;
  if (!status || status.message) return null;
  return (
    <Link
      to={`/bench/${encodeURIComponent(benchId)}/checks`}
      className="inline-flex min-h-14 items-center rounded-xl border-2 border-line px-4 text-lg font-semibold"
    >
      Check the scale with a reference weight
    </Link>
  );
}
