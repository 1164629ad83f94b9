/** What a unit certificate's row and a batch certificate's row share: who it went to, its e-mail, its withdrawal, its actions. */
import { useState, type ReactNode } from "react";
import type { CertificateSummaryBase } from "@shared/schemas/certificate";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { formatDateTime } from "@/lib/format";
import { certificatePdfHref } from "../api/get-certificates";
import { useResendCertificate } from "../api/resend-certificate";
import { WithdrawForm } from "./withdraw-form";

export function IssuedTo({ c }: { c: CertificateSummaryBase }) {
  return (
    <p className="text-caption text-ink-soft">
      Issued {formatDateTime(c.issuedAt)} to {c.recipientName ? `${c.recipientName} <${c.recipientEmail}>` : c.recipientEmail} · SHA-256 {c.pdfSha256.slice(0, 16)}…
    </p>
  );
}

export function MailState({ mail }: { mail: CertificateSummaryBase["mail"] }) {
  return (
    <p className="text-caption">
      {mail === null ? (
        <span className="text-ink-soft">Not e-mailed.</span>
      ) : mail.state === "sent" ? (
        <span className="text-moss-600">E-mail sent{mail.attempts > 1 ? ` (after ${mail.attempts} attempts)` : ""}.</span>
      ) : mail.state === "sending" ? (
        <span className="text-ink-soft">Sending the e-mail…</span>
      ) : (
        <span role="alert" className="font-medium text-rust-700">
          The e-mail failed: {mail.error ?? "no reason given"}. The certificate stays issued; send it again.
        </span>
      )}
    </p>
  );
}

export function WithdrawnNote({ withdrawn }: { withdrawn: CertificateSummaryBase["withdrawn"] }) {
  if (!withdrawn) return null;
  return (
    <p className="text-caption text-ink">
      <span className="font-semibold">Withdrawn</span> {formatDateTime(withdrawn.at)}
      {withdrawn.by ? ` by ${withdrawn.by}` : ""}: {withdrawn.reason}
    </p>
  );
}

const linkClass = "inline-flex min-h-9 items-center rounded-control border border-line-strong px-3 text-caption font-medium text-steel-700 hover:bg-steel-50";

type ActionsProps = {
  workshopId: string;
  /** The list the certificate is shown in, refreshed after a re-send. */
  listKey: readonly unknown[];
  c: CertificateSummaryBase;
  /** Only a current certificate is sent again or withdrawn. */
  current: boolean;
  canIssue: boolean;
  canWithdraw: boolean;
  children?: ReactNode;
};

/** PDF, verification page, re-send and withdraw (with its reason form); `children` adds more buttons. */
export function CertificateActions({ workshopId, listKey, c, current, canIssue, canWithdraw, children }: ActionsProps) {
  const resend = useResendCertificate(workshopId, listKey);
  const [withdrawing, setWithdrawing] = useState(false);
  return (
    <>
      {resend.isError ? <Alert tone="error">{resend.error.message}</Alert> : null}
      <div className="flex flex-wrap gap-2">
        <a href={certificatePdfHref(c.number)} target="_blank" rel="noreferrer" className={linkClass}>
          PDF
        </a>
        <a href={c.verifyUrl} target="_blank" rel="noreferrer" className={linkClass}>
          Verification page
        </a>
        {canIssue && current ? (
          <Button size="sm" variant="secondary" pending={resend.isPending} onClick={() => resend.mutate(c.number)}>
            Re-send
          </Button>
        ) : null}
        {children}
        {canWithdraw && current && !withdrawing ? (
          <Button size="sm" variant="danger" onClick={() => setWithdrawing(true)}>
            Withdraw…
          </Button>
        ) : null}
      </div>
      {withdrawing ? <WithdrawForm workshopId={workshopId} number={c.number} recipient={c.recipientName ?? c.recipientEmail} onDone={() => setWithdrawing(false)} /> : null}
    </>
  );
}
