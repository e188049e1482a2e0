import { createBrowserRouter, redirect, type RouteObject } from 'react-router-dom';
import type { Action } from '#shared/policy.ts';
import { AppShell } from './components/layout/app-shell.tsx';
import { NotFoundPage } from './components/layout/not-found-page.tsx';
import { RequireAction } from './components/layout/require-action.tsx';
import { RouteErrorPage, RouteErrorPanel } from './components/layout/route-error-page.tsx';
import { Loading } from './components/ui/loading.tsx';
import { RequireSeat, RequireSession } from './features/session/components/require-session.tsx';
import { NoAccessPage } from './features/session/routes/no-access-page.tsx';
import { SignInPage } from './features/session/routes/sign-in-page.tsx';
import { PERFORMER_PAGE_ACTIONS, VERIFY_ACTIONS } from './lib/session/seat.ts';
import { paths } from './lib/paths.ts';

/** A page only the acting seat's role may open; the policy action is named once, here. */
function guarded(path: string, action: Action | readonly Action[], lazy: NonNullable<RouteObject['lazy']>): RouteObject {
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
      // The lent tablet and the performer's own links: outside the session, the shell and its navigation.
      {
        path: paths.tablet.pattern,
        lazy: async () => ({ Component: (await import('./features/consents/routes/tablet-page.tsx')).TabletPage }),
      },
      {
        path: paths.signLink.pattern,
        lazy: async () => ({ Component: (await import('./features/consents/routes/sign-link-page.tsx')).SignLinkPage }),
      },
      {
        path: paths.signBundle.pattern,
        lazy: async () => ({ Component: (await import('./features/consents/routes/sign-bundle-page.tsx')).SignBundlePage }),
      },
      {
        path: paths.withdrawRequest.pattern,
        lazy: async () => ({ Component: (await import('./features/consents/routes/withdraw-request-page.tsx')).WithdrawRequestPage }),
      },
      {
        path: paths.withdrawLink.pattern,
        lazy: async () => ({ Component: (await import('./features/consents/routes/withdraw-link-page.tsx')).WithdrawLinkPage }),
      },
      {
        path: paths.confirmEmail.pattern,
        lazy: async () => ({ Component: (await import('./features/identity/routes/confirm-email-page.tsx')).ConfirmEmailPage }),
      },
      {
        Component: RequireSession,
        children: [
          { path: paths.noAccess.pattern, Component: NoAccessPage },
          // Signed in, but perhaps with no role yet: accepting is what gives the performer one.
          {
            path: paths.join.pattern,
            lazy: async () => ({ Component: (await import('./features/identity/routes/join-page.tsx')).JoinPage }),
          },
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
                      guarded(paths.performers.pattern, 'performers.view', async () => {
                        const m = await import('./features/performers/routes/performers-page.tsx');
                        return { Component: m.PerformersPage, loader: m.performersLoader };
                      }),
                      guarded(paths.newPerformer.pattern, 'performers.manage', async () => {
                        const m = await import('./features/performers/routes/new-performer-page.tsx');
                        return { Component: m.NewPerformerPage };
                      }),
                      guarded(paths.importPerformers.pattern, 'performers.manage', async () => {
                        const m = await import('./features/performers/routes/import-page.tsx');
                        return { Component: m.ImportPage };
                      }),
                      guarded(paths.performer.pattern, PERFORMER_PAGE_ACTIONS, async () => {
                        const m = await import('./features/performers/routes/performer-page.tsx');
                        return { Component: m.PerformerPage, loader: m.performerLoader };
                      }),
                      guarded(paths.editPerformer.pattern, 'performers.manage', async () => {
                        const m = await import('./features/performers/routes/edit-performer-page.tsx');
                        return { Component: m.EditPerformerPage, loader: m.editPerformerLoader };
                      }),
                      guarded(paths.consentWorklist.pattern, 'consents.request', async () => {
                        const m = await import('./features/consents/routes/worklist-page.tsx');
                        return { Component: m.WorklistPage };
                      }),
                      guarded(paths.consent.pattern, PERFORMER_PAGE_ACTIONS, async () => {
                        const m = await import('./features/consents/routes/consent-page.tsx');
                        return { Component: m.ConsentPage, loader: m.consentLoader };
                      }),
                      guarded(paths.bookings.pattern, 'performers.view', async () => {
                        const m = await import('./features/bookings/routes/bookings-page.tsx');
                        return { Component: m.BookingsPage, loader: m.bookingsLoader };
                      }),
                      guarded(paths.catalogue.pattern, 'catalogue.read', async () => {
                        const m = await import('./features/catalogue/routes/catalogue-page.tsx');
                        return { Component: m.CataloguePage, loader: m.catalogueLoader };
                      }),
                      guarded(paths.newProduct.pattern, 'catalogue.manage', async () => {
                        const m = await import('./features/catalogue/routes/new-product-page.tsx');
                        return { Component: m.NewProductPage };
                      }),
                      guarded(paths.product.pattern, 'catalogue.read', async () => {
                        const m = await import('./features/catalogue/routes/product-page.tsx');
                        return { Component: m.ProductPage, loader: m.productLoader };
                      }),
                      guarded(paths.editProduct.pattern, 'catalogue.manage', async () => {
                        const m = await import('./features/catalogue/routes/edit-product-page.tsx');
                        return { Component: m.EditProductPage, loader: m.editProductLoader };
                      }),
                      guarded(paths.ingredients.pattern, 'catalogue.read', async () => {
                        const m = await import('./features/catalogue/routes/ingredients-page.tsx');
                        return { Component: m.IngredientsPage, loader: m.ingredientsLoader };
                      }),
                      guarded(paths.protocols.pattern, 'catalogue.read', async () => {
                        const m = await import('./features/protocols/routes/protocols-page.tsx');
                        return { Component: m.ProtocolsPage, loader: m.protocolsLoader };
                      }),
                      guarded(paths.protocol.pattern, 'catalogue.read', async () => {
                        const m = await import('./features/protocols/routes/protocol-page.tsx');
                        return { Component: m.ProtocolPage, loader: m.protocolLoader };
                      }),
                      guarded(paths.archive.pattern, 'archive.view', async () => {
                        const m = await import('./features/archive/routes/find-page.tsx');
                        return { Component: m.FindPage, loader: m.findLoader };
                      }),
                      guarded(paths.newCast.pattern, 'casts.manage', async () => {
                        const m = await import('./features/archive/routes/cast-form-pages.tsx');
                        return { Component: m.NewCastPage };
                      }),
                      guarded(paths.cast.pattern, 'archive.view', async () => {
                        const m = await import('./features/archive/routes/cast-page.tsx');
                        return { Component: m.CastPage, loader: m.castLoader };
                      }),
                      guarded(paths.editCast.pattern, 'casts.manage', async () => {
                        const m = await import('./features/archive/routes/cast-form-pages.tsx');
                        return { Component: m.EditCastPage };
                      }),
                      guarded(paths.places.pattern, 'archive.view', async () => {
                        const m = await import('./features/archive/routes/places-page.tsx');
                        return { Component: m.PlacesPage, loader: m.placesLoader };
                      }),
                      guarded(paths.place.pattern, 'archive.view', async () => {
                        const m = await import('./features/archive/routes/place-page.tsx');
                        return { Component: m.PlacePage, loader: m.placeLoader };
                      }),
                      guarded(paths.label.pattern, 'archive.view', async () => {
                        const m = await import('./features/archive/routes/label-page.tsx');
                        return { Component: m.LabelPage };
                      }),
                      guarded(paths.retention.pattern, 'archive.view', async () => {
                        const m = await import('./features/archive/routes/retention-page.tsx');
                        return { Component: m.RetentionPage, loader: m.retentionLoader };
                      }),
                      // New before :id, so /patch-tests/new is never read as a test id.
                      guarded(paths.bookPatchTest.pattern, 'patchtests.book', async () => {
                        const m = await import('./features/patch-tests/routes/book-test-page.tsx');
                        return { Component: m.BookTestPage };
                      }),
                      guarded(paths.patchTest.pattern, ['patchtests.read', 'performer.self'], async () => {
                        const m = await import('./features/patch-tests/routes/patch-test-page.tsx');
                        return { Component: m.PatchTestPage, loader: m.patchTestLoader };
                      }),
                      guarded(paths.check.pattern, 'clearance.check', async () => ({ Component: (await import('./features/checks/routes/check-page.tsx')).CheckPage })),
                      guarded(paths.kits.pattern, 'clearance.check', async () => ({ Component: (await import('./features/checks/routes/kits-page.tsx')).KitsPage })),
                      guarded(paths.application.pattern, 'applications.read', async () => ({ Component: (await import('./features/checks/routes/application-page.tsx')).ApplicationPage })),
                      guarded(paths.leadRequest.pattern, 'medical.write', async () => ({ Component: (await import('./features/checks/routes/lead-pages.tsx')).LeadRequestPage })),
                      guarded(paths.incident.pattern, 'medical.read', async () => ({ Component: (await import('./features/checks/routes/lead-pages.tsx')).IncidentPage })),
                      guarded(paths.lotTrace.pattern, 'lots.trace', async () => ({ Component: (await import('./features/checks/routes/lot-trace-page.tsx')).LotTracePage })),
                      guarded(paths.builds.pattern, 'builds.read', async () => {
                        const m = await import('./features/builds/routes/builds-page.tsx');
                        return { Component: m.BuildsPage, loader: m.buildsLoader };
                      }),
                      guarded(paths.newBuild.pattern, 'builds.manage', async () => {
                        const m = await import('./features/builds/routes/build-form-pages.tsx');
                        return { Component: m.NewBuildPage };
                      }),
                      guarded(paths.build.pattern, 'builds.read', async () => {
                        const m = await import('./features/builds/routes/build-page.tsx');
                        return { Component: m.BuildPage, loader: m.buildLoader };
                      }),
                      guarded(paths.editBuild.pattern, 'builds.manage', async () => {
                        const m = await import('./features/builds/routes/build-form-pages.tsx');
                        return { Component: m.EditBuildPage };
                      }),
                      guarded(paths.mixCalculator.pattern, 'builds.read', async () => {
                        const m = await import('./features/builds/routes/mix-calculator-page.tsx');
                        return { Component: m.MixCalculatorPage, loader: m.mixCalculatorLoader };
                      }),
                      guarded(paths.moldBoxCalculator.pattern, 'builds.read', async () => {
                        const m = await import('./features/builds/routes/mold-box-calculator-page.tsx');
                        return { Component: m.MoldBoxCalculatorPage };
                      }),
                      guarded(paths.consentForms.pattern, 'templates.manage', async () => {
                        const m = await import('./features/consent-forms/routes/consent-forms-page.tsx');
                        return { Component: m.ConsentFormsPage, loader: m.consentFormsLoader };
                      }),
                      guarded(paths.newConsentForm.pattern, 'templates.manage', async () => {
                        const m = await import('./features/consent-forms/routes/consent-form-page.tsx');
                        return { Component: m.NewConsentFormPage };
                      }),
                      guarded(paths.consentForm.pattern, 'templates.manage', async () => {
                        const m = await import('./features/consent-forms/routes/consent-form-page.tsx');
                        return { Component: m.ConsentFormPage, loader: m.consentFormLoader };
                      }),
                      guarded(paths.verify.pattern, VERIFY_ACTIONS, async () => {
                        const m = await import('./features/consents/routes/verify-page.tsx');
                        return { Component: m.VerifyPage };
                      }),
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
                      guarded(paths.audit.pattern, 'audit.review', async () => {
                        const m = await import('./features/audit/routes/audit-page.tsx');
                        return { Component: m.AuditPage, loader: m.auditLoader };
                      }),
                      // The log used to be the administrator's page alone; old links keep their filters.
                      { path: paths.oldAudit.pattern, loader: ({ request }) => redirect(`${paths.audit.href()}${new URL(request.url).search}`) },
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
