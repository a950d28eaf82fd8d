import type { BatchSort, BatchSummary } from '@tareline/protocol';
import { useMemo, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { gramsText } from '../../../lib/grams';
import { deviationPctText } from '../../../lib/percent';
import { downloadBatchesCsv } from '../api/export-batches';
import { FILTER_KEYS, useBatchPages, type BatchFilter } from '../api/get-batches';
import { DECISION_SHOWN, shownTime, weighedTotalG } from '../utils';
import { BatchFilters, STATE_SHOWN } from './batch-filters';
import { BatchOutcome } from './batch-outcome';

/** A column a click sorts: each click turns the order round. */
function SortHeader({
  label,
  sort,
  first,
  then,
  onSort,
}: {
  label: string;
  sort: BatchSort;
  /** The order of the first click; `then` is the one after it. */
  first: BatchSort;
  then: BatchSort;
  onSort: (sort: BatchSort) => void;
}) {
  const active = sort === first || sort === then;
  const ascending = sort === 'createdAt' || sort === 'absDeviation' || sort === 'ratioDeviationPct';
  return (
    <th scope="col" aria-sort={active ? (ascending ? 'ascending' : 'descending') : 'none'}>
      <button
        type="button"
        className="font-semibold underline decoration-dotted"
        onClick={() => onSort(sort === first ? then : first)}
      >
        {label}
        {active && <span aria-hidden="true">{ascending ? ' \u25b2' : ' \u25bc'}</span>}
      </button>
    </th>
  );
}

/** Every batch for leads: found by filter, ordered by a click, a page at a time, exported. */
export function BatchesPage() {
  const [params, setParams] = useSearchParams();
  const filter = useMemo(() => {
    const f: BatchFilter = {};
    for (const key of FILTER_KEYS) {
      const value = params.get(key);
      if (value) (f as Record<string, string>)[key] = value;
    }
    return f;
  }, [params]);
  const sort = filter.sort ?? '-createdAt';
  const pages = useBatchPages(filter);
  const items = pages.data?.pages.flatMap((p) => p.items) ?? [];
  const [exportError, setExportError] = useState<string | null>(null);

  // The address holds the filter, so a link reproduces the view.
  const change = (key: keyof BatchFilter, value: string) => {
    const next = new URLSearchParams(params);
    if (value) next.set(key, value);
    else next.delete(key);
    setParams(next, { replace: true });
  };
  const operators = useMemo(() => {
    const seen = new Map<string, string>();
    for (const b of pages.data?.pages.flatMap((p) => p.items) ?? []) {
      seen.set(b.operator.id, b.operator.name);
    }
    if (filter.operatorId && !seen.has(filter.operatorId)) {
      seen.set(filter.operatorId, filter.operatorId);
    }
    return [...seen].map(([id, name]) => ({ id, name }));
  }, [pages.data, filter.operatorId]);

  return (
    <section aria-labelledby="batches-title" className="mx-auto max-w-6xl space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-4">
        <h1 id="batches-title" className="text-3xl font-bold">
          Batches
        </h1>
        <button
          type="button"
          className="min-h-12 rounded-lg border border-line bg-panel px-4 font-semibold"
          onClick={() => {
            setExportError(null);
            downloadBatchesCsv(filter).catch((err: unknown) =>
              setExportError(err instanceof Error ? err.message : 'The export failed'),
            );
          }}
        >
          Export CSV
        </button>
      </div>
      {exportError && <p role="alert">The CSV cannot be made: {exportError}</p>}
      <BatchFilters filter={filter} operators={operators} onChange={change} />
      {pages.isPending && <p className="text-muted">Loading batches…</p>}
      {pages.isError && <p role="alert">Batches cannot be listed: {pages.error.message}</p>}
      {pages.isSuccess && items.length === 0 && (
        <p className="text-lg">No batch matches these filters.</p>
      )}
      {items.length > 0 && (
        <table className="w-full text-left text-lg">
          <thead>
            <tr className="border-b border-line">
              <th scope="col">No.</th>
              <SortHeader
                label="Started"
                sort={sort}
                first="-createdAt"
                then="createdAt"
                onSort={(s) => change('sort', s)}
              />
              <th scope="col">Material</th>
              <th scope="col">Operator</th>
              <th scope="col">Bench</th>
              <th scope="col">Weighed / planned</th>
              <SortHeader
                label="Off ratio"
                sort={sort}
                first="-absDeviation"
                then="absDeviation"
                onSort={(s) => change('sort', s)}
              />
              <th scope="col">Outcome</th>
              <th scope="col">Decision</th>
            </tr>
          </thead>
          <tbody>
            {items.map((b) => (
              <BatchRow key={b.id} batch={b} />
            ))}
          </tbody>
        </table>
      )}
      {pages.hasNextPage && (
        <button
          type="button"
          disabled={pages.isFetchingNextPage}
          className="min-h-12 rounded-lg bg-steel px-6 font-semibold text-paper"
          onClick={() => void pages.fetchNextPage()}
        >
          {pages.isFetchingNextPage ? 'Loading…' : 'More batches'}
        </button>
      )}
    </section>
  );
}

function BatchRow({ batch: b }: { batch: BatchSummary }) {
  const weighed = weighedTotalG(b.parts);
  return (
    <tr className="border-b border-line">
      <td>
        <Link to={`/review/batches/${b.id}`} className="font-semibold underline">
          {b.id}
        </Link>
      </td>
      <td>{shownTime(b.createdAt)}</td>
      <td>{b.materialName}</td>
      <td>{b.operator.name}</td>
      <td>{b.benchName ?? b.benchId}</td>
      <td>
        {weighed === null ? '\u2013' : gramsText(weighed, b.readabilityG)} /{' '}
        {gramsText(b.totalMassG, b.readabilityG)}
      </td>
      <td>
        {/* An abandoned batch was never judged: what was poured says nothing of the ratio. */}
        {b.ratioDeviationPct === null || b.state === 'abandoned'
          ? '\u2013'
          : deviationPctText(b.ratioDeviationPct)}
      </td>
      <td>
        <BatchOutcome batch={b} />
        {!['saved', 'abandoned'].includes(b.state) && (
          <span className="ml-2 text-muted">{STATE_SHOWN[b.state]}</span>
        )}
      </td>
      <td>
        {b.disposition
          ? DECISION_SHOWN[b.disposition]
          : b.state === 'saved' && <span className="text-muted">to decide</span>}
      </td>
    </tr>
  );
}
