import { zodResolver } from '@hookform/resolvers/zod';
import { loginRequestSchema, type LoginRequest } from '@tareline/protocol';
import { useForm } from 'react-hook-form';
import { TextField } from '../../../components/form/field';
import { primaryButton } from './buttons';

/**
 * A lead, at the bench, lets a batch start that the scale is too coarse for: their own e-mail
 * and password, checked by the hub (a wrong one counts like a wrong sign-in).
 */
export function LeadOverride({
  busy,
  onOverride,
}: {
  busy: boolean;
  onOverride: (override: LoginRequest) => void;
}) {
  const form = useForm<LoginRequest>({ resolver: zodResolver(loginRequestSchema) });
  const err = form.formState.errors;
  return (
    <form
      noValidate
      aria-label="A lead allows this batch"
      onSubmit={form.handleSubmit((v) => onOverride(v))}
      className="flex flex-col gap-4 rounded-2xl bg-panel p-6 ring-1 ring-line"
    >
      <p className="text-2xl font-semibold">A lead allows this batch on this scale</p>
      <TextField
        label="Lead's e-mail"
        type="email"
        autoComplete="off"
        error={err.email?.message}
        {...form.register('email')}
      />
      <TextField
        label="Lead's password"
        type="password"
        autoComplete="off"
        error={err.password?.message}
        {...form.register('password')}
      />
      <div>
        <button type="submit" disabled={busy} className={primaryButton}>
          Start with the lead&apos;s leave
        </button>
      </div>
    </form>
  );
}
