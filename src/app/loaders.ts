/**
 * Loader helpers shared by the routes. Loaders are factories over the query client (TanStack
 * Query's React Router pattern): they warm the same queries the components read.
 */
import type { QueryClient } from "@tanstack/react-query";
import { redirect } from "react-router";
import { paths, safeRedirect } from "@/config/paths";
import { getMeQueryOptions, type Me } from "@/lib/auth";
import { authClient, unwrap } from "@/lib/auth-client";

export type SignedInMe = Me & { activeWorkshop: NonNullable<Me["activeWorkshop"]> };

function returnPath(request: Request): string {
  const url = new URL(request.url);
  return url.pathname + url.search;
}

/** Signed in, or a redirect to sign-in that comes back here afterwards. */
export async function requireMe(queryClient: QueryClient, request: Request): Promise<Me> {
  const me = await queryClient.ensureQueryData(getMeQueryOptions());
  if (!me) throw redirect(paths.auth.signIn.getHref(returnPath(request)));
  return me;
}

/**
 * Signed in with an active workshop. No workshop at all → create one; a session without an
 * active workshop (e.g. the first sign-in) → the first membership becomes active.
 */
export async function requireWorkshop(queryClient: QueryClient, request: Request): Promise<SignedInMe> {
  const me = await requireMe(queryClient, request);
  if (me.activeWorkshop) return me as SignedInMe;
  const first = me.workshops[0];
  if (!first) throw redirect(paths.auth.createWorkshop.getHref());
  await unwrap(authClient.organization.setActive({ organizationId: first.id }));
  const refreshed = await queryClient.fetchQuery({ ...getMeQueryOptions(), staleTime: 0 });
  if (!refreshed?.activeWorkshop) throw redirect(paths.auth.createWorkshop.getHref());
  return refreshed as SignedInMe;
}

/** Pages for signed-out people send a signed-in person on to where they were going. */
export async function redirectIfSignedIn(queryClient: QueryClient, request: Request): Promise<null> {
  // Ask afresh: a cached `me` may predate a sign-out in another tab, and trusting it would loop.
  const me = await queryClient.fetchQuery({ ...getMeQueryOptions(), staleTime: 0 });
  if (me) {
    throw redirect(safeRedirect(new URL(request.url).searchParams.get("redirectTo")));
  }
  return null;
}
