import { apiErrorSchema } from '@tareline/protocol';
import { ApiRequestError } from './api-client';
import { getToken } from './auth';

/**
 * Downloads a file from the hub (`/api/...`). The hub wants the session's token in a header,
 * which a plain link cannot send: the file is fetched, then handed to the browser as a download.
 */
export async function downloadFromHub(address: string, fileName: string, accept: string) {
  const token = getToken();
  let response: Response;
  try {
    response = await fetch(address, {
      headers: { Accept: accept, ...(token ? { Authorization: `Bearer ${token}` } : {}) },
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
  link.download = fileName;
  document.body.append(link);
  link.click();
  link.remove();
  URL.revokeObjectURL(url);
}
