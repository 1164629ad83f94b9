/**
 * The route tree. Every page module is loaded lazily (see `page`). Every route has the same error element, which branches on the status
 * (401 → sign in, 403/404 → a plain sentence). Loaders are factories over the query client.
 */
import type { QueryClient } from "@tanstack/react-query";
import { createBrowserRouter, redirect, type RouteObject } from "react-router";
import { RouteError } from "@/components/errors/route-error";
import { paths } from "@/config/paths";
import { ApiError } from "@/lib/api-client";
import { PageLoading } from "./page-loading";

/**
 * A route module fetched when its route is first matched, so a visitor downloads only the pages
 * they open (the sign-in page stays small; charts, recorder and spec editor come when visited).
 * The module's loader is a factory over the query client; `pick` binds it.
 */
function page<M>(load: () => Promise<M>, pick: (module: M) => Pick<RouteObject, "Component" | "loader">) {
  return async () => pick(await load());
}

export function createRoutes(queryClient: QueryClient): RouteObject[] {
  const errorElement = <RouteError />;
  return [
    {
      errorElement,
      // Shown while the first page's loaders run (a client-only app has nothing to hydrate).
      hydrateFallbackElement: <PageLoading />,
      // A pathless layout route: its error element catches what a child's own does not.
      children: [
        { path: paths.home.path, loader: () => redirect(paths.app.root.getHref()) },
        { path: paths.auth.signIn.path, lazy: page(() => import("./routes/auth/sign-in"), (m) => ({ Component: m.SignInRoute, loader: m.signInLoader(queryClient) })), errorElement },
        { path: paths.auth.signUp.path, lazy: page(() => import("./routes/auth/sign-up"), (m) => ({ Component: m.SignUpRoute, loader: m.signUpLoader(queryClient) })), errorElement },
        { path: paths.auth.createWorkshop.path, lazy: page(() => import("./routes/auth/create-workshop"), (m) => ({ Component: m.CreateWorkshopRoute, loader: m.createWorkshopLoader(queryClient) })), errorElement },
        { path: paths.auth.checkMail.path, lazy: page(() => import("./routes/auth/check-mail"), (m) => ({ Component: m.CheckMailRoute })), errorElement },
        { path: paths.auth.emailConfirmed.path, lazy: page(() => import("./routes/auth/email-confirmed"), (m) => ({ Component: m.EmailConfirmedRoute, loader: m.emailConfirmedLoader(queryClient) })), errorElement },
        { path: paths.auth.forgotPassword.path, lazy: page(() => import("./routes/auth/forgot-password"), (m) => ({ Component: m.ForgotPasswordRoute })), errorElement },
        { path: paths.auth.resetPassword.path, lazy: page(() => import("./routes/auth/reset-password"), (m) => ({ Component: m.ResetPasswordRoute })), errorElement },
        {
          // No sign-in needed below here: the invitation landing and certificate verification.
          lazy: page(() => import("./routes/public/public-layout"), (m) => ({ Component: m.PublicLayout })),
          errorElement,
          children: [
            {
              path: paths.public.invitation.path,
              lazy: page(() => import("./routes/public/invitation"), (m) => ({ Component: m.InvitationRoute, loader: m.invitationLoader(queryClient) })),
              errorElement: <RouteError notFoundHint="This invitation is not open any more: it was accepted, cancelled or has expired, or the link was not opened whole. If you joined already, sign in; otherwise ask the workshop owner to send a new invitation." />,
            },
            {
              path: paths.public.verify.path,
              lazy: page(() => import("./routes/public/verify"), (m) => ({ Component: m.VerifyRoute, loader: m.verifyLoader(queryClient) })),
              errorElement: <RouteError />,
            },
          ],
        },
        {
          path: paths.app.root.path,
          lazy: page(() => import("./routes/app/root"), (m) => ({ Component: m.AppRoot, loader: m.appLoader(queryClient) })),
          errorElement,
          children: [
            // Errors of a page render inside the shell, so navigation stays at hand.
            {
              errorElement: <RouteError embedded />,
              children: [
                { index: true, lazy: page(() => import("./routes/app/dashboard"), (m) => ({ Component: m.DashboardRoute, loader: m.dashboardLoader(queryClient) })) },
                { path: paths.app.batches.path, lazy: page(() => import("./routes/app/batches/batches-list"), (m) => ({ Component: m.BatchesListRoute, loader: m.batchesListLoader(queryClient) })) },
                { path: paths.app.newBatch.path, lazy: page(() => import("./routes/app/batches/batch-new"), (m) => ({ Component: m.BatchNewRoute, loader: m.batchNewLoader(queryClient) })) },
                { path: paths.app.batch.path, lazy: page(() => import("./routes/app/batches/batch-ledger"), (m) => ({ Component: m.BatchLedgerRoute, loader: m.batchLedgerLoader(queryClient) })) },
                { path: paths.app.unit.path, lazy: page(() => import("./routes/app/units/unit"), (m) => ({ Component: m.UnitRoute, loader: m.unitLoader(queryClient) })) },
                { path: paths.app.specifications.path, lazy: page(() => import("./routes/app/specs/specs-list"), (m) => ({ Component: m.SpecsListRoute, loader: m.specsListLoader(queryClient) })) },
                { path: paths.app.newSpecification.path, lazy: page(() => import("./routes/app/specs/spec-new"), (m) => ({ Component: m.SpecNewRoute, loader: m.specNewLoader(queryClient) })) },
                { path: paths.app.specification.path, lazy: page(() => import("./routes/app/specs/spec-detail"), (m) => ({ Component: m.SpecDetailRoute, loader: m.specDetailLoader(queryClient) })) },
                { path: paths.app.editSpecification.path, lazy: page(() => import("./routes/app/specs/spec-edit"), (m) => ({ Component: m.SpecEditRoute, loader: m.specEditLoader(queryClient) })) },
                { path: paths.app.specificationModes.path, lazy: page(() => import("./routes/app/specs/spec-modes"), (m) => ({ Component: m.SpecModesRoute, loader: m.specModesLoader(queryClient) })) },
                { path: paths.app.settings.path, lazy: page(() => import("./routes/app/settings"), (m) => ({ Component: m.SettingsRoute, loader: m.settingsLoader(queryClient) })) },
                { path: paths.app.instruments.path, lazy: page(() => import("./routes/app/instruments/instruments-list"), (m) => ({ Component: m.InstrumentsListRoute, loader: m.instrumentsListLoader(queryClient) })) },
                { path: paths.app.instrument.path, lazy: page(() => import("./routes/app/instruments/instrument"), (m) => ({ Component: m.InstrumentRoute, loader: m.instrumentLoader(queryClient) })) },
                { path: paths.app.members.path, lazy: page(() => import("./routes/app/members"), (m) => ({ Component: m.MembersRoute, loader: m.membersLoader(queryClient) })) },
                { path: paths.app.outbox.path, lazy: page(() => import("./routes/app/outbox"), (m) => ({ Component: m.OutboxRoute, loader: m.outboxLoader(queryClient) })) },
                { path: paths.app.outboxMessage.path, lazy: page(() => import("./routes/app/outbox-message"), (m) => ({ Component: m.OutboxMessageRoute, loader: m.outboxMessageLoader(queryClient) })) },
                { path: "*", loader: notFoundLoader },
              ],
            },
          ],
        },
        {
          // The strike page lives at /strikes/:strikeId but inside the same signed-in shell.
          path: paths.strike.path,
          lazy: page(() => import("./routes/app/root"), (m) => ({ Component: m.AppRoot, loader: m.appLoader(queryClient) })),
          errorElement,
          children: [{ errorElement: <RouteError embedded />, children: [{ index: true, lazy: page(() => import("./routes/app/strike"), (m) => ({ Component: m.StrikeRoute, loader: m.strikeLoader(queryClient) })) }] }],
        },
        { path: "*", loader: notFoundLoader },
      ],
    },
  ];
}

function notFoundLoader(): never {
  throw new ApiError(404, "not_found", "There is no page at this address. Check the link.");
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(createRoutes(queryClient));
}
