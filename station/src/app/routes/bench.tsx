import { BenchScreen } from '../../features/auth/components/bench-screen';
import { Suspense, type ComponentProps } from 'react';
import { BenchFlow } from '../../features/batch/components/bench-flow';
import { PotLifeReminder } from '../../features/batch/components/pot-life-reminder';
import { useBenches } from '../../lib/benches';
import { useSession } from '../../lib/auth';
import { CheckLink, CheckNotice, SimulatorPanel, VolumeEstimator } from '../lazy-pages';

/** The planner's volume estimator inside the bench flow's amount step, loaded when opened. */
function BenchEstimator(props: ComponentProps<typeof VolumeEstimator>) {
  return (
    <Suspense fallback={<p className="text-xl text-muted">Loading the volume estimator…</p>}>
      <VolumeEstimator {...props} />
    </Suspense>
  );
}

/** The bench screen: sign-in while nobody is signed in here, else the bench's pages. */
export function BenchRoute() {
  return <BenchScreen whileSignedOut={(benchId) => <PotLifeReminder benchId={benchId} />} />;
}

/** What a signed-in operator sees first: the guided flow for the bench they signed in at. */
export function BenchHomeRoute() {
  const benchId = useSession()?.bench?.id;
  const bench = useBenches().data?.find((b) => b.id === benchId);
  return (
    <section aria-labelledby="bench-title" className="w-full space-y-6">
      <h1 id="bench-title" className="sr-only">
        Bench
      </h1>
      {benchId && (
        // Says so at sign-in when a scale check is due or the last one failed.
        <Suspense fallback={null}>
          <CheckNotice benchId={benchId} />
        </Suspense>
      )}
      {benchId ? (
        <BenchFlow key={benchId} benchId={benchId} estimator={BenchEstimator} />
      ) : (
        <p className="text-xl">Sign in at a bench to weigh a batch.</p>
      )}
      {benchId && (
        <Suspense fallback={null}>
          <CheckLink benchId={benchId} />
        </Suspense>
      )}
      {benchId && bench?.scale.transport === 'simulated' && (
        // Below the flow and folded: a demo and training aid, not part of a real pour.
        <details className="rounded-xl bg-panel p-4">
          <summary className="flex min-h-14 cursor-pointer items-center text-xl font-semibold">
            No balance here: drive the simulated scale
          </summary>
          <div className="mt-3">
            <Suspense fallback={<p className="text-xl text-muted">Loading the simulator…</p>}>
              <SimulatorPanel benchId={benchId} />
            </Suspense>
          </div>
        </details>
      )}
    </section>
  );
}
