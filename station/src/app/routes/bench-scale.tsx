import { useParams } from 'react-router-dom';
import { useBenches } from '../../lib/benches';
import { LiveScale } from '../../features/scale/components/live-scale';
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
    </section>
  );
}
