import { BenchScreen } from '../../features/auth/components/bench-screen';
import { BenchFlow } from '../../features/batch/components/bench-flow';
import { useSession } from '../../lib/auth';

/** The bench screen: sign-in while nobody is signed in here, else the bench's pages. */
export function BenchRoute() {
  return <BenchScreen />;
}

/** What a signed-in operator sees first: the guided flow for the bench they signed in at. */
export function BenchHomeRoute() {
  const benchId = useSession()?.bench?.id;
  return (
    <section aria-labelledby="bench-title" className="w-full">
      <h1 id="bench-title" className="sr-only">
        Bench
      </h1>
      {benchId ? (
        <BenchFlow key={benchId} benchId={benchId} />
      ) : (
        <p className="text-xl">Sign in at a bench to weigh a batch.</p>
      )}
    </section>
  );
}
