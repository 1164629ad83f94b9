import type { QueryClient } from "@tanstack/react-query";
import { Outlet, useNavigate, type LoaderFunctionArgs } from "react-router";
import { can, roleLabels, type RoleName } from "@shared/permissions";
import { AppLayout, type NavItem } from "@/components/layouts/app-layout";
import { Button } from "@/components/ui/button";
import { Badge } from "@/components/ui/panel";
import { paths } from "@/config/paths";
import { SearchBox } from "@/features/search/components/search-box";
import { WorkshopSwitcher } from "@/features/workshops/components/workshop-switcher";
import { useSignOut } from "@/lib/auth";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const appLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  await requireWorkshop(queryClient, request);
  return null;
};

/** Only what the role may use (shared/permissions.ts). */
function navFor(role: RoleName): NavItem[] {
  const items: NavItem[] = [{ to: paths.app.dashboard.getHref(), label: "Dashboard", end: true }];
  if (can(role, "batch", "read")) items.push({ to: paths.app.batches.getHref(), label: "Batches" });
  if (can(role, "spec", "read")) items.push({ to: paths.app.specifications.getHref(), label: "Specifications" });
  if (can(role, "instrument", "read")) items.push({ to: paths.app.instruments.getHref(), label: "Instruments" });
  if (can(role, "member", "create")) items.push({ to: paths.app.members.getHref(), label: "Members" });
  if (can(role, "mail", "read-certificates")) items.push({ to: paths.app.outbox.getHref(), label: "Outbox" });
  if (can(role, "workshop", "update")) items.push({ to: paths.app.settings.getHref(), label: "Settings" });
  return items;
}

export function AppRoot() {
  const me = useSignedInMe();
  const navigate = useNavigate();
  const signOut = useSignOut();
  const role = me.activeWorkshop.role;

  return (
    <AppLayout
      nav={navFor(role)}
      switcher={
        <WorkshopSwitcher
          workshops={me.workshops}
          activeId={me.activeWorkshop.id}
          createHref={paths.auth.createWorkshop.getHref()}
          onSwitched={() => navigate(paths.app.dashboard.getHref())}
        />
      }
      search={can(role, "batch", "read") ? <SearchBox workshopId={me.activeWorkshop.id} hrefs={{ unit: paths.app.unit.getHref, batch: paths.app.batch.getHref }} /> : undefined}
      account={
        <div className="flex flex-wrap items-center justify-between gap-3 md:flex-col md:items-stretch">
          <div className="min-w-0">
            <p className="[overflow-wrap:anywhere] font-semibold">{me.user.name}</p>
            <p className="[overflow-wrap:anywhere] text-caption text-ink-soft">{me.user.email}</p>
            <p className="mt-1">
              <Badge tone="steel">{roleLabels[role] ?? role}</Badge>
            </p>
          </div>
          <Button
            variant="secondary"
            pending={signOut.isPending}
            onClick={() => signOut.mutate(paths.auth.signIn.getHref())}
          >
            Sign out
          </Button>
        </div>
      }
    >
      <Outlet />
    </AppLayout>
  );
}
