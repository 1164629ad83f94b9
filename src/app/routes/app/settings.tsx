import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router";
import { PageHeader, Panel } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { getWorkshopQueryOptions, useWorkshop } from "@/features/workshop-settings/api/get-workshop";
import { ProfileForm } from "@/features/workshop-settings/components/profile-form";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const settingsLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  assertCan(me, "workshop", "update", "changing the workshop's settings");
  await queryClient.ensureQueryData(getWorkshopQueryOptions(me.activeWorkshop.id));
  return null;
};

export function SettingsRoute() {
  const me = useSignedInMe();
  const workshop = useWorkshop(me.activeWorkshop.id);
  if (workshop.isPending) return <Spinner label="Loading the settings…" />;
  if (workshop.isError) throw workshop.error;
  return (
    <>
      <PageHeader title="Workshop settings" description={`${workshop.data.name}: what certificates print and where their e-mail comes from.`} />
      <Panel className="max-w-3xl">
        <ProfileForm workshopId={me.activeWorkshop.id} profile={workshop.data.profile} />
      </Panel>
    </>
  );
}
