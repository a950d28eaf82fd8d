import { apiErrorSchema, type ApiError } from '@tareline/protocol';
import type { z } from 'zod';
import { getToken, setSession } from './auth';

/** A refused or failed call to the hub, with the hub's own message and bad fields. */
export class ApiRequestError extends Error {
  constructor(
    readonly status: number,
    readonly body: ApiError,
  ) {
    super(body.message);
    this.name = 'ApiRequestError';
  }
}

/**
 * Calls the hub's API and validates the answer with a protocol schema, so a hub and station of
 * different versions fail loudly instead of drawing nonsense.
 */
export async function apiRequest<S extends z.ZodType>(
  path: string,
  schema: S,
  init: RequestInit = {},
  /** `signature`: a 401 is a wrong password typed to sign, not a session that ended. */
  options: { signature?: boolean } = {},
): Promise<z.infer<S>> {
  let response: Response;
  const token = getToken();
  try {
    response = await fetch(`/api${path}`, {
      ...init,
      headers: {
        Accept: 'application/json',
        // A form (a file upload) sets its own multipart type and boundary.
        ...(typeof init.body === 'string' ? { 'Content-Type': 'application/json' } : {}),
        ...(token ? { Authorization: `Bearer ${token}` } : {}),
        ...init.headers,
      },
    });
  } catch {
    throw new ApiRequestError(0, { message: 'The hub cannot be reached', errors: [] });
  }
  const body: unknown = await response.json().catch(() => undefined);
  if (!response.ok) {
    // The hub no longer accepts this token (signed out elsewhere, expired, switched off).
    if (response.status === 401 && !options.signature && token && getToken() === token) {
      setSession(null);
    }
    const parsed = apiErrorSchema.safeParse(body);
    throw new ApiRequestError(
      response.status,
      parsed.success ? parsed.data : { message: `The hub answered ${response.status}`, errors: [] },
    );
  }
  return schema.parse(body);
}
