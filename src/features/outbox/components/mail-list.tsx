import type { ReactNode } from "react";
import { Link } from "react-router";
import { Alert } from "@/components/ui/alert";
import { EmptyState } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { formatDateTime } from "@/lib/format";
import { useMail } from "../api/get-mail";

type Props = { workshopId: string; messageHref: (id: string) => string; emptyAction?: ReactNode };

export function MailList({ workshopId, messageHref, emptyAction }: Props) {
  const mail = useMail(workshopId);
  if (mail.isPending) return <Spinner label="Loading the outbox…" />;
  if (mail.isError) return <Alert tone="error">{mail.error.message}</Alert>;
  if (mail.data.length === 0) {
    return (
      <EmptyState title="The outbox is empty" action={emptyAction}>
        Mail Tinelog sends for this workshop — invitations, test certificates and notices of withdrawn certificates — is listed here.
      </EmptyState>
    );
  }

  return (
    <ul className="divide-y divide-line" aria-label="Sent mail">
      {mail.data.map((message) => (
        <li key={message.id}>
          <Link
            to={messageHref(message.id)}
            className="flex flex-col gap-0.5 rounded-control px-2 py-3 hover:bg-steel-50 sm:flex-row sm:items-baseline sm:justify-between sm:gap-4"
          >
            <span className="min-w-0">
              <span className="block [overflow-wrap:anywhere] font-semibold text-steel-700">{message.subject || "(no subject)"}</span>
              <span className="block [overflow-wrap:anywhere] text-caption text-ink-soft">To {message.to.join(", ")}</span>
            </span>
            <span className="shrink-0 text-caption text-ink-faint">
              {formatDateTime(message.date)}
              {message.attachments.length ? ` · ${message.attachments.length} attachment${message.attachments.length === 1 ? "" : "s"}` : ""}
            </span>
          </Link>
        </li>
      ))}
    </ul>
  );
}
