import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router";
import { can } from "@shared/permissions";
import { PageHeader, Panel } from "@/components/ui/panel";
import { getInvitationsQueryOptions } from "@/features/members/api/get-invitations";
import { getMembersQueryOptions } from "@/features/members/api/get-members";
import { InviteMemberForm } from "@/features/members/components/invite-member-form";
import { MembersList } from "@/features/members/components/members-list";
import { PendingInvitations } from "@/features/members/components/pending-invitations";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const membersLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  assertCan(me, "member", "create", "managing members");
  const id = me.activeWorkshop.id;
  await Promise.all([queryClient.ensureQueryData(getMembersQueryOptions(id)), queryClient.ensureQueryData(getInvitationsQueryOptions(id))]);
  return null;
};

export function MembersRoute() {
  const me = useSignedInMe();
  const workshopId = me.activeWorkshop.id;
  const canManage = can(me.activeWorkshop.role, "member", "update");

  return (
    <>
      <PageHeader title="Members" description={`Who works in ${me.activeWorkshop.name}, and what each may do.`} />
      <div className="flex flex-col gap-6">
        <Panel aria-labelledby="invite-heading">
          <h2 id="invite-heading" className="mb-4 text-title font-semibold">
            Invite a member
          </h2>
          <InviteMemberForm workshopId={workshopId} />
        </Panel>
        <Panel aria-labelledby="pending-heading">
          <h2 id="pending-heading" className="mb-2 text-title font-semibold">
            Pending invitations
          </h2>
          <PendingInvitations workshopId={workshopId} />
        </Panel>
        <Panel aria-labelledby="members-heading">
          <h2 id="members-heading" className="mb-2 text-title font-semibold">
            People in this workshop
          </h2>
          <MembersList workshopId={workshopId} currentUserId={me.user.id} canManage={canManage} />
        </Panel>
      </div>
    </>
  );
}
