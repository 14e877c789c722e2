import { createBrowserRouter, redirect, type LoaderFunctionArgs } from 'react-router-dom';
import type { QueryClient } from '@tanstack/react-query';
import type { Role } from '@shared/schemas/enums';
import { sessionQueryOptions } from '@/features/auth/api/get-session';
import { AppLayout, NAV } from '@/components/layouts/app-layout';
import { FIELD_ROLES } from '@/features/visits/utils/roles';
import { RouteError } from './routes/route-error';

/**
 * Signed-out users go to sign-in; a role that may not use a page (its NAV entry's roles, or `allowed`
 * for pages outside the navigation) is sent to the map.
 */
function guard(queryClient: QueryClient, path?: string, allowed?: readonly Role[]) {
  return async ({ request }: LoaderFunctionArgs) => {
    const session = await queryClient.ensureQueryData(sessionQueryOptions());
    if (!session.user) {
      const url = new URL(request.url);
      throw redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
    }
    const roles: readonly Role[] | undefined = allowed ?? NAV.find((n) => n.to === path)?.roles;
    if (roles && !roles.includes(session.user.role)) throw redirect('/');
    return null;
  };
}

export function makeRouter(queryClient: QueryClient) {
  return createBrowserRouter([
    {
      path: '/sign-in',
      errorElement: <RouteError />,
      loader: async () => {
        const session = await queryClient.ensureQueryData(sessionQueryOptions());
        return session.user ? redirect('/') : null;
      },
      lazy: () => import('./routes/sign-in').then((m) => ({ Component: m.SignInRoute })),
    },
    {
      element: <AppLayout />,
      errorElement: <RouteError />,
      loader: guard(queryClient),
      children: [
        { index: true, lazy: () => import('./routes/map').then((m) => ({ Component: m.MapRoute })) },
        { path: 'homes', loader: guard(queryClient, '/homes'), lazy: () => import('./routes/homes').then((m) => ({ Component: m.HomesRoute })) },
        { path: 'homes/:homeId/visit', loader: guard(queryClient, undefined, FIELD_ROLES), lazy: () => import('./routes/record-visit').then((m) => ({ Component: m.RecordVisitRoute })) },
        { path: 'homes/:homeId/test', loader: guard(queryClient, undefined, FIELD_ROLES), lazy: () => import('./routes/record-test').then((m) => ({ Component: m.RecordTestRoute })) },
        { path: 'communities', loader: guard(queryClient, '/communities'), lazy: () => import('./routes/communities').then((m) => ({ Component: m.CommunitiesRoute })) },
        { path: 'builders', loader: guard(queryClient, '/builders'), lazy: () => import('./routes/builders').then((m) => ({ Component: m.BuildersRoute })) },
        { path: 'compare-builders', loader: guard(queryClient, '/compare-builders'), lazy: () => import('./routes/compare-builders').then((m) => ({ Component: m.CompareBuildersRoute })) },
        { path: 'plan-sample', loader: guard(queryClient, '/plan-sample'), lazy: () => import('./routes/plan-sample').then((m) => ({ Component: m.PlanSampleRoute })) },
        { path: 'quotes', loader: guard(queryClient, '/quotes'), lazy: () => import('./routes/quotes').then((m) => ({ Component: m.QuotesRoute })) },
        { path: 'imports', loader: guard(queryClient, '/imports'), lazy: () => import('./routes/imports').then((m) => ({ Component: m.ImportsRoute })) },
        { path: 'settings', loader: guard(queryClient, '/settings'), lazy: () => import('./routes/settings').then((m) => ({ Component: m.SettingsRoute })) },
      ],
    },
  ]);
}
