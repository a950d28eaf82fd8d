import { zodResolver } from '@hookform/resolvers/zod';
import type { Material } from '@tareline/protocol';
import { useForm, useWatch, type FieldErrors, type Resolver } from 'react-hook-form';
import { Field, FieldGroup, SelectField, TextField } from '../../../components/form/field';
import { useCreateMaterial, useUpdateMaterial } from '../api/materials';
import {
  materialFormSchema,
  toFormValues,
  toPatch,
  type MaterialFormOutput,
  type MaterialFormValues,
} from '../utils/material-form';
import { primary, secondary } from './buttons';
import { showServerError } from './show-server-error';

const PARTS = ['A', 'B', 'C'] as const;
const BASIS_OPTIONS = [
  { value: 'weight', label: 'by weight' },
  { value: 'volume', label: 'by volume' },
];
const COUNT_OPTIONS = [
  { value: '2', label: 'two parts (A, B)' },
  { value: '3', label: 'three parts (A, B, C)' },
];

/** The first message at `path` or anywhere under it (a list's own error or one of its items). */
function messageAt(errors: FieldErrors, path: string): string | undefined {
  let node: unknown = errors;
  for (const key of path.split('.')) node = (node as Record<string, unknown> | undefined)?.[key];
  const find = (n: unknown): string | undefined => {
    if (!n || typeof n !== 'object') return undefined;
    const own = (n as { message?: unknown }).message;
    if (typeof own === 'string') return own;
    for (const [k, child] of Object.entries(n)) {
      if (k === 'ref') continue;
      const m = find(child);
      if (m) return m;
    }
    return undefined;
  };
  return find(node);
}

const resolver: Resolver<MaterialFormValues, unknown, MaterialFormOutput> =
  zodResolver(materialFormSchema);

/** Adds a material, or changes one: everything the bench uses, from the maker's data sheet. */
export function MaterialForm({ material, onDone }: { material?: Material; onDone: () => void }) {
  const create = useCreateMaterial();
  const update = useUpdateMaterial();
  const form = useForm<MaterialFormValues, unknown, MaterialFormOutput>({
    resolver,
    defaultValues: toFormValues(material),
  });
  const { errors, isSubmitting } = form.formState;
  const count = useWatch({ control: form.control, name: 'partCount' }) === '3' ? 3 : 2;
  const basis = useWatch({ control: form.control, name: 'ratio.basis' });
  const parts = PARTS.slice(0, count);
  const title = material ? `Edit ${material.name}` : 'Add material';
  const err = (path: string) => messageAt(errors, path);

  const submit = form.handleSubmit(async (values) => {
    try {
      if (material) await update.mutateAsync({ id: material.id, ...toPatch(values) });
      else await create.mutateAsync(values);
      onDone();
    } catch (error) {
      showServerError(form, error);
    }
  });

  /** One box per part for a per-part list, under a shared heading. */
  const perPart = (
    name:
      | 'ratio.parts'
      | 'alsoStatedRatio.parts'
      | 'partSpecificGravities'
      | 'partLabels'
      | 'costPerKg'
      | 'lowStockG',
    label: string,
    unit?: string,
  ) => (
    <div className="flex flex-col gap-2">
      <div className="grid grid-cols-3 gap-3">
        {parts.map((p, i) => (
          <TextField
            key={p}
            label={`${label}, part ${p}`}
            unit={unit}
            inputMode={name === 'partLabels' ? 'text' : 'decimal'}
            autoComplete="off"
            error={messageAt(errors, `${name}.${i}`)}
            {...form.register(`${name}.${i}` as `${typeof name}.0`)}
          />
        ))}
      </div>
      {(() => {
        // A list's own error (wrong length) has no box of its own.
        const own =
          (messageAt(errors, name) ?? '') !== '' && !parts.some((_, i) => err(`${name}.${i}`));
        return own ? <p className="font-semibold text-over">{err(name)}</p> : null;
      })()}
    </div>
  );

  return (
    <form
      noValidate
      aria-label={title}
      onSubmit={submit}
      className="flex flex-col gap-5 rounded-xl bg-panel p-5 shadow-sm"
    >
      <h2 className="text-2xl font-bold">{title}</h2>
      {errors.root && (
        <p role="alert" className="font-semibold text-over">
          {errors.root.message}
        </p>
      )}
      <FieldGroup title="Name and mix ratio">
        <TextField label="Name" error={err('name')} {...form.register('name')} />
        <div className="grid grid-cols-1 gap-3 md:grid-cols-2">
          <SelectField
            label="Parts"
            size="form"
            options={COUNT_OPTIONS}
            {...form.register('partCount')}
          />
          <SelectField
            label="Mix ratio"
            size="form"
            options={BASIS_OPTIONS}
            error={err('ratio.basis')}
            {...form.register('ratio.basis')}
          />
        </div>
        {perPart('ratio.parts', 'Ratio')}
        <p className="text-muted">
          If the data sheet also gives the ratio {basis === 'weight' ? 'by volume' : 'by weight'},
          enter it: it is checked against the parts’ specific gravities (within 2 %).
        </p>
        {perPart('alsoStatedRatio.parts', `Also ${basis === 'weight' ? 'by volume' : 'by weight'}`)}
        {perPart('partLabels', 'Label')}
      </FieldGroup>
      <FieldGroup title="Density">
        {perPart('partSpecificGravities', 'Specific gravity')}
        <div className="grid grid-cols-1 gap-3 md:grid-cols-2">
          <TextField
            label="Specific gravity of the mix"
            inputMode="decimal"
            error={err('specificGravity')}
            {...form.register('specificGravity')}
          />
          <TextField
            label="Or its yield"
            unit="in³/lb"
            inputMode="decimal"
            error={err('yieldIn3PerLb')}
            {...form.register('yieldIn3PerLb')}
          />
        </div>
      </FieldGroup>
      <FieldGroup title="At the bench">
        <div className="grid grid-cols-1 gap-3 md:grid-cols-3">
          <TextField
            label="Tolerance"
            unit="%"
            inputMode="decimal"
            error={err('tolerancePct')}
            {...form.register('tolerancePct')}
          />
          <TextField
            label="Pot life"
            unit="min"
            inputMode="decimal"
            error={err('potLifeMin')}
            {...form.register('potLifeMin')}
          />
          <TextField
            label="Pot life measured at"
            unit="g"
            inputMode="decimal"
            error={err('potLifeMassG')}
            {...form.register('potLifeMassG')}
          />
          <TextField
            label="Demold time"
            unit="min"
            inputMode="decimal"
            error={err('demoldMin')}
            {...form.register('demoldMin')}
          />
          <TextField
            label="Agitation of filled parts"
            unit="min"
            inputMode="decimal"
            error={err('agitateMin')}
            {...form.register('agitateMin')}
          />
          <TextField
            label="Shelf life after opening"
            unit="days"
            inputMode="numeric"
            error={err('openShelfLifeDays')}
            {...form.register('openShelfLifeDays')}
          />
        </div>
        <Field label="Storage note" error={err('storageNote')}>
          {(control) => <textarea rows={2} {...control} {...form.register('storageNote')} />}
        </Field>
        <Field
          label="Cautions, one per line"
          hint="As the material's safety data sheet words them; the bench shows them before weighing."
          error={err('cautions')}
        >
          {(control) => <textarea rows={3} {...control} {...form.register('cautions')} />}
        </Field>
        <TextField
          label="Safety data sheet (where to find it)"
          error={err('sdsRef')}
          {...form.register('sdsRef')}
        />
      </FieldGroup>
      <FieldGroup title="Cost and stock">
        {perPart('costPerKg', 'Cost per kg')}
        {perPart('lowStockG', 'Warn below', 'g')}
      </FieldGroup>
      <div className="flex gap-3">
        <button type="submit" className={primary} disabled={isSubmitting}>
          Save material
        </button>
        <button type="button" className={secondary} onClick={onDone}>
          Cancel
        </button>
      </div>
    </form>
  );
}
