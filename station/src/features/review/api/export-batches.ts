import { downloadFromHub } from '../../../lib/download';
import { batchQuery, type BatchFilter } from './get-batches';

/** The address of the CSV of a filter's batches (every page, not only those shown). */
export function exportAddress(filter: BatchFilter): string {
  const query = batchQuery(filter).toString();
  return `/api/batches/export.csv${query ? `?${query}` : ''}`;
}

/** Downloads the CSV of every batch the filter matches. */
export function downloadBatchesCsv(filter: BatchFilter): Promise<void> {
  return downloadFromHub(
    exportAddress(filter),
    `batches-${new Date().toISOString().slice(0, 10)}.csv`,
    'text/csv',
  );
}
