import { zodResolver } from '@hookform/resolvers/zod';
import {
  createDispositionSchema,
  dispositionDecisionSchema,
  type Batch,
  type CreateDisposition,
} from '@tareline/protocol';
import { useForm } from 'react-hook-form';
import { SelectField, TextField } from '../../../components/form/field';
import { hasRole, useSession } from '../../../lib/auth';
import { useCreateDisposition } from '../api/create-disposition';
import { dateTimeText } from '../../../lib/dates';
import { DECISION_SHOWN } from '../utils';

/**
 * What was decided about a batch, oldest first, and (for leads, on a saved batch) the form to
 * decide again. A decision is signed with the lead's password; none is ever edited.
 */
export function DispositionPanel({ batch }: { batch: Batch }) {
  const session = useSession();
  const history = batch.dispositions ?? [];
  const mayDecide = hasRole(session, ['lead', 'admin']) && batch.state === 'saved';
  return (
    <section aria-labelledby="decision-title" className="space-y-3">
      <h2 id="decision-title" className="text-xl font-semibold">
        Decision
      </h2>
      {history.length === 0 ? (
        <p className="text-lg">
          {batch.state === 'saved' ? 'Not decided yet.' : 'Only a saved batch is decided on.'}
        </p>
      ) : (
        <ol aria-label="Decisions" className="space-y-1 text-lg">
          {history.map((d) => (
            <li key={`${d.at}-${d.decision}`}>
              <time dateTime={d.at} className="mr-3 text-muted">
                {dateTimeText(d.at)}
              </time>
              <strong>{DECISION_SHOWN[d.decision]}</strong> by {d.by.name}
              {d.reason && <>: {d.reason}</>}
            </li>
          ))}
        </ol>
      )}
      {mayDecide && <DispositionForm batchId={batch.id} />}
    </section>
  );
}

function DispositionForm({ batchId }: { batchId: number }) {
  const form = useForm<CreateDisposition>({
    resolver: zodResolver(createDispositionSchema),
    defaultValues: { decision: 'hold', reason: '', password: '' },
  });
  const decide = useCreateDisposition(batchId);
  const errors = form.formState.errors;
  return (
    <form
      noValidate
      aria-label="Decide"
      className="flex max-w-xl flex-col gap-3"
      onSubmit={form.handleSubmit((values) =>
        decide.mutate(values, { onSuccess: () => form.reset({ ...values, password: '' }) }),
      )}
    >
      {decide.error && (
        <p role="alert" className="rounded-lg bg-over px-4 py-3 font-semibold text-paper">
          {decide.error.message}
        </p>
      )}
      <SelectField
        label="Decision"
        size="form"
        error={errors.decision?.message}
        options={dispositionDecisionSchema.options.map((d) => ({
          value: d,
          label: DECISION_SHOWN[d],
        }))}
        {...form.register('decision')}
      />
      <TextField
        label="Reason"
        hint="Needed to hold or scrap"
        error={errors.reason?.message}
        {...form.register('reason')}
      />
      <TextField
        label="Your password"
        hint="Signs the decision in your name"
        type="password"
        autoComplete="current-password"
        error={errors.password?.message}
        {...form.register('password')}
      />
      <button
        type="submit"
        disabled={decide.isPending}
        className="min-h-12 rounded-lg bg-steel px-6 text-lg font-semibold text-paper"
      >
        {decide.isPending ? 'Signing…' : 'Sign decision'}
      </button>
    </form>
  );
}
