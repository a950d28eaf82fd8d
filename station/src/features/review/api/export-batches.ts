import { apiErrorSchema } from '@tareline/protocol';
import { ApiRequestError } from '../../../lib/api-client';
import { getToken } from '../../../lib/auth';
import { batchQuery, type BatchFilter } from './get-batches';

/** The address of the CSV of a filter's batches (every page, not only those shown). */
export function exportAddress(filter: BatchFilter): string {
  const query = batchQuery(filter).toString();
  return `/api/batches/export.csv${query ? `?${query}` : ''}`;
}

/**
 * Downloads the CSV. The hub wants the session's token in a header, which a plain link cannot
 * send: the file is fetched, then handed to the browser as a download.
 */
export async function downloadBatchesCsv(filter: BatchFilter): Promise<void> {
  const token = getToken();
  let response: Response;
  try {
    response = await fetch(exportAddress(filter), {
      headers: { Accept: 'text/csv', ...(token ? { Authorization: `Bearer ${token}` } : {}) },
    });
  } catch {
    throw new ApiRequestError(0, { message: 'The hub cannot be reached', errors: [] });
  }
  if (!response.ok) {
    const parsed = apiErrorSchema.safeParse(await response.json().catch(() => undefined));
    throw new ApiRequestError(
      response.status,
      parsed.success ? parsed.data : { message: `The hub answered ${response.status}`, errors: [] },
    );
  }
  const url = URL.createObjectURL(await response.blob());
  const link = document.createElement('a');
  link.href = url;
  link.download = `batches-${new Date().toISOString().slice(0, 10)}.csv`;
  document.body.append(link);
  link.click();
  link.remove();
  URL.revokeObjectURL(url);
}
