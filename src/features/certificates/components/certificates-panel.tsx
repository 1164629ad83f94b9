/**
 * Certificates of a unit: preview, issue, amend, re-send and withdraw, with their state.
 * Issuing is for qa and owner once the batch is released and the unit's decision allows a
 * certificate; everyone in the workshop sees the list.
 */
import { zodResolver } from "@hookform/resolvers/zod";
import { useEffect, useState } from "react";
import { useForm } from "react-hook-form";
import { Link } from "react-router";
import { issueCertificateSchema, type Concession, type IssueCertificateInput } from "@shared/schemas/certificate";
import { verdictLabels } from "@shared/schemas/evaluation";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField, TextAreaField } from "@/components/ui/field";
import { Badge, EmptyState } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { isApiError } from "@/lib/api-client";
import { applyServerErrors } from "@/lib/form-errors";
import { certificatesKey, useCertificates, type CertificateListItem } from "../api/get-certificates";
import { useIssueCertificate } from "../api/issue-certificate";
import { usePreviewCertificate } from "../api/preview-certificate";
import { CertificateActions, IssuedTo, MailState, WithdrawnNote } from "./certificate-row-parts";

type Props = {
  workshopId: string;
  unitId: string;
  customer: { name: string | null; email: string | null };
  canIssue: boolean;
  canWithdraw: boolean;
  /** Why issuing is not possible (batch not released, scrapped, out of tolerance without a concession), or null when it is. */
  blockedReason: string | null;
  /** The concession the unit is released under; its certificate states it. */
  concession: Concession | null;
  /** Whether the unit's batch is released. */
  released: boolean;
  settingsHref?: string;
};

export function CertificatesPanel({ workshopId, unitId, customer, canIssue, canWithdraw, blockedReason, concession, released, settingsHref }: Props) {
  const certificates = useCertificates(workshopId, unitId);
  const [amending, setAmending] = useState<string | null>(null);
  const [issuing, setIssuing] = useState(false);
  const [lastIssued, setLastIssued] = useState<string | null>(null);
  const current = certificates.data?.filter((c) => c.state === "current") ?? [];
  // With a current certificate, a further one is a deliberate step, not the form left open.
  const showIssueForm = issuing || (certificates.isSuccess && current.length === 0);
  const done = (number: string | null) => {
    setLastIssued(number);
    setIssuing(false);
    setAmending(null);
  };

  return (
    <div className="flex flex-col gap-5">
      {lastIssued ? <Alert tone="success">Certificate {lastIssued} issued; the e-mail to the recipient is listed below.</Alert> : null}
      {concession && !blockedReason ? (
        <Alert tone="caution" title="Released under a concession">
          The certificate states it in its statement of conformity: departs in {concession.departures.join("; ")}. Reason recorded: {concession.reason}
        </Alert>
      ) : null}
      {canIssue ? (
        blockedReason ? (
          <Alert tone="info">{blockedReason}</Alert>
        ) : amending ? (
          <IssueForm
            key={`amend-${amending}`}
            workshopId={workshopId}
            unitId={unitId}
            // An amendment goes to the same recipient unless changed.
            customer={amendedRecipient(certificates.data, amending) ?? customer}
            amendsNumber={amending}
            onIssued={done}
            onCancel={() => setAmending(null)}
            settingsHref={settingsHref}
          />
        ) : showIssueForm ? (
          <IssueForm key="issue" workshopId={workshopId} unitId={unitId} customer={customer} onIssued={done} onCancel={current.length > 0 ? () => setIssuing(false) : undefined} settingsHref={settingsHref} />
        ) : certificates.isSuccess ? (
          <div>
            <Button variant="secondary" onClick={() => { setLastIssued(null); setIssuing(true); }}>
              Issue a further certificate…
            </Button>
          </div>
        ) : null
      ) : null}

      {certificates.isPending ? (
        <Spinner label="Loading certificates…" />
      ) : certificates.isError ? (
        <Alert tone="error">{certificates.error.message}</Alert>
      ) : certificates.data.length === 0 ? (
        <EmptyState title="No certificates for this unit">
          {released && blockedReason
            ? "None has been issued."
            : canIssue
              ? `${released ? "Issue a certificate above" : "Once the batch is released, issue a certificate here"}: it is e-mailed to the customer as a PDF with a verification link.`
              : "A quality member issues certificates once the batch is released."}
        </EmptyState>
      ) : (
        <ul aria-label="Certificates" className="divide-y divide-line rounded-control border border-line">
          {certificates.data.map((c) => (
            <CertificateRow
              key={c.id}
              workshopId={workshopId}
              unitId={unitId}
              certificate={c}
              canIssue={canIssue}
              canWithdraw={canWithdraw}
              onAmend={current.some((x) => x.number === c.number) && !blockedReason ? () => setAmending(c.number) : undefined}
            />
          ))}
        </ul>
      )}
    </div>
  );
}

function amendedRecipient(list: CertificateListItem[] | undefined, number: string) {
  const c = list?.find((x) => x.number === number);
  return c ? { name: c.recipientName, email: c.recipientEmail } : null;
}

function IssueForm({
  workshopId,
  unitId,
  customer,
  amendsNumber,
  onIssued,
  onCancel,
  settingsHref,
}: {
  workshopId: string;
  unitId: string;
  customer: { name: string | null; email: string | null };
  amendsNumber?: string;
  onIssued: (number: string) => void;
  onCancel?: () => void;
  settingsHref?: string;
}) {
  const issue = useIssueCertificate(workshopId, unitId);
  const preview = usePreviewCertificate(unitId);
  const [formError, setFormError] = useState<string | null>(null);
  const [previewUrl, setPreviewUrl] = useState<string | null>(null);
  const [needsProfile, setNeedsProfile] = useState(false);
  const form = useForm<IssueCertificateInput>({
    resolver: zodResolver(issueCertificateSchema),
    defaultValues: { recipientEmail: customer.email ?? "", recipientName: customer.name ?? undefined, amendsNumber, amendReason: amendsNumber ? "" : undefined },
  });
  const { errors } = form.formState;

  // A blob URL holds the PDF in memory until revoked: free the old one whenever it is replaced.
  useEffect(() => () => void (previewUrl && URL.revokeObjectURL(previewUrl)), [previewUrl]);

  const fail = (error: unknown) => {
    const message = applyServerErrors(error, form.setError, ["recipientEmail", "recipientName", "amendReason"]);
    setNeedsProfile(isApiError(error) && /profile|address|sending|settings/i.test(error.message));
    setFormError(message);
  };

  const clean = (values: IssueCertificateInput): IssueCertificateInput => ({
    recipientEmail: values.recipientEmail,
    recipientName: values.recipientName?.trim() ? values.recipientName.trim() : undefined,
    ...(amendsNumber ? { amendsNumber, amendReason: values.amendReason } : {}),
  });

  const onPreview = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      const blob = await preview.mutateAsync(clean(values));
      setPreviewUrl(URL.createObjectURL(blob));
    } catch (error) {
      fail(error);
    }
  });

  const onIssue = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      const result = await issue.mutateAsync(clean(values));
      setPreviewUrl(null);
      onIssued(result.number);
    } catch (error) {
      fail(error);
    }
  });

  return (
    <form onSubmit={onIssue} noValidate aria-label={amendsNumber ? `Amend certificate ${amendsNumber}` : "Issue a certificate"} className="flex flex-col gap-3">
      <h3 className="text-lead font-semibold">{amendsNumber ? `Amend certificate ${amendsNumber}` : "Issue a certificate"}</h3>
      {amendsNumber ? <p className="text-caption text-ink-soft">The amendment gets a new number and says which certificate it replaces; {amendsNumber} stays retrievable, marked superseded.</p> : null}
      {formError ? (
        <Alert tone="error">
          {formError}
          {needsProfile && settingsHref ? (
            <>
              {" "}
              <Link to={settingsHref} className="font-semibold underline underline-offset-2">
                Complete the workshop settings
              </Link>
              .
            </>
          ) : null}
        </Alert>
      ) : null}
      <div className="grid gap-3 sm:grid-cols-2">
        <InputField label="Recipient e-mail" type="email" autoComplete="off" error={errors.recipientEmail?.message} {...form.register("recipientEmail")} />
        <InputField
          label="Recipient name"
          autoComplete="off"
          error={errors.recipientName?.message}
          {...form.register("recipientName", { setValueAs: (v: string) => (v?.trim() ? v : undefined) })}
        />
      </div>
      {amendsNumber ? <TextAreaField label="Reason for the amendment" rows={2} error={errors.amendReason?.message} {...form.register("amendReason")} /> : null}
      <div className="flex flex-wrap gap-2">
        <Button variant="secondary" pending={preview.isPending} onClick={() => void onPreview()}>
          Preview
        </Button>
        <Button type="submit" pending={issue.isPending}>
          {amendsNumber ? "Issue amendment" : "Issue"}
        </Button>
        {onCancel ? (
          <Button variant="quiet" onClick={onCancel}>
            Cancel
          </Button>
        ) : null}
      </div>
      {previewUrl ? (
        <div className="flex flex-col gap-2">
          <p className="text-caption text-ink-soft">Preview — nothing has been stored or sent yet.</p>
          <iframe title="Certificate preview" src={previewUrl} className="h-[36rem] w-full rounded-control border border-line bg-white" />
        </div>
      ) : null}
    </form>
  );
}

type RowProps = { workshopId: string; unitId: string; certificate: CertificateListItem; canIssue: boolean; canWithdraw: boolean; onAmend?: () => void };

function CertificateRow({ workshopId, unitId, certificate: c, canIssue, canWithdraw, onAmend }: RowProps) {
  return (
    <li className="flex flex-col gap-2 px-4 py-3">
      <div className="flex flex-wrap items-center gap-2">
        <span className={c.state === "withdrawn" ? "font-semibold line-through" : "font-semibold"}>{c.number}</span>
        {c.state === "current" ? <Badge tone="moss">Current</Badge> : c.state === "withdrawn" ? <Badge tone="rust">Withdrawn</Badge> : <Badge>Superseded{c.supersededBy ? ` by ${c.supersededBy}` : ""}</Badge>}
        <Badge tone="steel">{verdictLabels[c.verdict]}</Badge>
        {c.concession ? <Badge tone="ochre">Concession</Badge> : null}
        {c.amends ? <span className="text-caption text-ink-soft">amends {c.amends}</span> : null}
      </div>
      <WithdrawnNote withdrawn={c.withdrawn} />
      <IssuedTo c={c} />
      <MailState mail={c.mail} />
      <CertificateActions workshopId={workshopId} listKey={certificatesKey(workshopId, unitId)} c={c} current={c.state === "current"} canIssue={canIssue} canWithdraw={canWithdraw}>
        {canIssue && onAmend ? (
          <Button size="sm" variant="quiet" onClick={onAmend}>
            Amend…
          </Button>
        ) : null}
      </CertificateActions>
    </li>
  );
}
