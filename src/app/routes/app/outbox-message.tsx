import type { QueryClient } from "@tanstack/react-query";
import { Link, useParams, type LoaderFunctionArgs } from "react-router";
import { Panel } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { paths } from "@/config/paths";
import { getMailQueryOptions, useMailMessage } from "@/features/outbox/api/get-mail";
import { MailMessageView } from "@/features/outbox/components/mail-message";
import { ApiError } from "@/lib/api-client";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

const notFound = () => new ApiError(404, "not_found", "This message is not in the outbox of the active workshop. It may belong to another workshop.");

export const outboxMessageLoader = (queryClient: QueryClient) => async ({ request, params }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  assertCan(me, "mail", "read-certificates", "reading the outbox");
  const messages = await queryClient.ensureQueryData(getMailQueryOptions(me.activeWorkshop.id));
  if (!messages.some((message) => message.id === params.id)) throw notFound();
  return null;
};

export function OutboxMessageRoute() {
  const me = useSignedInMe();
  const { id = "" } = useParams();
  const message = useMailMessage(me.activeWorkshop.id, id);

  if (message.isPending) return <Spinner label="Loading the message…" />;
  if (message.isError) throw message.error;
  if (!message.data) throw notFound();

  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-4">
        <Link to={paths.app.outbox.getHref()} className="font-medium text-steel-700 underline underline-offset-2">
          ← Outbox
        </Link>
      </nav>
      <Panel>
        <MailMessageView workshopId={me.activeWorkshop.id} message={message.data} />
      </Panel>
    </>
  );
}
