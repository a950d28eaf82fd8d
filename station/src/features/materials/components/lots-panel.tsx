import { zodResolver } from '@hookform/resolvers/zod';
import {
  lotAdjustmentInputSchema,
  lotInputSchema,
  type Lot,
  type LotAdjustmentInput,
  type LotInput,
  type Material,
} from '@tareline/protocol';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { asNumber, SelectField, TextField } from '../../../components/form/field';
import { useCodeScanner } from '../../../hooks/use-code-scanner';
import { stockText } from '../../../lib/grams';
import { partName } from '../../../lib/parts';
import { useAdjustLot, useLotMovements, useReceiveLot } from '../api/materials';
import { primary, secondary } from './buttons';
import { showServerError } from './show-server-error';

const blankToUndefined = (v: unknown) => (v === '' || v === null ? undefined : v);

/** A material's lots: what is on hand, warnings, receiving a lot and adjusting one. */
export function LotsPanel({ material, lots }: { material: Material; lots: Lot[] }) {
  const [receiving, setReceiving] = useState(false);
  const [adjusting, setAdjusting] = useState<string | null>(null);
  const label = (part: number) => partName(part, material.partLabels[part]);
  return (
    <section
      aria-label={`Lots of ${material.name}`}
      className="flex flex-col gap-4 rounded-xl bg-panel p-5 shadow-sm"
    >
      <div className="flex items-center justify-between">
        <h2 className="text-2xl font-bold">Lots of {material.name}</h2>
        <button type="button" className={primary} onClick={() => setReceiving(true)}>
          Receive a lot
        </button>
      </div>
      {receiving && <ReceiveLotForm material={material} onDone={() => setReceiving(false)} />}
      {lots.length === 0 ? (
        <p className="text-muted">No lots received yet.</p>
      ) : (
        <table className="w-full border-collapse text-left">
          <thead>
            <tr className="border-b-2 border-line">
              <th className="p-2">Part</th>
              <th className="p-2">Lot</th>
              <th className="p-2">Received</th>
              <th className="p-2">On hand</th>
              <th className="p-2">Use by</th>
              <th className="p-2">Opened</th>
              <th className="p-2">Warnings</th>
              <th className="p-2">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {lots.map((lot) => (
              <tr key={lot.id} className="border-b border-line align-top">
                <td className="p-2">{label(lot.part)}</td>
                <td className="p-2 font-semibold">{lot.code}</td>
                <td className="p-2 tabular-nums">{stockText(lot.receivedG)}</td>
                <td className="p-2 font-semibold tabular-nums">{stockText(lot.onHandG)}</td>
                <td className="p-2">{lot.expiresOn ?? '—'}</td>
                <td className="p-2">{lot.openedOn ?? '—'}</td>
                <td className="p-2">
                  {lot.warnings.map((w) => (
                    <p key={w.code} className="font-semibold text-over">
                      ⚠ {w.message}
                    </p>
                  ))}
                </td>
                <td className="p-2">
                  <button
                    type="button"
                    className={secondary}
                    aria-label={`Adjust ${lot.code}`}
                    onClick={() => setAdjusting(lot.id)}
                  >
                    Adjust
                  </button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {lots
        .filter((l) => l.id === adjusting)
        .map((lot) => (
          <AdjustLot key={lot.id} lot={lot} onDone={() => setAdjusting(null)} />
        ))}
    </section>
  );
}

type LotOut = z.output<typeof lotInputSchema>;

/** Receiving at the desk: scan the label (or type it), the quantity and the dates. */
function ReceiveLotForm({ material, onDone }: { material: Material; onDone: () => void }) {
  const receive = useReceiveLot();
  const form = useForm<LotInput, unknown, LotOut>({
    resolver: zodResolver(lotInputSchema),
    defaultValues: { materialId: material.id, part: 0, code: '' },
  });
  const { errors, isSubmitting } = form.formState;
  // A label scanned while no box has the focus fills the lot code.
  useCodeScanner((code) => form.setValue('code', code, { shouldValidate: true }), {
    minLength: 3,
  });
  const submit = form.handleSubmit(async (values) => {
    try {
      await receive.mutateAsync(values);
      onDone();
    } catch (error) {
      showServerError(form, error);
    }
  });
  return (
    <form
      noValidate
      aria-label="Receive a lot"
      onSubmit={submit}
      className="grid grid-cols-1 gap-4 rounded-lg border-2 border-line p-4 md:grid-cols-3"
    >
      <p className="text-muted md:col-span-3">Scan the container’s label, or type the lot code.</p>
      {errors.root && (
        <p role="alert" className="font-semibold text-over md:col-span-3">
          {errors.root.message}
        </p>
      )}
      <SelectField
        label="Part"
        size="form"
        error={errors.part?.message}
        options={material.weightRatio.map((_, i) => ({
          value: String(i),
          label: partName(i, material.partLabels[i]),
        }))}
        {...form.register('part', { setValueAs: (v) => Number(v) })}
      />
      <TextField
        label="Lot code"
        autoComplete="off"
        error={errors.code?.message}
        {...form.register('code')}
      />
      <TextField
        label="Quantity received"
        unit="g"
        inputMode="decimal"
        error={errors.receivedG?.message}
        {...form.register('receivedG', { setValueAs: asNumber })}
      />
      <TextField
        label="Use by"
        type="date"
        error={errors.expiresOn?.message}
        {...form.register('expiresOn', { setValueAs: blankToUndefined })}
      />
      <TextField
        label="Opened on"
        type="date"
        error={errors.openedOn?.message}
        {...form.register('openedOn', { setValueAs: blankToUndefined })}
      />
      <div className="flex items-end gap-3">
        <button type="submit" className={primary} disabled={isSubmitting}>
          Save lot
        </button>
        <button type="button" className={secondary} onClick={onDone}>
          Cancel
        </button>
      </div>
    </form>
  );
}

type AdjustOut = z.output<typeof lotAdjustmentInputSchema>;

/** A spill or a count, with the reason; the lot's history below. */
function AdjustLot({ lot, onDone }: { lot: Lot; onDone: () => void }) {
  const adjust = useAdjustLot();
  const history = useLotMovements(lot.id);
  const form = useForm<LotAdjustmentInput, unknown, AdjustOut>({
    resolver: zodResolver(lotAdjustmentInputSchema),
    defaultValues: { reason: '' },
  });
  const { errors, isSubmitting } = form.formState;
  const submit = form.handleSubmit(async (values) => {
    try {
      await adjust.mutateAsync({ id: lot.id, ...values });
      form.reset({ reason: '' });
      // An uncontrolled box keeps its text through a reset: empty it, so a second click adds nothing.
      form.setValue('deltaG', '' as unknown as number);
    } catch (error) {
      showServerError(form, error);
    }
  });
  return (
    <section aria-label={`Adjust lot ${lot.code}`} className="rounded-lg border-2 border-line p-4">
      <h3 className="text-xl font-bold">
        Adjust lot {lot.code} · {stockText(lot.onHandG)} on hand
      </h3>
      <form noValidate onSubmit={submit} className="mt-3 grid grid-cols-1 gap-4 md:grid-cols-3">
        {errors.root && (
          <p role="alert" className="font-semibold text-over md:col-span-3">
            {errors.root.message}
          </p>
        )}
        <TextField
          label="Change"
          unit="g"
          hint="Negative for a spill, positive for a count that found more"
          inputMode="decimal"
          error={errors.deltaG?.message}
          {...form.register('deltaG', { setValueAs: asNumber })}
        />
        <TextField label="Reason" error={errors.reason?.message} {...form.register('reason')} />
        <div className="flex items-start gap-3 pt-8">
          <button type="submit" className={primary} disabled={isSubmitting}>
            Save adjustment
          </button>
          <button type="button" className={secondary} onClick={onDone}>
            Close
          </button>
        </div>
      </form>
      {history.data && history.data.length > 0 && (
        <ul aria-label={`History of lot ${lot.code}`} className="mt-4 flex flex-col gap-1">
          {history.data.map((m) => (
            <li key={m.id}>
              {m.at.slice(0, 16).replace('T', ' ')} ·{' '}
              <span className="font-semibold tabular-nums">
                {m.deltaG > 0 ? '+' : ''}
                {stockText(m.deltaG)}
              </span>{' '}
              · {m.kind === 'batch' ? `batch ${m.batchId}` : `${m.reason} (${m.by?.name ?? '?'})`}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
