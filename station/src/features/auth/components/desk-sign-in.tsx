import { zodResolver } from '@hookform/resolvers/zod';
import { loginRequestSchema, type LoginRequest } from '@tareline/protocol';
import { useMutation } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { useLocation, useNavigate } from 'react-router-dom';
import { ApiRequestError } from '../../../lib/api-client';
import { setSession } from '../../../lib/auth';
import { deskSignIn } from '../api/sign-in';
import { TextField } from '../../../components/form/field';

/** Desk sign-in with e-mail and password; returns to the page the visitor came from. */
export function DeskSignIn() {
  const navigate = useNavigate();
  const location = useLocation();
  const from = (location.state as { from?: string } | null)?.from ?? '/review';
  const form = useForm<LoginRequest>({
    resolver: zodResolver(loginRequestSchema),
    defaultValues: { email: '', password: '' },
  });
  const signIn = useMutation({
    mutationFn: deskSignIn,
    onSuccess: async (session) => {
      setSession(session);
      await navigate(from, { replace: true });
    },
  });
  const errors = form.formState.errors;
  return (
    <section aria-labelledby="desk-sign-in-title" className="mx-auto max-w-md">
      <h1 id="desk-sign-in-title" className="text-3xl font-bold">
        Sign in
      </h1>
      <p className="mt-2 text-muted">Leads and admins sign in here with e-mail and password.</p>
      <form
        noValidate
        className="mt-6 flex flex-col gap-4"
        onSubmit={form.handleSubmit((values) => signIn.mutate(values))}
      >
        {signIn.error && (
          <p role="alert" className="rounded-lg bg-over px-4 py-3 font-semibold text-paper">
            {signIn.error instanceof ApiRequestError ? signIn.error.message : 'Sign-in failed'}
          </p>
        )}
        <TextField
          label="E-mail"
          error={errors.email?.message}
          type="email"
          autoComplete="username"
          {...form.register('email')}
        />
        <TextField
          label="Password"
          error={errors.password?.message}
          type="password"
          autoComplete="current-password"
          {...form.register('password')}
        />
        <button
          type="submit"
          disabled={signIn.isPending}
          className="min-h-12 rounded-lg bg-steel px-6 text-lg font-semibold text-paper"
        >
          {signIn.isPending ? 'Signing in…' : 'Sign in'}
        </button>
      </form>
    </section>
  );
}
