import { Link, useParams } from 'react-router-dom';
import { useBenches } from '../../lib/benches';
import { LiveScale } from '../../features/scale/components/live-scale';
import { CheckHistory } from '../../features/scale-checks/components/check-history';
import { SimulatorPanel } from '../../features/simulator/components/simulator-panel';

/** A bench's scale on its own: state and live weight, for setting up and checking a scale. */
export function BenchScaleRoute() {
  const { benchId = 'bench-1' } = useParams();
  const bench = useBenches().data?.find((b) => b.id === benchId);
  return (
    <section aria-labelledby="bench-scale-title" className="mx-auto max-w-5xl space-y-6">
      <h1 id="bench-scale-title" className="text-3xl font-bold">
        Live scale
      </h1>
      <LiveScale benchId={benchId} />
      {bench?.scale.transport === 'simulated' && <SimulatorPanel benchId={benchId} />}
      <Link
        to={`/bench/${encodeURIComponent(benchId)}/checks`}
        className="inline-flex min-h-14 items-center rounded-xl border-2 border-steel px-5 text-xl font-semibold"
      >
        Check this scale with a reference weight
      </Link>
      <CheckHistory benchId={benchId} />
    </section>
  );
}
