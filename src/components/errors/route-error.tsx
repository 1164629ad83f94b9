/**
 * The error element of every route: it branches on the status. 401 sends the person to sign in
 * (and back here afterwards); 403 and 404 get a plain sentence; anything else says what to try.
 */
import { Navigate, isRouteErrorResponse, useLocation, useRouteError } from "react-router";
import { paths } from "@/config/paths";
import { fallbackMessage, isApiError } from "@/lib/api-client";
import { useMe } from "@/lib/auth";
import { ButtonLink } from "@/components/ui/button";
import { Wordmark } from "@/components/ui/wordmark";

function statusOf(error: unknown): { status: number; message: string } {
  if (isApiError(error)) return { status: error.status, message: error.message };
  if (isRouteErrorResponse(error)) {
    const message = typeof error.data === "string" && error.data ? error.data : fallbackMessage(error.status);
    return { status: error.status, message: error.status === 404 ? "There is no page at this address. Check the link." : message };
  }
  return { status: 500, message: "This page hit an unexpected problem. Reload the page; if it keeps happening, tell the workshop owner." };
}

type Props = {
  /** Inside the app shell: no logo, no vertical centring — the navigation is already on screen. */
  embedded?: boolean;
  /** One more sentence for a 404 on this route: where the right link comes from. */
  notFoundHint?: string;
};

export function RouteError({ embedded = false, notFoundHint }: Props) {
  const error = useRouteError();
  const location = useLocation();
  const { status, message } = statusOf(error);
  // Someone who is not signed in has no dashboard to go to: offer signing in instead.
  const signedIn = Boolean(useMe().data);

  if (status === 401) {
    return <Navigate to={paths.auth.signIn.getHref(location.pathname + location.search)} replace />;
  }
  if (status >= 500 || status === 0) console.error(error);

  const title =
    status === 403 ? "Not available for your role" : status === 404 ? "Not found" : status === 0 ? "No connection to Tinelog" : "Something went wrong";

  const Wrapper = embedded ? "div" : "main";
  return (
    <Wrapper className={embedded ? "max-w-form" : "mx-auto flex min-h-[60dvh] max-w-form flex-col justify-center gap-4 px-gutter py-12"}>
      {embedded ? null : <Wordmark />}
      <div role="alert" className="rounded-panel border border-line bg-surface p-6 shadow-panel">
        <h1 className="text-title font-semibold">{title}</h1>
        <p className="mt-2 text-ink-soft">{message}</p>
        {status === 404 && notFoundHint ? <p className="mt-2 text-ink-soft">{notFoundHint}</p> : null}
        {status !== 403 && status !== 404 ? <p className="mt-2 text-caption text-ink-faint">Status {status || "no answer"}</p> : null}
        <div className="mt-5 flex flex-wrap gap-2">
          {signedIn ? (
            <ButtonLink to={paths.app.root.getHref()} variant="primary">
              Go to the dashboard
            </ButtonLink>
          ) : (
            <ButtonLink to={paths.auth.signIn.getHref()} variant="primary">
              Sign in
            </ButtonLink>
          )}
          {status !== 403 && status !== 404 ? (
            <ButtonLink to={location.pathname + location.search} reloadDocument>
              Reload
            </ButtonLink>
          ) : null}
        </div>
      </div>
    </Wrapper>
  );
}
