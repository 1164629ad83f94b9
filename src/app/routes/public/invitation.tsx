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
import { getMeQueryOptions, useMe, useSignOut } from "@/lib/auth";

export const invitationLoader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  // An unknown invitation comes back as { found: false }; the page says so plainly.
  await Promise.all([queryClient.ensureQueryData(getInvitationQueryOptions(params.id ?? "")), queryClient.ensureQueryData(getMeQueryOptions())]);
  return null;
};

const statusText: Record<Exclude<PublicInvitation["status"], "pending">, string> = {
  accepted: "This invitation has already been accepted. Sign in to reach the workshop.",
  rejected: "This invitation was declined. Ask the workshop owner to send a new one.",
  canceled: "The workshop owner cancelled this invitation. Ask them to send a new one if you should join.",
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
      <AuthLayout title="This invitation link does not work" intro="No invitation matches it: it may have been cut short when copied, or replaced by a newer invitation.">
        <div className="flex flex-col gap-4">
          <p>Open the link from the invitation e-mail again. If it still does not work, ask the workshop owner to send a new invitation.</p>
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

  const expired = new Date(invitation.data.expiresAt).getTime() <= Date.now();
  return (
    <AuthLayout
      title={`Join ${invitation.data.workshopName}`}
      intro={`${invitation.data.inviterName} invited you to work in this workshop as ${roleLabels[invitation.data.role] ?? invitation.data.role}.`}
    >
      <div className="flex flex-col gap-6">
        <InvitationSummary invitation={invitation.data} />
        {invitation.data.status === "accepted" && me.data ? (
          <Alert tone="success" title="This invitation has been accepted.">
            <ButtonLink className="mt-2" to={paths.app.root.getHref()} variant="primary">
              Go to the dashboard
            </ButtonLink>
          </Alert>
        ) : invitation.data.status !== "pending" ? (
          <Alert tone="caution">{statusText[invitation.data.status]}</Alert>
        ) : expired ? (
          <Alert tone="caution">This invitation has expired. Ask the workshop owner to send a new one.</Alert>
        ) : me.data ? (
          <SignedIn invitation={invitation.data} email={me.data.user.email} />
        ) : (
          <SignedOut invitation={invitation.data} />
        )}
      </div>
    </AuthLayout>
  );
}

function SignedIn({ invitation, email }: { invitation: PublicInvitation; email: string }) {
  const navigate = useNavigate();
  const accept = useAcceptInvitation(invitation.id);
  const signOut = useSignOut();

  if (email.toLowerCase() !== invitation.email.toLowerCase()) {
    return (
      <Alert tone="caution" title={`You are signed in as ${email}`}>
        <p>This invitation is for {invitation.email}. Sign out, then open the link again to join with that address.</p>
        <Button className="mt-3" variant="secondary" pending={signOut.isPending} onClick={() => signOut.mutate(paths.public.invitation.getHref(invitation.id))}>
          Sign out
        </Button>
      </Alert>
    );
  }
  return (
    <div className="flex flex-col gap-3">
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
  const [mode, setMode] = useState<"sign-up" | "sign-in">("sign-up");
  // After the account step `me` is no longer null and the page shows the "Join" step (SignedIn).
  const noop = () => undefined;

  return (
    <div className="flex flex-col gap-4">
      <p className="text-ink-soft">First create your account or sign in with {invitation.email}; then you join the workshop.</p>
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
        <SignUpForm lockedEmail={invitation.email} onSuccess={noop} submitLabel="Create account" />
      ) : (
        <SignInForm lockedEmail={invitation.email} onSuccess={noop} submitLabel="Sign in" />
      )}
    </div>
  );
}
