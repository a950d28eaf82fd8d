import { useParams } from 'react-router-dom';
import { LiveScale } from '../../features/scale/components/live-scale';

/** A bench's scale on its own: state and live weight, for setting up and checking a scale. */
export function BenchScaleRoute() {
  const { benchId = 'bench-1' } = useParams();
  return (
    <section aria-labelledby="bench-scale-title" className="mx-auto max-w-5xl">
      <h1 id="bench-scale-title" className="mb-4 text-3xl font-bold">
        Live scale
      </h1>
      <LiveScale benchId={benchId} />
    </section>
  );
}
