import { useEffect } from 'react';
import { NavLink, Outlet, useNavigate } from 'react-router-dom';
import { useQueryClient } from '@tanstack/react-query';
import type { Role } from '@shared/schemas/enums';
import { ROLE_LABELS } from '@shared/schemas/enums';
import { useSession } from '@/features/auth/api/get-session';
import { useSignOut } from '@/features/auth/api/sign-out';
import { onOutboxSent, startOutbox } from '@/lib/outbox';
import { bumpHomeTilesVersion } from '@/lib/home-tiles-version';
import { OutboxStatus } from './outbox-status';

/** Navigation named after what people do there; each role sees only what it can use. */
export const NAV: { to: string; label: string; roles: readonly Role[] }[] = [
  { to: '/', label: 'Map', roles: ['admin', 'manager', 'estimator', 'technician', 'sales'] },
  { to: '/homes', label: 'Homes', roles: ['admin', 'manager', 'estimator', 'technician', 'sales'] },
  { to: '/communities', label: 'Communities', roles: ['admin', 'manager', 'estimator', 'sales'] },
  { to: '/builders', label: 'Builders', roles: ['admin', 'manager', 'estimator'] },
  { to: '/imports', label: 'Import addresses', roles: ['admin', 'manager', 'estimator'] },
  { to: '/compare-builders', label: 'Compare builders', roles: ['admin', 'manager', 'estimator'] },
  { to: '/plan-sample', label: 'Plan a sample', roles: ['admin', 'manager', 'estimator'] },
  { to: '/quotes', label: 'Quote a community', roles: ['admin', 'manager', 'estimator'] },
  { to: '/settings', label: 'Settings', roles: ['admin'] },
];

export function AppLayout() {
  const { data } = useSession();
  const signOut = useSignOut();
  const navigate = useNavigate();
  const user = data?.user;
  useOutboxSender(user?.id ?? null);
  if (!user) return null;
  const items = NAV.filter((n) => n.roles.includes(user.role));
  return (
    <div className="flex h-full flex-col">
      <header className="flex flex-wrap items-center gap-x-4 gap-y-1 border-b border-rule bg-panel px-3 py-2">
        <span className="flex items-center gap-2 font-semibold text-accent">
          <img src="/favicon.svg" alt="" className="h-6 w-6" /> Tractwise
        </span>
        <nav aria-label="Main" className="order-3 flex w-full gap-1 overflow-x-auto sm:order-none sm:w-auto">
          {items.map((n) => (
            <NavLink
              key={n.to}
              to={n.to}
              end={n.to === '/'}
              className={({ isActive }) =>
                `flex min-h-11 items-center whitespace-nowrap rounded-md px-3 text-sm ${isActive ? 'bg-accent text-white' : 'text-ink hover:bg-paper'}`
              }
            >
              {n.label}
            </NavLink>
          ))}
        </nav>
        <div className="ml-auto flex items-center gap-3 text-sm">
          <OutboxStatus />
          <span className="hidden text-muted sm:inline" data-testid="signed-in-as">
            {user.name} · {ROLE_LABELS[user.role]} · {user.companyName}
          </span>
          <button
            className="min-h-11 rounded-md border border-rule px-3 hover:border-accent"
            onClick={() => signOut.mutate(undefined, { onSettled: () => navigate('/sign-in') })}
          >
            Sign out
          </button>
        </div>
      </header>
      <main className="min-h-0 flex-1 overflow-auto">
        <Outlet />
      </main>
    </div>
  );
}

/**
 * Sends the signed-in user's waiting records (visits, tests, photos) whenever it can, and refreshes what
 * they change: the home queries and the map's home tiles.
 */
function useOutboxSender(userId: string | null) {
  const queryClient = useQueryClient();
  useEffect(() => (userId ? startOutbox(userId) : undefined), [userId]);
  useEffect(() => {
    const off = onOutboxSent(() => {
      void queryClient.invalidateQueries({ queryKey: ['homes'] });
      bumpHomeTilesVersion();
    });
    return () => void off();
  }, [queryClient]);
}
