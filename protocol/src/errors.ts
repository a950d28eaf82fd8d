import { z } from 'zod';

/** Body of every 4xx answer from the hub: one message, and each bad field by its path. */
export const apiErrorSchema = z.object({
  message: z.string(),
  errors: z
    .array(
      z.object({
        path: z.string(),
        message: z.string(),
      }),
    )
    .default([]),
});

export type ApiError = z.infer<typeof apiErrorSchema>;

/** Flatten a zod error into the `errors` list of an {@link ApiError}, naming each field by a dotted path. */
export function fieldErrors(error: z.ZodError): ApiError['errors'] {
  return error.issues.map((issue) => ({
    path: issue.path.map(String).join('.') || '(body)',
    message: issue.message,
  }));
}
