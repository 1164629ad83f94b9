import type { QueryClient } from "@tanstack/react-query";
import { Link, useLoaderData, useNavigate, type LoaderFunctionArgs } from "react-router";
import { AuthLayout } from "@/components/layouts/auth-layout";
import { Button } from "@/components/ui/button";
import { paths } from "@/config/paths";
import { CreateWorkshopForm } from "@/features/workshops/components/create-workshop-form";
import { useSignOut } from "@/lib/auth";
import { requireMe } from "@/app/loaders";

export const createWorkshopLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const me = await requireMe(queryClient, request);
  return { hasWorkshops: me.workshops.length > 0, name: me.user.name };
};

export function CreateWorkshopRoute() {
  const { hasWorkshops, name } = useLoaderData<Awaited<ReturnType<ReturnType<typeof createWorkshopLoader>>>>();
  const navigate = useNavigate();
  const signOut = useSignOut();

  return (
    <AuthLayout
      title="Create your workshop"
      intro={
        <>
          {hasWorkshops ? "A new workshop keeps its own specifications, batches and members." : `Welcome, ${name}. Tinelog keeps its records per workshop.`}{" "}
          You will be its owner: you invite makers and quality staff and choose what each may do.
        </>
      }
      footer={
        hasWorkshops ? (
          <Link to={paths.app.root.getHref()} className="font-semibold text-steel-700 underline underline-offset-2">
            Back to the dashboard
          </Link>
        ) : (
          <Button variant="quiet" pending={signOut.isPending} onClick={() => signOut.mutate(paths.auth.signIn.getHref())}>
            Sign out
          </Button>
        )
      }
    >
      <CreateWorkshopForm onCreated={() => navigate(paths.app.root.getHref(), { replace: true })} />
    </AuthLayout>
  );
}
