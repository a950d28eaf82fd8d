import { useId, type ComponentPropsWithRef, type ReactNode } from 'react';

/**
 * How big a field is drawn: `form` for desk forms, `figure` for the numbers of the volume
 * estimator, `bench` for the one big number an operator types at the bench.
 */
export type FieldSize = 'form' | 'figure' | 'bench';

const LOOK: Record<
  FieldSize,
  { label: string; hint: string; error: string; input: string; unit: string; row: string }
> = {
  form: {
    label: 'font-semibold',
    hint: 'text-muted',
    error: 'font-semibold text-over',
    input:
      'min-h-12 w-full rounded-lg border-2 border-line bg-panel px-3 text-lg aria-[invalid=true]:border-over',
    unit: 'text-lg text-muted',
    row: 'flex items-center gap-2',
  },
  figure: {
    label: 'text-lg font-semibold',
    hint: 'text-base text-muted',
    error: 'text-base font-semibold text-over',
    input:
      'h-14 w-full rounded-md border-2 border-line bg-panel px-3 text-2xl font-semibold text-ink focus:border-steel focus:outline-none aria-[invalid=true]:border-over',
    unit: 'min-w-12 text-lg text-muted',
    row: 'flex items-center gap-2',
  },
  bench: {
    label: 'text-xl font-semibold',
    hint: 'text-lg text-muted',
    error: 'text-xl font-semibold text-over',
    input:
      'rounded-xl border-2 border-line bg-panel px-4 text-4xl font-bold tabular-nums focus:border-steel focus:outline-none aria-[invalid=true]:border-over',
    unit: 'text-3xl',
    row: 'flex items-center gap-3',
  },
};

/** What a field hands its control: its id, look and the links to its hint and error. */
export interface FieldControl {
  id: string;
  className: string;
  'aria-invalid': true | undefined;
  'aria-describedby': string | undefined;
}

export interface FieldProps {
  label: ReactNode;
  /** A line under the control that helps fill it in. */
  hint?: string | undefined;
  /** The message for what was typed; the control is marked invalid while there is one. */
  error?: string | undefined;
  /** The unit beside the control, e.g. "g". */
  unit?: string | undefined;
  size?: FieldSize;
  /** Read out but not shown, where the form's heading already says what the field is. */
  hideLabel?: boolean;
}

/**
 * A label, its control, an optional hint and the error message, read out with the control
 * (`aria-describedby`). The control is drawn by `children` from the ids and classes handed in.
 */
export function Field({
  label,
  hint,
  error,
  unit,
  size = 'form',
  hideLabel = false,
  children,
}: FieldProps & { children: (control: FieldControl) => ReactNode }) {
  const id = useId();
  const look = LOOK[size];
  const describedBy = [error ? `${id}-error` : '', hint ? `${id}-hint` : '']
    .filter(Boolean)
    .join(' ');
  const control = children({
    id,
    className: look.input,
    'aria-invalid': error ? true : undefined,
    'aria-describedby': describedBy || undefined,
  });
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className={hideLabel ? 'sr-only' : look.label}>
        {label}
      </label>
      {unit ? (
        <div className={look.row}>
          {control}
          <span className={look.unit}>{unit}</span>
        </div>
      ) : (
        control
      )}
      {hint ? (
        <p id={`${id}-hint`} className={look.hint}>
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} className={look.error}>
          {error}
        </p>
      ) : null}
    </div>
  );
}

type InputProps = Omit<ComponentPropsWithRef<'input'>, 'id' | 'className' | 'size'>;

/** A labelled text box; a react-hook-form registration spreads straight into it. */
export function TextField({
  label,
  hint,
  error,
  unit,
  size,
  hideLabel,
  inputClassName = '',
  ...input
}: FieldProps & InputProps & { inputClassName?: string }) {
  return (
    <Field {...{ label, hint, error, unit, size, hideLabel }}>
      {({ className, ...control }) => (
        <input className={`${className} ${inputClassName}`.trim()} {...control} {...input} />
      )}
    </Field>
  );
}

/** A typed number ("1,5" is read as 1.5 by `asNumber`), with its unit beside it. */
export function NumberField(props: FieldProps & InputProps & { inputClassName?: string }) {
  return <TextField type="text" inputMode="decimal" autoComplete="off" size="figure" {...props} />;
}

/** What is typed in a number box: '' is nothing yet, "1,5" is read as 1.5, else a number or NaN. */
export function asNumber(raw: unknown): number | undefined {
  if (typeof raw === 'number') return raw;
  const text = String(raw ?? '').trim();
  return text === '' ? undefined : Number(text.replace(',', '.'));
}

type SelectProps = Omit<ComponentPropsWithRef<'select'>, 'id' | 'className' | 'size' | 'onChange'>;

/** A choice from a short list: registered with react-hook-form, or held by the page (`onPick`). */
export function SelectField({
  label,
  hint,
  error,
  size = 'figure',
  hideLabel,
  options,
  onPick,
  onChange,
  ...select
}: FieldProps &
  SelectProps & {
    options: readonly { value: string; label: string }[];
    onPick?: (value: string) => void;
    onChange?: ComponentPropsWithRef<'select'>['onChange'];
  }) {
  return (
    <Field {...{ label, hint, error, size, hideLabel }}>
      {({ className, ...control }) => (
        <select
          className={`${className} disabled:bg-paper disabled:text-muted`}
          {...control}
          {...select}
          onChange={(e) => {
            onPick?.(e.target.value);
            return onChange?.(e);
          }}
        >
          {options.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      )}
    </Field>
  );
}

/** A yes/no choice held by the page. */
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

/** Fields that belong together, under a title. */
export function FieldGroup({ title, children }: { title: string; children: ReactNode }) {
  return (
    <fieldset className="flex flex-col gap-4 rounded-lg border-2 border-line bg-panel p-5">
      <legend className="px-2 text-xl font-bold">{title}</legend>
      {children}
    </fieldset>
  );
}
