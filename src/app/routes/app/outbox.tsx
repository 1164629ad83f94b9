import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router";
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
  assertCan(me, "mail", "read", "reading the outbox");
  await queryClient.ensureQueryData(getMailQueryOptions(me.activeWorkshop.id));
  return null;
};

export function OutboxRoute() {
  const me = useSignedInMe();
  return (
    <>
      <PageHeader
        title="Outbox"
        description="Mail sent by Tinelog for this workshop — invitations and certificates — exactly as it went out, with its attachments."
      />
      <Panel>
        <MailList
          workshopId={me.activeWorkshop.id}
          messageHref={paths.app.outboxMessage.getHref}
          emptyAction={<ButtonLink to={paths.app.members.getHref()}>Invite a member</ButtonLink>}
        />
      </Panel>
    </>
  );
}
