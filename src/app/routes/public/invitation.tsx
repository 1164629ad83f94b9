import type { QueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { useNavigate, useParams, type LoaderFunctionArgs } from "react-router";
import { roleLabels } from "@shared/permissions";
import { AuthLayout } from "@/components/layouts/auth-layout";
import { Alert } from "@/components/ui/alert";
import { Button, ButtonLink } from "@/components/ui/button";
import { Spinner } from "@/components/ui/spinner";
import { paths } from "@/config/paths";
import { SignInForm } from "@/features/auth/components/sign-in-form";
import { SignUpForm } from "@/features/auth/components/sign-up-form";
import { useAcceptInvitation } from "@/features/invitations/api/accept-invitation";
import { getInvitationQueryOptions, invitationFound, useInvitation, type PublicInvitation } from "@/features/invitations/api/get-invitation";
import { InvitationSummary } from "@/features/invitations/components/invitation-summary";
import { isApiError } from "@/lib/api-client";
import { getMeQueryOptions, useMe, useSignOut } from "@/lib/auth";

export const invitationLoader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  // An unknown invitation comes back as { found: false }; the page says so plainly.
  await Promise.all([queryClient.ensureQueryData(getInvitationQueryOptions(params.id ?? "")), queryClient.ensureQueryData(getMeQueryOptions())]);
  return null;
};

export function InvitationRoute() {
  const { id = "" } = useParams();
  const invitation = useInvitation(id);
  const me = useMe();

  if (invitation.isPending || me.isPending) return <Spinner label="Loading the invitation…" />;
  if (invitation.isError) throw invitation.error;
  if (me.isError) throw me.error;
  if (!invitationFound(invitation.data)) {
    return (
      <AuthLayout title="This invitation is not open any more" intro="It was accepted, cancelled or has expired, or the link was not opened whole.">
        <div className="flex flex-col gap-4">
          <p>If you joined already, sign in. Otherwise open the link from the invitation e-mail again, and if it still does not work, ask the workshop owner to send a new invitation.</p>
          {me.data ? null : (
            <p>
              <ButtonLink to={paths.auth.signIn.getHref()} variant="secondary">
                Sign in with an account you already have
              </ButtonLink>
            </p>
          )}
        </div>
      </AuthLayout>
    );
  }

  return (
    <AuthLayout title={`Join ${invitation.data.workshopName}`} intro={`You are invited to work in this workshop as ${roleLabels[invitation.data.role] ?? invitation.data.role}.`}>
      <div className="flex flex-col gap-6">
        <InvitationSummary invitation={invitation.data} />
        {me.data ? <SignedIn invitation={invitation.data} email={me.data.user.email} /> : <SignedOut invitation={invitation.data} />}
      </div>
    </AuthLayout>
  );
}

function SignedIn({ invitation, email }: { invitation: PublicInvitation; email: string }) {
  const navigate = useNavigate();
  const accept = useAcceptInvitation(invitation.id);
  const signOut = useSignOut();
  // The look-up does not say whom the invitation is for; the server checks it when accepting.
  const notForYou = isApiError(accept.error) && accept.error.code === "you_are_not_the_recipient_of_the_invitation";

  if (notForYou) {
    return (
      <Alert tone="caution" title={`You are signed in as ${email}`}>
        <p>This invitation was sent to another address. Sign out, then open the link again and sign in (or create the account) with the invited address.</p>
        <Button className="mt-3" variant="secondary" pending={signOut.isPending} onClick={() => signOut.mutate(paths.public.invitation.getHref(invitation.id))}>
          Sign out
        </Button>
      </Alert>
    );
  }
  return (
    <div className="flex flex-col gap-3">
      <p className="text-ink-soft">You are signed in as {email}.</p>
      {accept.error ? <Alert tone="error">{accept.error.message}</Alert> : null}
      <Button
        pending={accept.isPending}
        onClick={async () => {
          try {
            await accept.mutateAsync();
            navigate(paths.app.root.getHref(), { replace: true });
          } catch {
            // shown above from accept.error
          }
        }}
      >
        Join {invitation.workshopName}
      </Button>
    </div>
  );
}

function SignedOut({ invitation }: { invitation: PublicInvitation }) {
  const navigate = useNavigate();
  const [mode, setMode] = useState<"sign-up" | "sign-in">("sign-up");
  const here = paths.public.invitation.getHref(invitation.id);
  // After signing in `me` is no longer null and the page shows the "Join" step (SignedIn).
  const noop = () => undefined;

  return (
    <div className="flex flex-col gap-4">
      <p className="text-ink-soft">Use the e-mail address the invitation was sent to. A new account confirms its address first; the link in that mail brings you back here to join.</p>
      <div role="group" aria-label="How do you want to continue?" className="grid grid-cols-2 gap-1 rounded-control border border-line-strong p-1">
        {(
          [
            ["sign-up", "New to Tinelog"],
            ["sign-in", "Have an account"],
          ] as const
        ).map(([value, label]) => (
          <button
            key={value}
            type="button"
            aria-pressed={mode === value}
            onClick={() => setMode(value)}
            className={`min-h-touch whitespace-nowrap rounded-[0.4rem] px-2 font-medium ${mode === value ? "bg-steel-600 text-white" : "text-ink-soft hover:bg-sunken"}`}
          >
            {label}
          </button>
        ))}
      </div>
      {mode === "sign-up" ? (
        <SignUpForm next={here} onSuccess={(email) => navigate(paths.auth.checkMail.getHref(email, here))} submitLabel="Create account" />
      ) : (
        <SignInForm next={here} onSuccess={noop} submitLabel="Sign in" />
      )}
    </div>
  );
}
