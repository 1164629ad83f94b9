/**
 * Certificates of a released batch: every unit's own certificate issued at once, each to its unit's
 * customer (what will be skipped is listed first, progress shows as they go, a summary at the end),
 * and the batch certificate, one signed document for a consignment.
 */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Link } from "react-router";
import { issueBatchCertificateSchema, type IssueBatchCertificateInput } from "@shared/schemas/batch-certificate";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField } from "@/components/ui/field";
import { Badge, EmptyState } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { applyServerErrors } from "@/lib/form-errors";
import { useBatchCertificates, type BatchCertificateItem } from "../api/get-batch-certificates";
import { batchCertificatesKey, useUnitCertificatePlan } from "../api/get-unit-certificate-plan";
import { useIssueBatchCertificate } from "../api/issue-batch-certificate";
import { useIssueUnitCertificates, type IssueOutcome, type RunLine } from "../api/issue-unit-certificates";
import { CertificateActions, IssuedTo, MailState, WithdrawnNote } from "./certificate-row-parts";

type Props = { workshopId: string; batchId: string; batchCode: string; canIssue: boolean; canWithdraw: boolean; unitHref: (id: string) => string };

export function BatchCertificatesPanel(props: Props) {
  return (
    <div className="flex flex-col gap-8">
      {props.canIssue ? <UnitCertificatesRun {...props} /> : null}
      <BatchCertificates {...props} />
    </div>
  );
}

function UnitCertificatesRun({ workshopId, batchId, unitHref }: Props) {
  const plan = useUnitCertificatePlan(workshopId, batchId);
  const [lines, setLines] = useState<IssueOutcome[]>([]);
  const [progress, setProgress] = useState<{ done: number; total: number } | null>(null);
  const [summary, setSummary] = useState<Extract<RunLine, { type: "summary" }> | null>(null);
  const [stopped, setStopped] = useState<string | null>(null);
  const run = useIssueUnitCertificates(workshopId, batchId, (line) => {
    if (line.type === "progress") {
      setProgress({ done: line.done, total: line.total });
      setLines((l) => [...l, line]);
    } else if (line.type === "summary") setSummary(line);
    else setStopped(line.message);
  });
  if (plan.isPending) return <Spinner label="Checking which units may have a certificate…" />;
  if (plan.isError) return <Alert tone="error">{plan.error.message}</Alert>;
  const toIssue = plan.data.filter((p) => p.action === "issue");
  const skipped = plan.data.filter((p) => p.action === "skip");
  const start = () => {
    setLines([]);
    setSummary(null);
    setStopped(null);
    setProgress({ done: 0, total: plan.data.length });
    run.mutate();
  };

  return (
    <section aria-labelledby="unit-certs-heading" className="flex flex-col gap-3">
      <h3 id="unit-certs-heading" className="text-lead font-semibold">
        Each unit's certificate
      </h3>
      {summary ? (
        <Alert tone={summary.failed ? "caution" : "success"} title="Done">
          {summary.issued} certificate{summary.issued === 1 ? "" : "s"} issued and e-mailed, {summary.skipped} unit{summary.skipped === 1 ? "" : "s"} skipped
          {summary.failed ? `, ${summary.failed} failed (listed below; issue them from the unit's page)` : ""}.
        </Alert>
      ) : run.isPending || progress ? null : (
        <p className="text-ink-soft">
          {toIssue.length
            ? `${toIssue.length} unit${toIssue.length === 1 ? "" : "s"} can get ${toIssue.length === 1 ? "its" : "their"} certificate now, each sent to the unit's customer.`
            : "No unit is waiting for a certificate."}
          {skipped.length ? ` ${skipped.length} will be skipped:` : ""}
        </p>
      )}
      {stopped ? <Alert tone="error">{stopped}</Alert> : null}
      {run.isError ? <Alert tone="error">{run.error.message}</Alert> : null}
      {!progress && skipped.length ? (
        <ul aria-label="Units skipped" className="max-h-60 divide-y divide-line overflow-y-auto rounded-control border border-line text-caption">
          {skipped.map((p) => (
            <li key={p.unitId} className="flex flex-wrap gap-x-3 px-3 py-2">
              <Link to={unitHref(p.unitId)} className="font-semibold text-steel-700 underline underline-offset-2">
                {p.serial}
              </Link>
              <span className="text-ink-soft">{p.reason}</span>
            </li>
          ))}
        </ul>
      ) : null}
      {progress ? (
        <div className="flex flex-col gap-2">
          <div className="flex items-center gap-3 text-caption">
            <span
              role="progressbar"
              aria-label="Units done"
              aria-valuemin={0}
              aria-valuemax={progress.total}
              aria-valuenow={progress.done}
              className="h-2 w-full max-w-md overflow-hidden rounded-full bg-sunken"
            >
              <span className="block h-full rounded-full bg-steel-500 transition-[width]" style={{ width: `${(progress.done / Math.max(1, progress.total)) * 100}%` }} />
            </span>
            <span className="whitespace-nowrap tabular-nums" aria-live="polite">
              {progress.done} of {progress.total} units
            </span>
          </div>
          <ol aria-label="Issue progress" className="max-h-72 divide-y divide-line overflow-y-auto rounded-control border border-line text-caption">
            {lines.map((o) => (
              <li key={o.unitId} className="flex flex-wrap items-center gap-x-3 px-3 py-1.5">
                <span className="font-semibold">{o.serial}</span>
                {o.outcome === "issued" ? <Badge tone="moss">Issued {o.number}</Badge> : o.outcome === "failed" ? <Badge tone="rust">Failed</Badge> : <Badge>Skipped</Badge>}
                {o.reason ? <span className="text-ink-soft">{o.reason}</span> : null}
                {o.outcome === "issued" && o.mail && o.mail !== "sent" ? <span className="text-rust-700">e-mail {o.mail}</span> : null}
              </li>
            ))}
          </ol>
        </div>
      ) : null}
      {toIssue.length && !run.isPending && !summary ? (
        <div>
          <Button onClick={start}>
            Issue {toIssue.length} certificate{toIssue.length === 1 ? "" : "s"}
          </Button>
        </div>
      ) : run.isPending ? (
        <Spinner size="sm" label="Issuing… keep this page open." />
      ) : null}
    </section>
  );
}

function BatchCertificates({ workshopId, batchId, batchCode, canIssue, canWithdraw }: Props) {
  const list = useBatchCertificates(workshopId, batchId);
  const issue = useIssueBatchCertificate(workshopId, batchId);
  const [formError, setFormError] = useState<string | null>(null);
  const [issued, setIssued] = useState<string | null>(null);
  const form = useForm<IssueBatchCertificateInput>({ resolver: zodResolver(issueBatchCertificateSchema), defaultValues: { recipientEmail: "" } });
  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      const res = await issue.mutateAsync({ recipientEmail: values.recipientEmail, recipientName: values.recipientName?.trim() ? values.recipientName.trim() : undefined });
      setIssued(res.number);
      form.reset({ recipientEmail: "", recipientName: "" });
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, ["recipientEmail", "recipientName"]));
    }
  });

  return (
    <section aria-labelledby="batch-cert-heading" className="flex flex-col gap-3">
      <h3 id="batch-cert-heading" className="text-lead font-semibold">
        Batch certificate
      </h3>
      <p className="text-ink-soft">One signed document for a consignment: every unit of {batchCode} that may carry a certificate, with its results and uncertainties, and the units it does not cover.</p>
      {issued ? <Alert tone="success">Batch certificate {issued} issued; the e-mail to the recipient is listed below.</Alert> : null}
      {canIssue ? (
        <form onSubmit={onSubmit} noValidate aria-label="Issue a batch certificate" className="flex flex-col gap-3">
          {formError ? <Alert tone="error">{formError}</Alert> : null}
          <div className="grid gap-3 sm:grid-cols-2">
            <InputField label="Recipient e-mail" type="email" autoComplete="off" error={form.formState.errors.recipientEmail?.message} {...form.register("recipientEmail")} />
            <InputField label="Recipient name" autoComplete="off" error={form.formState.errors.recipientName?.message} {...form.register("recipientName", { setValueAs: (v: string) => (v?.trim() ? v : undefined) })} />
          </div>
          <div>
            <Button type="submit" pending={issue.isPending}>
              Issue batch certificate
            </Button>
          </div>
        </form>
      ) : null}
      {list.isPending ? (
        <Spinner label="Loading batch certificates…" />
      ) : list.isError ? (
        <Alert tone="error">{list.error.message}</Alert>
      ) : list.data.length === 0 ? (
        <EmptyState title="No batch certificate yet">{canIssue ? "Issue one above for the customer who receives the batch." : "A quality member issues it for the customer who receives the batch."}</EmptyState>
      ) : (
        <ul aria-label="Batch certificates" className="divide-y divide-line rounded-control border border-line">
          {list.data.map((c) => (
            <BatchCertificateRow key={c.id} workshopId={workshopId} batchId={batchId} certificate={c} canIssue={canIssue} canWithdraw={canWithdraw} />
          ))}
        </ul>
      )}
    </section>
  );
}

function BatchCertificateRow({ workshopId, batchId, certificate: c, canIssue, canWithdraw }: { workshopId: string; batchId: string; certificate: BatchCertificateItem; canIssue: boolean; canWithdraw: boolean }) {
  return (
    <li className="flex flex-col gap-2 px-4 py-3">
      <div className="flex flex-wrap items-center gap-2">
        <span className={c.state === "withdrawn" ? "font-semibold line-through" : "font-semibold"}>{c.number}</span>
        {c.state === "current" ? <Badge tone="moss">Current</Badge> : <Badge tone="rust">Withdrawn</Badge>}
        <span className="text-caption text-ink-soft">
          {c.units} unit{c.units === 1 ? "" : "s"}
          {c.concessions ? `, ${c.concessions} under a concession` : ""}
          {c.excluded ? `, ${c.excluded} not covered` : ""}
        </span>
      </div>
      <WithdrawnNote withdrawn={c.withdrawn} />
      <IssuedTo c={c} />
      <MailState mail={c.mail} />
      <CertificateActions workshopId={workshopId} listKey={batchCertificatesKey(workshopId, batchId)} c={c} current={c.state === "current"} canIssue={canIssue} canWithdraw={canWithdraw} />
    </li>
  );
}
