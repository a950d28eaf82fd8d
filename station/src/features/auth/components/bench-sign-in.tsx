import { isPinNeeded } from '@tareline/protocol';
import { useMutation } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { ApiRequestError } from '../../../lib/api-client';
import { setSession } from '../../../lib/auth';
import { badgeSignIn } from '../api/sign-in';
import { useCodeScanner } from '../../../hooks/use-code-scanner';
import { PinPad } from './pin-pad';

/**
 * Bench sign-in: scan a badge anywhere on the screen, or type its code; then the PIN on the pad
 * when the hub asks for one. The hub asks the same for an unknown badge, so the screen never
 * tells whether a badge exists.
 */
export function BenchSignIn({ benchId }: { benchId: string }) {
  // The scanned code waits here, in memory only, while the PIN is entered.
  const [badge, setBadge] = useState<string | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [typed, setTyped] = useState('');

  const signIn = useMutation({
    mutationFn: (vars: { badge: string; pin?: string }) => badgeSignIn({ benchId, ...vars }),
    onSuccess: (session) => {
      setBadge(null);
      setSession(session);
    },
    onError: (error, vars) => {
      if (error instanceof ApiRequestError && error.status === 401 && isPinNeeded(error.body)) {
        setMessage(null);
        setBadge(vars.badge);
        return;
      }
      setBadge(null);
      setMessage(
        error instanceof ApiRequestError ? error.body.message : 'Sign-in failed: try again',
      );
    },
  });

  const start = (code: string) => {
    if (signIn.isPending) return;
    setMessage(null);
    setTyped('');
    signIn.mutate({ badge: code });
  };

  useCodeScanner(start, { enabled: badge === null });

  const onTyped = (event: FormEvent) => {
    event.preventDefault();
    if (typed.trim()) start(typed.trim());
  };

  return (
    <section
      aria-labelledby="bench-sign-in-title"
      className="mx-auto flex max-w-xl flex-col items-center gap-6 py-6 text-center"
    >
      <h1 id="bench-sign-in-title" className="text-4xl font-bold">
        {badge === null ? 'Scan your badge' : 'Enter your PIN'}
      </h1>
      {message && (
        <p role="alert" className="rounded-lg bg-over px-4 py-3 text-xl font-semibold text-paper">
          {message}
        </p>
      )}
      {badge === null ? (
        <>
          <p className="text-xl text-muted">
            Hold your badge to the reader. No reader? Type the code below.
          </p>
          {signIn.isPending && <p className="text-xl">Checking…</p>}
          <form onSubmit={onTyped} className="flex w-full max-w-md gap-3">
            <label htmlFor="badge-code" className="sr-only">
              Badge code
            </label>
            <input
              id="badge-code"
              autoComplete="off"
              placeholder="Badge code"
              value={typed}
              onChange={(e) => setTyped(e.target.value)}
              className="min-h-14 flex-1 rounded-xl border-2 border-line bg-panel px-4 text-2xl"
            />
            <button
              type="submit"
              disabled={signIn.isPending}
              className="min-h-14 rounded-xl bg-steel px-6 text-xl font-semibold text-paper"
            >
              Sign in
            </button>
          </form>
        </>
      ) : (
        <PinPad
          busy={signIn.isPending}
          onSubmit={(pin) => signIn.mutate({ badge, pin })}
          onCancel={() => {
            setBadge(null);
            setMessage(null);
          }}
        />
      )}
      <p className="text-sm text-muted">This screen is {benchId}.</p>
    </section>
  );
}
