/**
 * The route tree. Every route has the same error element, which branches on the status
 * (401 → sign in, 403/404 → a plain sentence). Loaders are factories over the query client.
 */
import type { QueryClient } from "@tanstack/react-query";
import { createBrowserRouter, redirect, type RouteObject } from "react-router";
import { RouteError } from "@/components/errors/route-error";
import { paths } from "@/config/paths";
import { ApiError } from "@/lib/api-client";
import { PageLoading } from "./page-loading";
import { AppRoot, appLoader } from "./routes/app/root";
import { BatchLedgerRoute, batchLedgerLoader } from "./routes/app/batches/batch-ledger";
import { BatchNewRoute, batchNewLoader } from "./routes/app/batches/batch-new";
import { BatchesListRoute, batchesListLoader } from "./routes/app/batches/batches-list";
import { DashboardRoute, dashboardLoader } from "./routes/app/dashboard";
import { InstrumentRoute, instrumentLoader } from "./routes/app/instruments/instrument";
import { InstrumentsListRoute, instrumentsListLoader } from "./routes/app/instruments/instruments-list";
import { SettingsRoute, settingsLoader } from "./routes/app/settings";
import { SpecDetailRoute, specDetailLoader } from "./routes/app/specs/spec-detail";
import { SpecEditRoute, specEditLoader } from "./routes/app/specs/spec-edit";
import { SpecModesRoute, specModesLoader } from "./routes/app/specs/spec-modes";
import { SpecNewRoute, specNewLoader } from "./routes/app/specs/spec-new";
import { SpecsListRoute, specsListLoader } from "./routes/app/specs/specs-list";
import { StrikeRoute, strikeLoader } from "./routes/app/strike";
import { UnitRoute, unitLoader } from "./routes/app/units/unit";
import { MembersRoute, membersLoader } from "./routes/app/members";
import { OutboxMessageRoute, outboxMessageLoader } from "./routes/app/outbox-message";
import { OutboxRoute, outboxLoader } from "./routes/app/outbox";
import { CheckMailRoute } from "./routes/auth/check-mail";
import { CreateWorkshopRoute, createWorkshopLoader } from "./routes/auth/create-workshop";
import { EmailConfirmedRoute, emailConfirmedLoader } from "./routes/auth/email-confirmed";
import { ForgotPasswordRoute } from "./routes/auth/forgot-password";
import { ResetPasswordRoute } from "./routes/auth/reset-password";
import { SignInRoute, signInLoader } from "./routes/auth/sign-in";
import { SignUpRoute, signUpLoader } from "./routes/auth/sign-up";
import { InvitationRoute, invitationLoader } from "./routes/public/invitation";
import { PublicLayout } from "./routes/public/public-layout";
import { VerifyRoute, verifyLoader } from "./routes/public/verify";

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
        { path: paths.auth.signIn.path, loader: signInLoader(queryClient), element: <SignInRoute />, errorElement },
        { path: paths.auth.signUp.path, loader: signUpLoader(queryClient), element: <SignUpRoute />, errorElement },
        { path: paths.auth.createWorkshop.path, loader: createWorkshopLoader(queryClient), element: <CreateWorkshopRoute />, errorElement },
        { path: paths.auth.checkMail.path, element: <CheckMailRoute />, errorElement },
        { path: paths.auth.emailConfirmed.path, loader: emailConfirmedLoader(queryClient), element: <EmailConfirmedRoute />, errorElement },
        { path: paths.auth.forgotPassword.path, element: <ForgotPasswordRoute />, errorElement },
        { path: paths.auth.resetPassword.path, element: <ResetPasswordRoute />, errorElement },
        {
          // No sign-in needed below here: the invitation landing and certificate verification.
          element: <PublicLayout />,
          errorElement,
          children: [
            {
              path: paths.public.invitation.path,
              loader: invitationLoader(queryClient),
              element: <InvitationRoute />,
              errorElement: <RouteError notFoundHint="This invitation is not open any more: it was accepted, cancelled or has expired, or the link was not opened whole. If you joined already, sign in; otherwise ask the workshop owner to send a new invitation." />,
            },
            {
              path: paths.public.verify.path,
              loader: verifyLoader(queryClient),
              element: <VerifyRoute />,
              errorElement: <RouteError />,
            },
          ],
        },
        {
          path: paths.app.root.path,
          loader: appLoader(queryClient),
          element: <AppRoot />,
          errorElement,
          children: [
            // Errors of a page render inside the shell, so navigation stays at hand.
            {
              errorElement: <RouteError embedded />,
              children: [
                { index: true, loader: dashboardLoader(queryClient), element: <DashboardRoute /> },
                { path: paths.app.batches.path, loader: batchesListLoader(queryClient), element: <BatchesListRoute /> },
                { path: paths.app.newBatch.path, loader: batchNewLoader(queryClient), element: <BatchNewRoute /> },
                { path: paths.app.batch.path, loader: batchLedgerLoader(queryClient), element: <BatchLedgerRoute /> },
                { path: paths.app.unit.path, loader: unitLoader(queryClient), element: <UnitRoute /> },
                { path: paths.app.specifications.path, loader: specsListLoader(queryClient), element: <SpecsListRoute /> },
                { path: paths.app.newSpecification.path, loader: specNewLoader(queryClient), element: <SpecNewRoute /> },
                { path: paths.app.specification.path, loader: specDetailLoader(queryClient), element: <SpecDetailRoute /> },
                { path: paths.app.editSpecification.path, loader: specEditLoader(queryClient), element: <SpecEditRoute /> },
                { path: paths.app.specificationModes.path, loader: specModesLoader(queryClient), element: <SpecModesRoute /> },
                { path: paths.app.settings.path, loader: settingsLoader(queryClient), element: <SettingsRoute /> },
                { path: paths.app.instruments.path, loader: instrumentsListLoader(queryClient), element: <InstrumentsListRoute /> },
                { path: paths.app.instrument.path, loader: instrumentLoader(queryClient), element: <InstrumentRoute /> },
                { path: paths.app.members.path, loader: membersLoader(queryClient), element: <MembersRoute /> },
                { path: paths.app.outbox.path, loader: outboxLoader(queryClient), element: <OutboxRoute /> },
                { path: paths.app.outboxMessage.path, loader: outboxMessageLoader(queryClient), element: <OutboxMessageRoute /> },
                { path: "*", loader: notFoundLoader },
              ],
            },
          ],
        },
        {
          // The strike page lives at /strikes/:strikeId but inside the same signed-in shell.
          path: paths.strike.path,
          loader: appLoader(queryClient),
          element: <AppRoot />,
          errorElement,
          children: [{ errorElement: <RouteError embedded />, children: [{ index: true, loader: strikeLoader(queryClient), element: <StrikeRoute /> }] }],
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
