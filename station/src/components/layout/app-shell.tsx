import { Suspense, type ReactNode } from 'react';
import { NavLink, Outlet } from 'react-router-dom';
import { useSession } from '../../lib/auth';
import { useSessionCheck } from '../../lib/session-check';
import { useSignOut } from '../../lib/sign-out';
import { ThemeToggle } from './theme-toggle';

const areas = [
  { to: '/bench', label: 'Bench' },
  { to: '/review', label: 'Review' },
  { to: '/plan', label: 'Pour planner' },
  { to: '/alerts', label: 'Alerts' },
];

/**
 * Header with the areas of the product, the hub indicator and the theme; pages render below it.
 * The indicator comes from the app (a feature of its own), so the shell imports no feature.
 */
export function AppShell({ hubStatus }: { hubStatus: ReactNode }) {
  const session = useSession();
  const signOut = useSignOut();
  useSessionCheck();
  return (
    <div className="flex min-h-screen flex-col">
      <header
        data-print="hide"
        className="flex items-center justify-between gap-6 bg-bar px-6 py-3 text-barink"
      >
        <div className="flex items-center gap-8">
          <span className="text-2xl font-bold tracking-wide">Tareline</span>
          <nav aria-label="Areas" className="flex gap-2">
            {areas.map((area) => (
              <NavLink
                key={area.to}
                to={area.to}
                className={({ isActive }) =>
                  `inline-flex min-h-14 items-center rounded-md px-4 text-lg font-semibold ${isActive ? 'bg-brass text-ink' : 'hover:bg-white/10'}`
                }
              >
                {area.label}
              </NavLink>
            ))}
          </nav>
        </div>
        <div className="flex items-center gap-6">
          {session && (
            <div className="flex items-center gap-3" aria-label="Signed in">
              <span className="text-lg font-semibold">
                {session.user.name}{' '}
                <span className="font-normal opacity-80">({session.user.role})</span>
              </span>
              {/* At a bench, "Switch person" on the bench bar does this. */}
              {!session.bench && (
                <button
                  type="button"
                  onClick={() => void signOut()}
                  className="min-h-14 rounded-md px-3 font-semibold hover:bg-white/10"
                >
                  Sign out
                </button>
              )}
            </div>
          )}
          {hubStatus}
          <ThemeToggle />
        </div>
      </header>
      <main className="flex-1 p-6">
        {/* Pages other than the bench load on demand; this shows while one arrives. */}
        <Suspense fallback={<p className="text-xl text-muted">Loading…</p>}>
          <Outlet />
        </Suspense>
      </main>
    </div>
  );
}
