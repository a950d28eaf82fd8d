import {
  batchSortSchema,
  batchStateSchema,
  batchVerdictSchema,
  dispositionDecisionSchema,
  type BatchState,
  type BatchSort,
} from '@tareline/protocol';
import { useState } from 'react';
import { SelectField, TextField } from '../../../components/form/field';
import { useBenches } from '../../../lib/benches';
import type { BatchFilter } from '../api/get-batches';
import { useFilterMaterials } from '../api/get-materials';
import { DECISION_SHOWN } from '../utils';

export const STATE_SHOWN: Record<BatchState, string> = {
  'weighing-a': 'weighing part A',
  'weighing-b': 'weighing part B',
  'weighing-c': 'weighing part C',
  saved: 'saved',
  abandoned: 'abandoned',
  interrupted: 'interrupted',
};

export const SORT_SHOWN: Record<BatchSort, string> = {
  '-createdAt': 'newest first',
  createdAt: 'oldest first',
  '-absDeviation': 'furthest off ratio first',
  absDeviation: 'closest to ratio first',
  '-ratioDeviationPct': 'most part B over first',
  ratioDeviationPct: 'most part B under first',
};

const ANY = { value: '', label: 'any' };

/**
 * The list's filters. Choices apply at once; the lot code applies when it is entered (Enter or
 * leaving the box), so the list is not asked again for every letter typed.
 */
export function BatchFilters({
  filter,
  operators,
  onChange,
}: {
  filter: BatchFilter;
  /** The operators the list has shown so far (the people list is for admins only). */
  operators: readonly { id: string; name: string }[];
  onChange: (key: keyof BatchFilter, value: string) => void;
}) {
  const materials = useFilterMaterials();
  const benches = useBenches();
  const [lot, setLot] = useState(filter.lot ?? '');
  const select = (key: keyof BatchFilter) => ({
    value: filter[key] ?? '',
    onPick: (value: string) => onChange(key, value),
  });
  return (
    <form
      aria-label="Filters"
      className="grid grid-cols-2 gap-3 md:grid-cols-5"
      onSubmit={(e) => {
        e.preventDefault();
        onChange('lot', lot);
      }}
    >
      <TextField
        label="From"
        type="date"
        value={filter.from ?? ''}
        onChange={(e) => onChange('from', e.target.value)}
      />
      <TextField
        label="To"
        type="date"
        value={filter.to ?? ''}
        onChange={(e) => onChange('to', e.target.value)}
      />
      <SelectField
        label="Material"
        options={[ANY, ...(materials.data ?? []).map((m) => ({ value: m.id, label: m.name }))]}
        {...select('materialId')}
      />
      <SelectField
        label="Bench"
        options={[ANY, ...(benches.data ?? []).map((b) => ({ value: b.id, label: b.name }))]}
        {...select('benchId')}
      />
      <SelectField
        label="Operator"
        options={[ANY, ...operators.map((o) => ({ value: o.id, label: o.name }))]}
        {...select('operatorId')}
      />
      <SelectField
        label="Verdict"
        options={[ANY, ...batchVerdictSchema.options.map((v) => ({ value: v, label: v }))]}
        {...select('verdict')}
      />
      <SelectField
        label="State"
        options={[
          ANY,
          ...batchStateSchema.options.map((s) => ({ value: s, label: STATE_SHOWN[s] })),
        ]}
        {...select('state')}
      />
      <SelectField
        label="Decision"
        options={[
          ANY,
          { value: 'none', label: 'to decide' },
          ...dispositionDecisionSchema.options.map((d) => ({
            value: d,
            label: DECISION_SHOWN[d],
          })),
        ]}
        {...select('disposition')}
      />
      <TextField
        label="Lot code"
        value={lot}
        onChange={(e) => setLot(e.target.value)}
        onBlur={() => onChange('lot', lot)}
        enterKeyHint="search"
      />
      <SelectField
        label="Order"
        options={batchSortSchema.options.map((s) => ({ value: s, label: SORT_SHOWN[s] }))}
        value={filter.sort ?? '-createdAt'}
        onPick={(value) => onChange('sort', value)}
      />
    </form>
  );
}
