import { useState } from "react";
import { Link, useSearchParams } from "react-router";
import { AuthLayout } from "@/components/layouts/auth-layout";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { paths, safeRedirect } from "@/config/paths";
import { isApiError } from "@/lib/api-client";
import { resendConfirmation } from "@/lib/auth";

/** After sign-up: the account waits for its address to be confirmed through the mailed link. */
export function CheckMailRoute() {
  const [params] = useSearchParams();
  const email = params.get("email") ?? "";
  const next = params.get("next");
  const [state, setState] = useState<{ name: "idle" | "sending" | "sent" } | { name: "failed"; message: string }>({ name: "idle" });

  const resend = async () => {
    setState({ name: "sending" });
    try {
      await resendConfirmation(email, next ? safeRedirect(next) : null);
      setState({ name: "sent" });
    } catch (error) {
      setState({ name: "failed", message: isApiError(error) ? error.message : "The link could not be sent. Try again in a minute." });
    }
  };

  return (
    <AuthLayout
      title="Check your mail"
      intro={
        <>
          We sent a confirmation link to <strong className="text-ink">{email || "your address"}</strong>. Open it to confirm the address is yours;
          you are then signed in and carry on where you left off.
        </>
      }
      footer={
        <>
          Confirmed already?{" "}
          <Link to={paths.auth.signIn.getHref(next)} className="font-semibold text-steel-700 underline underline-offset-2">
            Sign in
          </Link>
        </>
      }
    >
      <div className="flex flex-col gap-4">
        <ul className="list-disc pl-5 text-ink-soft">
          <li>The link is valid for 24 hours.</li>
          <li>No mail after a few minutes? Look in the spam or junk folder, and check the address above for a typing error.</li>
          <li>If this address already had an account, the mail says so and tells you how to sign in instead.</li>
        </ul>
        {state.name === "sent" ? <Alert tone="success">A new link is on its way. Use the newest mail.</Alert> : null}
        {state.name === "failed" ? <Alert tone="error">{state.message}</Alert> : null}
        {email ? (
          <Button variant="secondary" className="self-start" pending={state.name === "sending"} onClick={resend}>
            Send the link again
          </Button>
        ) : null}
      </div>
    </AuthLayout>
  );
}
