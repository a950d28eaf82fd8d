import type { ReactNode } from 'react';
import { Outlet } from 'react-router-dom';
import { useSession } from '../../../lib/auth';
import { useSignOut } from '../../../lib/sign-out';
import { useBenchId } from '../hooks/use-bench-id';
import { useIdleCountdown } from '../hooks/use-idle-countdown';
import { BenchSignIn } from './bench-sign-in';

/**
 * The bench: sign-in while nobody is signed in at this bench, otherwise a bar naming who is
 * signed in, "Switch person", the idle countdown, and the bench's own pages below.
 */
export function BenchScreen({
  whileSignedOut,
}: {
  /** What the bench shows under its sign-in, whoever comes next (nothing about a person). */
  whileSignedOut?: (benchId: string) => ReactNode;
} = {}) {
  const session = useSession();
  const benchId = useBenchId();
  if (!session || session.bench?.id !== benchId) {
    return (
      <>
        <BenchSignIn benchId={benchId} />
        {whileSignedOut?.(benchId)}
      </>
    );
  }
  return <SignedInBench key={session.token} />;
}

function SignedInBench() {
  const session = useSession()!;
  const signOut = useSignOut();
  const idleMin = session.bench?.idleSignOutMin ?? 5;
  const secondsLeft = useIdleCountdown(idleMin, () => void signOut());
  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-center justify-between gap-4 rounded-xl bg-panel px-5 py-3 shadow-sm">
        <p className="text-2xl">
          Signed in: <strong>{session.user.name}</strong>{' '}
          <span className="text-lg text-muted">
            ({session.user.role}, {session.bench?.name})
          </span>
        </p>
        <button
          type="button"
          onClick={() => void signOut()}
          className="min-h-14 rounded-xl bg-steel px-6 text-xl font-semibold text-paper"
        >
          Switch person
        </button>
      </div>
      {secondsLeft !== null && (
        <p role="alert" className="rounded-xl bg-brass px-5 py-4 text-2xl font-bold text-ink">
          Signing out in {secondsLeft} s: touch the screen to stay signed in
        </p>
      )}
      <Outlet />
    </div>
  );
}
