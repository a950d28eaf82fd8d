import type { FieldValues, Path, UseFormReturn } from 'react-hook-form';
import { ApiRequestError } from '../../../lib/api-client';

/** Puts the hub's field errors on the form's fields; anything else becomes the form's message. */
export function showServerError<T extends FieldValues>(
  form: UseFormReturn<T, unknown, never> | UseFormReturn<T, unknown, FieldValues>,
  error: unknown,
): void {
  const set = form.setError as (name: Path<T> | 'root', e: { message: string }) => void;
  if (error instanceof ApiRequestError) {
    const fields = error.body.errors.filter((e) => e.path !== '(body)');
    for (const e of fields) set(e.path as Path<T>, { message: e.message });
    if (fields.length === 0) set('root', { message: error.message });
  } else {
    set('root', { message: 'The hub cannot be reached' });
  }
}
