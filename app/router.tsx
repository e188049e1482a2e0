import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import type { Action } from '#shared/policy.ts';
import { AppShell } from './components/layout/app-shell.tsx';
import { NotFoundPage } from './components/layout/not-found-page.tsx';
import { RequireAction } from './components/layout/require-action.tsx';
import { RouteErrorPage, RouteErrorPanel } from './components/layout/route-error-page.tsx';
import { Loading } from './components/ui/loading.tsx';
import { RequireSeat, RequireSession } from './features/session/components/require-session.tsx';
import { NoAccessPage } from './features/session/routes/no-access-page.tsx';
import { SignInPage } from './features/session/routes/sign-in-page.tsx';
import { paths } from './lib/paths.ts';

/** A page only the acting seat's role may open; the policy action is named once, here. */
function guarded(path: string, action: Action, lazy: NonNullable<RouteObject['lazy']>): RouteObject {
  return { path, element: <RequireAction action={action} />, children: [{ index: true, lazy }] };
}

const routes: RouteObject[] = [
  {
    errorElement: <RouteErrorPage />,
    hydrateFallbackElement: (
      <main className="mx-auto max-w-xl p-8">
        <Loading label="Opening Plinth…" rows={2} />
      </main>
    ),
    children: [
      // Public pages load with the app: they are the first thing a signed-out person sees.
      { path: paths.signIn.pattern, Component: SignInPage },
      {
        Component: RequireSession,
        children: [
          { path: paths.noAccess.pattern, Component: NoAccessPage },
          {
            Component: RequireSeat,
            children: [
              {
                Component: AppShell,
                children: [
                  {
                    errorElement: <RouteErrorPanel />,
                    children: [
                      {
                        index: true,
                        lazy: async () => {
                          const m = await import('./features/home/routes/home-page.tsx');
                          return { Component: m.HomePage, loader: m.homeLoader };
                        },
                      },
                      guarded(paths.users.pattern, 'users.manage', async () => {
                        const m = await import('./features/admin/routes/users-page.tsx');
                        return { Component: m.UsersPage, loader: m.usersLoader };
                      }),
                      guarded(paths.productions.pattern, 'productions.manage', async () => {
                        const m = await import('./features/admin/routes/productions-page.tsx');
                        return { Component: m.ProductionsPage, loader: m.productionsLoader };
                      }),
                      guarded(paths.production.pattern, 'productions.manage', async () => {
                        const m = await import('./features/admin/routes/production-detail-page.tsx');
                        return { Component: m.ProductionDetailPage, loader: m.productionDetailLoader };
                      }),
                      guarded(paths.outbox.pattern, 'outbox.read', async () => {
                        const m = await import('./features/admin/routes/outbox-page.tsx');
                        return { Component: m.OutboxPage, loader: m.outboxLoader };
                      }),
                      guarded(paths.audit.pattern, 'audit.read', async () => {
                        const m = await import('./features/admin/routes/audit-page.tsx');
                        return { Component: m.AuditPage, loader: m.auditLoader };
                      }),
                      { path: '*', Component: NotFoundPage },
                    ],
                  },
                ],
              },
            ],
          },
        ],
      },
    ],
  },
];

export const router = createBrowserRouter(routes);
