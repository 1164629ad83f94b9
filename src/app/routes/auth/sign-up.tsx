import type { QueryClient } from "@tanstack/react-query";
import { Link, useNavigate, useSearchParams, type LoaderFunctionArgs } from "react-router";
import { AuthLayout } from "@/components/layouts/auth-layout";
import { paths, safeRedirect } from "@/config/paths";
import { SignUpForm } from "@/features/auth/components/sign-up-form";
import { redirectIfSignedIn } from "@/app/loaders";

export const signUpLoader = (queryClient: QueryClient) => ({ request }: LoaderFunctionArgs) => redirectIfSignedIn(queryClient, request);

export function SignUpRoute() {
  const navigate = useNavigate();
  const [params] = useSearchParams();
  const redirectTo = params.get("redirectTo");

  return (
    <AuthLayout
      title="Create your account"
      intro={
        <>
          Next you create your workshop and invite the people who make and check your units. Joining a workshop that already uses
          Tinelog? Open the link in your invitation e-mail instead.
        </>
      }
      footer={
        <>
          Already have an account?{" "}
          <Link to={paths.auth.signIn.getHref(redirectTo)} className="font-semibold text-steel-700 underline underline-offset-2">
            Sign in
          </Link>
        </>
      }
    >
      <SignUpForm
        next={redirectTo ? safeRedirect(redirectTo) : paths.auth.createWorkshop.getHref()}
        onSuccess={(email) => navigate(paths.auth.checkMail.getHref(email, redirectTo ? safeRedirect(redirectTo) : paths.auth.createWorkshop.getHref()), { replace: true })}
      />
    </AuthLayout>
  );
}
