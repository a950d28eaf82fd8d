import { useId, type ReactNode } from 'react';
import type { UseFormRegisterReturn } from 'react-hook-form';

const inputClass =
  'h-14 w-full rounded-md border-2 border-line bg-panel px-3 text-2xl font-semibold text-ink focus:border-steel focus:outline-none aria-[invalid=true]:border-over';

/** A typed number with its unit beside it and its own message underneath. */
export function NumberField({
  label,
  unit,
  hint,
  error,
  registration,
}: {
  label: string;
  unit?: string;
  hint?: string;
  error?: string;
  registration: UseFormRegisterReturn;
}) {
  const id = useId();
  const describedBy = [error ? `${id}-error` : '', hint ? `${id}-hint` : '']
    .filter(Boolean)
    .join(' ');
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-lg font-semibold">
        {label}
      </label>
      <div className="flex items-center gap-2">
        <input
          id={id}
          type="text"
          inputMode="decimal"
          autoComplete="off"
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy || undefined}
          className={inputClass}
          {...registration}
        />
        {unit ? <span className="min-w-12 text-lg text-muted">{unit}</span> : null}
      </div>
      {hint ? (
        <p id={`${id}-hint`} className="text-base text-muted">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} className="text-base font-semibold text-over">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/** A choice from a short list. */
export function SelectField({
  label,
  options,
  error,
  registration,
  value,
  onChange,
  disabled,
}: {
  label: string;
  options: readonly { value: string; label: string }[];
  error?: string;
  registration?: UseFormRegisterReturn;
  value?: string;
  onChange?: (value: string) => void;
  disabled?: boolean;
}) {
  const id = useId();
  const controlled = registration
    ? registration
    : { value, onChange: (e: { target: { value: string } }) => onChange?.(e.target.value) };
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-lg font-semibold">
        {label}
      </label>
      <select
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        className={`${inputClass} disabled:bg-paper disabled:text-muted`}
        disabled={disabled}
        {...controlled}
      >
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      {error ? (
        <p id={`${id}-error`} className="text-base font-semibold text-over">
          {error}
        </p>
      ) : null}
    </div>
  );
}

export function CheckField({
  label,
  checked,
  onChange,
}: {
  label: string;
  checked: boolean;
  onChange: (checked: boolean) => void;
}) {
  return (
    <label className="flex min-h-12 items-center gap-3 text-lg font-semibold">
      <input
        type="checkbox"
        className="h-6 w-6 accent-steel"
        checked={checked}
        onChange={(e) => onChange(e.target.checked)}
      />
      {label}
    </label>
  );
}

export function FieldGroup({ title, children }: { title: string; children: ReactNode }) {
  return (
    <fieldset className="flex flex-col gap-4 rounded-lg border-2 border-line bg-panel p-5">
      <legend className="px-2 text-xl font-bold">{title}</legend>
      {children}
    </fieldset>
  );
}
