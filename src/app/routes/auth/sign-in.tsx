import type { QueryClient } from "@tanstack/react-query";
import { Link, useNavigate, useSearchParams, type LoaderFunctionArgs } from "react-router";
import { AuthLayout } from "@/components/layouts/auth-layout";
import { paths, safeRedirect } from "@/config/paths";
import { SignInForm } from "@/features/auth/components/sign-in-form";
import { redirectIfSignedIn } from "@/app/loaders";

export const signInLoader = (queryClient: QueryClient) => ({ request }: LoaderFunctionArgs) => redirectIfSignedIn(queryClient, request);

export function SignInRoute() {
  const navigate = useNavigate();
  const [params] = useSearchParams();
  const redirectTo = params.get("redirectTo");

  return (
    <AuthLayout
      title="Sign in"
      intro="Use the e-mail address your workshop invited you with."
      footer={
        <>
          New to Tinelog?{" "}
          <Link to={paths.auth.signUp.getHref(redirectTo)} className="font-semibold text-steel-700 underline underline-offset-2">
            Create an account
          </Link>
        </>
      }
    >
      <SignInForm next={safeRedirect(redirectTo)} onSuccess={() => navigate(safeRedirect(redirectTo), { replace: true })} />
    </AuthLayout>
  );
}
