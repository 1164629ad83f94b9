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
import { BatchesRoute, SpecificationsRoute, batchesLoader, specificationsLoader } from "./routes/app/coming-later";
import { DashboardRoute } from "./routes/app/dashboard";
import { MembersRoute, membersLoader } from "./routes/app/members";
import { OutboxMessageRoute, outboxMessageLoader } from "./routes/app/outbox-message";
import { OutboxRoute, outboxLoader } from "./routes/app/outbox";
import { CreateWorkshopRoute, createWorkshopLoader } from "./routes/auth/create-workshop";
import { SignInRoute, signInLoader } from "./routes/auth/sign-in";
import { SignUpRoute, signUpLoader } from "./routes/auth/sign-up";
import { InvitationRoute, invitationLoader } from "./routes/public/invitation";
import { PublicLayout } from "./routes/public/public-layout";

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
        {
          // No sign-in needed below here. The certificate verification page (/verify/:code) joins this group.
          element: <PublicLayout />,
          errorElement,
          children: [
            {
              path: paths.public.invitation.path,
              loader: invitationLoader(queryClient),
              element: <InvitationRoute />,
              errorElement: <RouteError notFoundHint="Check that the whole link from your invitation e-mail was opened, or ask the workshop owner to send a new invitation." />,
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
                { index: true, element: <DashboardRoute /> },
                { path: paths.app.batches.path, loader: batchesLoader(queryClient), element: <BatchesRoute /> },
                { path: paths.app.specifications.path, loader: specificationsLoader(queryClient), element: <SpecificationsRoute /> },
                { path: paths.app.members.path, loader: membersLoader(queryClient), element: <MembersRoute /> },
                { path: paths.app.outbox.path, loader: outboxLoader(queryClient), element: <OutboxRoute /> },
                { path: paths.app.outboxMessage.path, loader: outboxMessageLoader(queryClient), element: <OutboxMessageRoute /> },
                { path: "*", loader: notFoundLoader },
              ],
            },
          ],
        },
        { path: "*", loader: notFoundLoader },
      ],
    },
  ];
}

function notFoundLoader(): never {
  throw new ApiError(404, "not_found", "There is no page at this address. Check the link, or go back to the dashboard.");
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(createRoutes(queryClient));
}
