import type { BenchSummary, PourVerdict, ScaleState } from '@tareline/protocol';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { useLiveBench } from '../../../hooks/use-live-bench';
import { useSession } from '../../../lib/auth';
import { benchesQueryKey, getBenches } from '../../../lib/benches';
import { gramsText } from '../../../lib/grams';
import { useBenchBatch } from '../api/get-bench-batch';
import { BatchOutcome } from './batch-outcome';
import { STATE_SHOWN } from './batch-filters';

/** A bench set up at the desk shows here within this long, without a reload. */
const BENCH_LIST_REFRESH_MS = 30_000;

const SCALE_SHOWN: Record<ScaleState, { word: string; className: string }> = {
  online: { word: 'Scale online', className: 'bg-go text-paper' },
  stale: { word: 'Scale silent', className: 'bg-brass text-ink' },
  offline: { word: 'Scale offline', className: 'bg-over text-paper' },
  error: { word: 'Scale error', className: 'bg-over text-paper' },
  connecting: { word: 'Connecting', className: 'bg-line text-ink' },
};

const VERDICT_SHOWN: Record<PourVerdict, string> = {
  UNDER: 'under',
  SETTLING: 'settling',
  GO: 'GO',
  OVER: 'over',
};

/** Every bench on one screen, live: the scale, who is weighing, the batch and its verdict. */
export function BenchesOverview() {
  const benches = useQuery({
    queryKey: benchesQueryKey,
    queryFn: getBenches,
    refetchInterval: BENCH_LIST_REFRESH_MS,
  });
  return (
    <section aria-labelledby="benches-title" className="mx-auto max-w-6xl space-y-4">
      <h1 id="benches-title" className="text-3xl font-bold">
        Benches
      </h1>
      {benches.isPending && <p className="text-muted">Loading benches…</p>}
      {benches.isError && <p role="alert">Benches cannot be listed: {benches.error.message}</p>}
      {benches.data?.length === 0 && <p className="text-lg">No bench is set up yet.</p>}
      <ul className="grid gap-4 md:grid-cols-2 xl:grid-cols-3">
        {benches.data?.map((bench) => (
          <BenchCard key={bench.id} bench={bench} />
        ))}
      </ul>
    </section>
  );
}

function BenchCard({ bench }: { bench: BenchSummary }) {
  const token = useSession()?.token;
  const live = useLiveBench(bench.id, token ? { token } : {});
  const initial = useBenchBatch(bench.id);
  // The live event wins once one came; before that, what the hub had when the page opened.
  const batch = live.batchEvent ? live.batchEvent.batch : (initial.data ?? null);
  const inProgress = batch && batch.state !== 'saved' && batch.state !== 'abandoned';
  const scale = SCALE_SHOWN[live.status.state];
  const pour = live.pour && batch && live.pour.batchId === batch.id ? live.pour : undefined;
  return (
    <li aria-label={bench.name} className="space-y-2 rounded-xl border border-line bg-panel p-4">
      <div className="flex items-center justify-between gap-2">
        <h2 className="text-xl font-semibold">{bench.name}</h2>
        <span
          title={live.status.detail}
          className={`rounded-md px-2 py-0.5 font-semibold ${scale.className}`}
        >
          {scale.word}
        </span>
      </div>
      {live.refused && <p role="alert">{live.refused}</p>}
      {live.presence && (
        <p className="text-lg">
          {live.presence.people.length === 0 ? (
            <span className="text-muted">Nobody signed in at the bench</span>
          ) : (
            <>
              Signed in:{' '}
              <span className="font-semibold">
                {live.presence.people.map((p) => p.name).join(', ')}
              </span>
            </>
          )}
        </p>
      )}
      {!batch && <p className="text-muted">No batch yet.</p>}
      {batch && (
        <div className="space-y-1 text-lg">
          <p>
            <Link to={`/review/batches/${batch.id}`} className="font-semibold underline">
              Batch {batch.id}
            </Link>{' '}
            {batch.materialName}
          </p>
          <p>
            {inProgress ? 'Weighing: ' : 'Last: '}
            <span className="font-semibold">{batch.operator.name}</span>
          </p>
          <p className="flex flex-wrap items-center gap-2">
            <BatchOutcome batch={batch} />
            {inProgress && <span className="text-muted">{STATE_SHOWN[batch.state]}</span>}
            {inProgress && pour?.verdict && (
              <span>
                {gramsText(pour.netG, batch.readabilityG)}: {VERDICT_SHOWN[pour.verdict]}
              </span>
            )}
          </p>
        </div>
      )}
    </li>
  );
}
