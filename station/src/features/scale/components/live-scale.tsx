import { useSession } from '../../../lib/auth';
import { useBenches } from '../../../lib/benches';
import { useLiveBench } from '../../../hooks/use-live-bench';
import { Gauge } from '../../../components/gauge/gauge';

const TRANSPORT_SHOWN = { serial: 'serial port', tcp: 'network adapter', simulated: 'simulator' };

/** One bench's scale: how it is reached, its live state and the gauge. */
export function LiveScale({ benchId }: { benchId: string }) {
  const session = useSession();
  const live = useLiveBench(benchId, { token: session?.token });
  const benches = useBenches();
  const bench = benches.data?.find((b) => b.id === benchId);

  if (live.refused) {
    return (
      <p role="alert" className="text-xl">
        The hub refused this screen: {live.refused}
      </p>
    );
  }
  return (
    <div className="space-y-6">
      <dl className="grid grid-cols-[max-content_1fr] gap-x-6 gap-y-1 text-lg">
        <dt className="text-muted">Bench</dt>
        <dd className="font-semibold">{bench?.name ?? benchId}</dd>
        <dt className="text-muted">Scale</dt>
        <dd>
          {bench
            ? `${TRANSPORT_SHOWN[bench.scale.transport]}, readability ${bench.scale.readabilityG} g` +
              (bench.scale.capacityG ? `, capacity ${bench.scale.capacityG} g` : '')
            : '…'}
        </dd>
        <dt className="text-muted">State</dt>
        <dd>
          {live.status.state}: {live.status.detail}
        </dd>
      </dl>
      <Gauge
        reading={live.reading}
        status={live.status}
        readabilityG={bench?.scale.readabilityG}
        label="Live weight"
      />
    </div>
  );
}
