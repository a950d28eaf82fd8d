import type { Role } from '@tareline/protocol';
import type { ReactNode } from 'react';
import { Link, Navigate, useLocation } from 'react-router-dom';
import { hasRole, useSession } from '../../../lib/auth';

/**
 * Route wrapper for desk pages: a signed-out visitor goes to `/login` and comes back afterwards;
 * a signed-in person without the role is told so.
 */
export function RequireRole({ roles, children }: { roles: readonly Role[]; children: ReactNode }) {
  const session = useSession();
  const location = useLocation();
  if (!session) {
    return (
      <Navigate to="/login" replace state={{ from: `${location.pathname}${location.search}` }} />
    );
  }
  if (!hasRole(session, roles)) {
    return (
      <section className="mx-auto max-w-3xl">
        <h1 className="text-3xl font-bold">Not for your role</h1>
        <p className="mt-2 text-lg">
          This page is for {roles.join(' or ')} roles; you are signed in as {session.user.name} (
          {session.user.role}).{' '}
          <Link className="underline" to="/login" state={{ from: location.pathname }}>
            Sign in as someone else
          </Link>
        </p>
      </section>
    );
  }
  return <>{children}</>;
}
