import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router";
import { can } from "@shared/permissions";
import { ButtonLink } from "@/components/ui/button";
import { PageHeader, Panel } from "@/components/ui/panel";
import { paths } from "@/config/paths";
import { getMailQueryOptions } from "@/features/outbox/api/get-mail";
import { MailList } from "@/features/outbox/components/mail-list";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const outboxLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  assertCan(me, "mail", "read-certificates", "reading the outbox");
  await queryClient.ensureQueryData(getMailQueryOptions(me.activeWorkshop.id));
  return null;
};

export function OutboxRoute() {
  const me = useSignedInMe();
  const all = can(me.activeWorkshop.role, "mail", "read");
  return (
    <>
      <PageHeader
        title="Outbox"
        description={
          all
            ? "Mail sent by Tinelog for this workshop — invitations and certificates — exactly as it went out, with its attachments."
            : "The certificate e-mails sent for this workshop, and the notices of withdrawn certificates. Invitations are the owner's to read."
        }
      />
      <Panel>
        <MailList
          workshopId={me.activeWorkshop.id}
          messageHref={paths.app.outboxMessage.getHref}
          emptyAction={all ? <ButtonLink to={paths.app.members.getHref()}>Invite a member</ButtonLink> : undefined}
        />
      </Panel>
    </>
  );
}
