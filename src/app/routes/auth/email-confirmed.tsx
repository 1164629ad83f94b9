import type { QueryClient } from "@tanstack/react-query";
import { Link, redirect, useLoaderData, type LoaderFunctionArgs } from "react-router";
import { AuthLayout } from "@/components/layouts/auth-layout";
import { Alert } from "@/components/ui/alert";
import { paths, safeRedirect } from "@/config/paths";
import { getMeQueryOptions } from "@/lib/auth";

/**
 * The confirmation link lands here. Confirmed and signed in: on to `next`. The library appends
 * `?error=` when the link was wrong or expired.
 */
export const emailConfirmedLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const url = new URL(request.url);
  const error = url.searchParams.get("error");
  const next = url.searchParams.get("next");
  if (!error) {
    const me = await queryClient.fetchQuery({ ...getMeQueryOptions(), staleTime: 0 });
    if (me) throw redirect(safeRedirect(next));
  }
  return { error, next };
};

export function EmailConfirmedRoute() {
  const { error, next } = useLoaderData<Awaited<ReturnType<ReturnType<typeof emailConfirmedLoader>>>>();
  const expired = error === "TOKEN_EXPIRED";
  return (
    <AuthLayout title={error ? "This link did not work" : "Address confirmed"}>
      <div className="flex flex-col gap-4">
        {error ? (
          <Alert tone="caution">
            {expired ? "The confirmation link has expired (links are valid for 24 hours)." : "The confirmation link is not valid: it may be incomplete, or from an older mail."} Sign in
            with your e-mail address and password: we then send you a new link.
          </Alert>
        ) : (
          <Alert tone="success">Your address is confirmed. Sign in to continue.</Alert>
        )}
        <Link to={paths.auth.signIn.getHref(next)} className="font-semibold text-steel-700 underline underline-offset-2">
          Sign in
        </Link>
      </div>
    </AuthLayout>
  );
}
