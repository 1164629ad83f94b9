import clsx from "clsx";
import { useState } from "react";
import { Alert } from "@/components/ui/alert";
import { Spinner } from "@/components/ui/spinner";
import { formatBytes, formatDateTime } from "@/lib/format";
import { mailAttachmentHref, type MailMessage } from "../api/get-mail";
import { useMailHtml } from "../api/get-mail-html";

export function MailMessageView({ workshopId, message }: { workshopId: string; message: MailMessage }) {
  const [view, setView] = useState<"text" | "html">("text");
  const html = useMailHtml(workshopId, message.id, view === "html" && message.html !== null);

  return (
    <article aria-labelledby="mail-subject" className="flex flex-col gap-5">
      <header>
        <h2 id="mail-subject" className="text-title font-semibold">
          {message.subject || "(no subject)"}
        </h2>
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-0.5 text-caption">
          <dt className="text-ink-faint">From</dt>
          <dd className="break-all">{message.from}</dd>
          <dt className="text-ink-faint">To</dt>
          <dd className="break-all">{message.to.join(", ")}</dd>
          <dt className="text-ink-faint">Sent</dt>
          <dd>{formatDateTime(message.date)}</dd>
        </dl>
      </header>

      {message.html !== null ? (
        <div role="group" aria-label="Show the message as" className="inline-flex self-start rounded-control border border-line-strong p-0.5">
          {(["text", "html"] as const).map((option) => (
            <button
              key={option}
              type="button"
              aria-pressed={view === option}
              onClick={() => setView(option)}
              className={clsx("min-h-9 rounded-[0.4rem] px-3 text-caption font-medium", view === option ? "bg-steel-600 text-white" : "text-ink-soft hover:bg-sunken")}
            >
              {option === "text" ? "Plain text" : "Formatted (HTML)"}
            </button>
          ))}
        </div>
      ) : null}

      {view === "text" || message.html === null ? (
        <pre className="overflow-x-auto whitespace-pre-wrap break-words rounded-control border border-line bg-canvas p-4 font-sans text-body">{message.text || "(this message has no plain-text part)"}</pre>
      ) : html.isPending ? (
        <Spinner label="Loading the formatted message…" />
      ) : html.isError ? (
        <Alert tone="error">{html.error.message}</Alert>
      ) : (
        // sandbox without allow-scripts / allow-same-origin: the mail's HTML cannot run code or reach the app.
        <iframe title="Formatted message" sandbox="" srcDoc={html.data} className="h-[28rem] w-full rounded-control border border-line bg-white" />
      )}

      <section aria-labelledby="attachments-heading">
        <h3 id="attachments-heading" className="text-lead font-semibold">
          Attachments
        </h3>
        {message.attachments.length === 0 ? (
          <p className="mt-1 text-ink-soft">This message has no attachments.</p>
        ) : (
          <ul className="mt-2 divide-y divide-line rounded-control border border-line">
            {message.attachments.map((attachment) => (
              <li key={attachment.index} className="flex flex-wrap items-center justify-between gap-2 px-4 py-3">
                <span className="min-w-0">
                  <span className="block [overflow-wrap:anywhere] font-medium">{attachment.filename || `attachment-${attachment.index}`}</span>
                  <span className="block text-caption text-ink-faint">
                    {attachment.contentType} · {formatBytes(attachment.size)} · SHA-256 {attachment.sha256.slice(0, 12)}…
                  </span>
                </span>
                <a
                  href={mailAttachmentHref(message.id, attachment.index)}
                  download={attachment.filename || true}
                  className="inline-flex min-h-touch items-center rounded-control border border-line-strong px-4 font-medium text-steel-700 hover:bg-steel-50"
                >
                  Download
                </a>
              </li>
            ))}
          </ul>
        )}
      </section>
    </article>
  );
}
