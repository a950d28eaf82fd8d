import type { BatchSort, BatchSummary } from '@tareline/protocol';
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  useReactTable,
  type SortingState,
  type Updater,
} from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { dateTimeText } from '../../../lib/dates';
import { useBenches } from '../../../lib/benches';
import { gramsText } from '../../../lib/grams';
import { deviationPctText } from '../../../lib/percent';
import { downloadBatchesCsv, exportAddress } from '../api/export-batches';
import { FILTER_KEYS, useBatchPage, type BatchFilter } from '../api/get-batches';
import { DECISION_SHOWN, weighedTotalG } from '../utils';
import { BatchFilters, STATE_SHOWN } from './batch-filters';
import { BatchOutcome } from './batch-outcome';

/** The filter of the "to decide" view: saved NO-GO batches nobody has decided on yet. */
export const TO_DECIDE: BatchFilter = { verdict: 'NO-GO', state: 'saved', disposition: 'none' };
const TO_DECIDE_QUERY = new URLSearchParams(TO_DECIDE as Record<string, string>).toString();

/** The columns a click sorts, and the hub's order for each direction. */
const SORTS: Record<string, { asc: BatchSort; desc: BatchSort }> = {
  createdAt: { asc: 'createdAt', desc: '-createdAt' },
  deviation: { asc: 'absDeviation', desc: '-absDeviation' },
};

/** The hub's order as the table's sorting state (the signed orders have no column of their own). */
function sortingOf(sort: BatchSort): SortingState {
  for (const [id, { asc, desc }] of Object.entries(SORTS)) {
    if (sort === asc) return [{ id, desc: false }];
    if (sort === desc) return [{ id, desc: true }];
  }
  return [];
}

function sortOf(sorting: SortingState): BatchSort {
  const first = sorting[0];
  const pair = first && SORTS[first.id];
  return pair ? (first.desc ? pair.desc : pair.asc) : '-createdAt';
}

const column = createColumnHelper<BatchSummary>();

function useColumns(benchNames: ReadonlyMap<string, string>) {
  return useMemo(
    () => [
      column.accessor('id', {
        header: 'No.',
        enableSorting: false,
        cell: (c) => (
          <Link to={`/review/batches/${c.getValue()}`} className="font-semibold underline">
            {c.getValue()}
          </Link>
        ),
      }),
      column.accessor('createdAt', {
        header: 'Started',
        cell: (c) => (
          <time dateTime={c.getValue()} className="whitespace-nowrap">
            {dateTimeText(c.getValue())}
          </time>
        ),
      }),
      column.accessor('materialName', { header: 'Material', enableSorting: false }),
      column.accessor((b) => b.operator.name, {
        id: 'operator',
        header: 'Operator',
        enableSorting: false,
      }),
      column.accessor((b) => b.benchName ?? benchNames.get(b.benchId) ?? b.benchId, {
        id: 'bench',
        header: 'Bench',
        enableSorting: false,
      }),
      column.display({
        id: 'mass',
        header: 'Weighed / planned',
        cell: ({ row: { original: b } }) => {
          const weighed = weighedTotalG(b.parts);
          return `${weighed === null ? '\u2013' : gramsText(weighed, b.readabilityG)} / ${gramsText(b.totalMassG, b.readabilityG)}`;
        },
      }),
      column.accessor('ratioDeviationPct', {
        id: 'deviation',
        header: 'Off ratio',
        // An abandoned batch was never judged: what was poured says nothing of the ratio.
        cell: ({ row: { original: b } }) =>
          b.ratioDeviationPct === null || b.state === 'abandoned'
            ? '\u2013'
            : deviationPctText(b.ratioDeviationPct),
      }),
      column.display({
        id: 'outcome',
        header: 'Outcome',
        cell: ({ row: { original: b } }) => (
          <>
            <BatchOutcome batch={b} />
            {!['saved', 'abandoned'].includes(b.state) && (
              <span className="ml-2 text-muted">{STATE_SHOWN[b.state]}</span>
            )}
          </>
        ),
      }),
      column.accessor('disposition', {
        header: 'Decision',
        enableSorting: false,
        cell: ({ row: { original: b } }) =>
          b.disposition
            ? DECISION_SHOWN[b.disposition]
            : b.state === 'saved' && <span className="text-muted">to decide</span>,
      }),
    ],
    [benchNames],
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
  const filterKey = JSON.stringify(filter);

  // Keyset paging: the hub gives the cursor of the next page only, so the cursors of the pages
  // behind are kept to go back. A new filter starts again at the first page.
  const [stack, setStack] = useState<{ key: string; cursors: (string | null)[] }>({
    key: filterKey,
    cursors: [null],
  });
  const cursors = stack.key === filterKey ? stack.cursors : [null];
  const page = useBatchPage(filter, cursors.at(-1) ?? null);
  const items = page.data?.items ?? [];

  const benches = useBenches();
  const benchNames = useMemo(
    () => new Map((benches.data ?? []).map((b) => [b.id, b.name])),
    [benches.data],
  );
  const columns = useColumns(benchNames);
  const sorting = sortingOf(sort);
  // The table object is read in this render only and handed to no memoized child, which is
  // what the React Compiler's warning about TanStack Table guards against.
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data: items,
    columns,
    getCoreRowModel: getCoreRowModel(),
    // The hub sorts (over every batch, not only this page): the table only shows the order.
    manualSorting: true,
    enableSortingRemoval: false,
    sortDescFirst: true,
    state: { sorting },
    onSortingChange: (updater: Updater<SortingState>) => {
      const next = typeof updater === 'function' ? updater(sorting) : updater;
      change('sort', sortOf(next));
    },
  });
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
    for (const b of page.data?.items ?? []) seen.set(b.operator.id, b.operator.name);
    if (filter.operatorId && !seen.has(filter.operatorId)) {
      seen.set(filter.operatorId, filter.operatorId);
    }
    return [...seen].map(([id, name]) => ({ id, name }));
  }, [page.data, filter.operatorId]);
  const toDecide = (Object.keys(TO_DECIDE) as (keyof BatchFilter)[]).every(
    (k) => filter[k] === TO_DECIDE[k],
  );
  const tab = (active: boolean) =>
    `min-h-12 rounded-lg px-4 py-2.5 font-semibold ${active ? 'bg-steel text-paper' : 'border border-line bg-panel'}`;

  return (
    <section aria-labelledby="batches-title" className="mx-auto max-w-6xl space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-4">
        <h1 id="batches-title" className="text-3xl font-bold">
          Batches
        </h1>
        <nav aria-label="Views" className="flex gap-2">
          <Link to="/review/batches" className={tab(!toDecide)} aria-current={!toDecide && 'page'}>
            All batches
          </Link>
          <Link
            to={`/review/batches?${TO_DECIDE_QUERY}`}
            className={tab(toDecide)}
            aria-current={toDecide && 'page'}
          >
            To decide
          </Link>
        </nav>
        {/*
          The hub takes the session's token in a header only (no cookie), which a followed link
          cannot send: a click fetches the same address with the token and saves the answer. The
          address stays on the link so it shows what is exported.
        */}
        <a
          href={exportAddress(filter)}
          download
          className="inline-flex min-h-12 items-center rounded-lg border border-line bg-panel px-4 font-semibold"
          onClick={(e) => {
            e.preventDefault();
            setExportError(null);
            downloadBatchesCsv(filter).catch((err: unknown) =>
              setExportError(err instanceof Error ? err.message : 'The export failed'),
            );
          }}
        >
          Export CSV
        </a>
      </div>
      {exportError && <p role="alert">The CSV cannot be made: {exportError}</p>}
      <BatchFilters
        key={filter.lot ?? ''}
        filter={filter}
        operators={operators}
        onChange={change}
      />
      {page.isPending && <p className="text-muted">Loading batches…</p>}
      {page.isError && <p role="alert">Batches cannot be listed: {page.error.message}</p>}
      {page.isSuccess && items.length === 0 && (
        <p className="text-lg">
          {toDecide ? 'Nothing waits for a decision.' : 'No batch matches these filters.'}
        </p>
      )}
      {items.length > 0 && (
        <table className="w-full text-left text-lg" aria-busy={page.isPlaceholderData}>
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id} className="border-b border-line">
                {group.headers.map((header) => {
                  const label = flexRender(header.column.columnDef.header, header.getContext());
                  const sorted = header.column.getIsSorted();
                  if (!header.column.getCanSort()) {
                    return (
                      <th key={header.id} scope="col">
                        {label}
                      </th>
                    );
                  }
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={
                        sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : 'none'
                      }
                    >
                      <button
                        type="button"
                        className="font-semibold underline decoration-dotted"
                        onClick={header.column.getToggleSortingHandler()}
                      >
                        {label}
                        {sorted && (
                          <span aria-hidden="true">{sorted === 'asc' ? ' \u25b2' : ' \u25bc'}</span>
                        )}
                      </button>
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-b border-line">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id}>{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <nav aria-label="Pages" className="flex items-center gap-4">
        <button
          type="button"
          disabled={cursors.length <= 1 || page.isFetching}
          className="min-h-12 rounded-lg border border-line bg-panel px-6 font-semibold disabled:opacity-40"
          onClick={() => setStack({ key: filterKey, cursors: cursors.slice(0, -1) })}
        >
          Previous page
        </button>
        <span className="text-muted">Page {cursors.length}</span>
        <button
          type="button"
          disabled={!page.data?.nextCursor || page.isFetching}
          className="min-h-12 rounded-lg bg-steel px-6 font-semibold text-paper disabled:opacity-40"
          onClick={() =>
            page.data?.nextCursor &&
            setStack({ key: filterKey, cursors: [...cursors, page.data.nextCursor] })
          }
        >
          {page.isFetching && !page.isPending ? 'Loading…' : 'Next page'}
        </button>
      </nav>
    </section>
  );
}
