import type { ReactNode } from 'react';

export const inputClass =
  'min-h-12 w-full rounded-lg border-2 border-line bg-panel px-3 text-lg aria-[invalid=true]:border-over';

/** A labelled form field with its error message read out with the field. */
export function Field({
  id,
  label,
  error,
  children,
}: {
  id: string;
  label: string;
  error?: string | undefined;
  children: ReactNode;
}) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="font-semibold">
        {label}
      </label>
      {children}
      {error && (
        <p id={`${id}-error`} className="font-semibold text-over">
          {error}
        </p>
      )}
    </div>
  );
}
