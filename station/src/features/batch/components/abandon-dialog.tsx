import { zodResolver } from '@hookform/resolvers/zod';
import { Dialog, DialogPanel, DialogTitle } from '@headlessui/react';
import { abandonBatchSchema, type Batch } from '@tareline/protocol';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Field } from '../../../components/form/field';
import { useAbandonBatch } from '../api/abandon-batch';
import { dangerButton, secondaryButton } from './buttons';
import { HubError } from './hub-error';

/** Reasons a gloved hand can give with one press; anything else can be typed. */
const QUICK_REASONS = [
  'Cup tipped over',
  'Wrong material poured',
  'Scale problem',
  'Not needed any more',
];

/** Abandon the batch: the hub keeps it as abandoned, with what was weighed and the reason. */
export function AbandonDialog({
  open,
  batchId,
  onClose,
  onAbandoned,
}: {
  open: boolean;
  batchId: number;
  onClose: () => void;
  onAbandoned: (batch: Batch) => void;
}) {
  const abandon = useAbandonBatch({ onSuccess: onAbandoned });
  const {
    register,
    handleSubmit,
    setValue,
    formState: { errors },
  } = useForm<z.input<typeof abandonBatchSchema>>({
    resolver: zodResolver(abandonBatchSchema),
    defaultValues: { reason: '' },
  });
  const error = errors.reason?.message;

  return (
    <Dialog open={open} onClose={onClose} className="relative z-50">
      <div className="fixed inset-0 bg-ink/50" aria-hidden="true" />
      <div className="fixed inset-0 flex items-center justify-center p-6">
        <DialogPanel className="w-full max-w-2xl rounded-2xl bg-panel p-8 shadow-xl">
          <DialogTitle className="text-3xl font-bold">Abandon batch {batchId}?</DialogTitle>
          <p className="mt-2 text-xl">
            The batch is kept as abandoned, with what was weighed so far. Say why.
          </p>
          <form
            noValidate
            className="mt-4 flex flex-col gap-4"
            onSubmit={handleSubmit((v) => abandon.mutate({ batchId, reason: v.reason }))}
          >
            <div className="flex flex-wrap gap-3">
              {QUICK_REASONS.map((r) => (
                <button
                  key={r}
                  type="button"
                  onClick={() => setValue('reason', r, { shouldValidate: true })}
                  className="min-h-14 rounded-xl bg-paper px-4 text-xl ring-2 ring-line ring-inset"
                >
                  {r}
                </button>
              ))}
            </div>
            <Field label="Reason" size="bench" error={error}>
              {(control) => (
                <textarea
                  rows={2}
                  {...control}
                  className="rounded-xl border-2 border-line bg-paper p-3 text-2xl focus:border-steel focus:outline-none aria-[invalid=true]:border-over"
                  {...register('reason')}
                />
              )}
            </Field>
            <HubError error={abandon.error} what="Not abandoned" />
            <div className="flex flex-wrap justify-end gap-4">
              <button type="button" onClick={onClose} className={secondaryButton}>
                Keep weighing
              </button>
              <button type="submit" disabled={abandon.isPending} className={dangerButton}>
                Abandon batch
              </button>
            </div>
          </form>
        </DialogPanel>
      </div>
    </Dialog>
  );
}
