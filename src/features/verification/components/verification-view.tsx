/**
 * The public verification page's body, laid out for a phone first (one column, the verdict and
 * the signature check at the top, results as a short list rather than a wide table).
 */
import clsx from "clsx";
import { decisionRuleWords, verdictWords } from "@shared/schemas/certificate";
import { Alert } from "@/components/ui/alert";
import { formatCents, formatDate, formatDateTime, formatNumber, formatUncertainty } from "@/lib/format";
import type { Verification } from "../api/get-verification";

const lineWords = { pass: "Pass", fail: "Fail", inconclusive: "Inconclusive" } as const;

/**
 * For a code that matches no certificate. Spoken to the customer holding the link: what may have
 * gone wrong, what to try, and whom to ask — nothing about signing in or a dashboard.
 */
export function VerificationNotFound() {
  return (
    <article aria-labelledby="not-found-heading" className="flex flex-col gap-3">
      <h1 id="not-found-heading" className="text-heading font-semibold">
        Certificate not found
      </h1>
      <p>This link does not match any certificate issued through Tinelog.</p>
      <ul className="list-disc pl-5 text-ink-soft">
        <li>Open the link from the e-mail again, or scan the QR code on the certificate: a link copied by hand may miss a character.</li>
        <li>If it still is not found, contact the workshop that issued the certificate and quote the certificate number printed on it. Until then, do not rely on the document.</li>
      </ul>
    </article>
  );
}

export function VerificationView({ v }: { v: Verification }) {
  const trusted = v.signatureValid && v.pdfIntact;
  return (
    <article aria-labelledby="cert-number" className="flex flex-col gap-5">
      <header>
        <p className="text-caption font-semibold uppercase tracking-wide text-ink-faint">Test certificate</p>
        <h1 id="cert-number" className="break-all text-heading font-semibold">
          {v.number}
        </h1>
        <p className="text-ink-soft">Issued by {v.workshop}</p>
      </header>

      {trusted ? (
        <Alert tone="success" title="Signature verified">
          This certificate was issued by {v.workshop} through Tinelog and has not been changed since: its {v.signatureAlgorithm} signature checks out and the stored PDF matches its hash.
        </Alert>
      ) : (
        <Alert tone="error" title="Warning: this certificate could not be verified">
          {!v.signatureValid
            ? "Its signature does not match its content, so the data may have been altered. Do not rely on it; ask the workshop for a new copy."
            : "The stored PDF no longer matches the hash recorded when it was issued. Do not rely on a copy; ask the workshop."}
        </Alert>
      )}

      {v.superseded ? (
        <Alert tone="caution" title="Superseded">
          This certificate was replaced{v.supersededBy ? ` by certificate ${v.supersededBy}` : ""}. Ask the workshop for the current one.
        </Alert>
      ) : null}
      {v.amends ? (
        <Alert tone="info" title={`Amends certificate ${v.amends.number}`}>
          Reason: {v.amends.reason}
        </Alert>
      ) : null}

      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-2">
        <dt className="text-ink-faint">Unit</dt>
        <dd className="font-semibold break-all">{v.unit}</dd>
        <dt className="text-ink-faint">Product</dt>
        <dd>{v.product}</dd>
        <dt className="text-ink-faint">Measured</dt>
        <dd>{v.measuredFrom.slice(0, 10) === v.measuredTo.slice(0, 10) ? formatDate(v.measuredFrom) : `${formatDate(v.measuredFrom)} – ${formatDate(v.measuredTo)}`}</dd>
        <dt className="text-ink-faint">Issued</dt>
        <dd>{formatDateTime(v.issuedAt)}</dd>
        <dt className="text-ink-faint">Authorised by</dt>
        <dd>
          {v.authorisedBy.name} ({v.authorisedBy.role})
        </dd>
        <dt className="text-ink-faint">Verdict</dt>
        <dd className={clsx("font-semibold", v.verdict === "within_tolerance" ? "text-moss-600" : v.verdict === "out_of_tolerance" ? "text-rust-700" : "text-ochre-600")}>{verdictWords[v.verdict]}</dd>
      </dl>

      <section aria-labelledby="results-heading">
        <h2 id="results-heading" className="text-title font-semibold">
          Results
        </h2>
        <ul className="mt-2 divide-y divide-line rounded-control border border-line">
          {v.results.map((r) => (
            <li key={r.label} className="flex flex-col gap-0.5 px-4 py-3">
              <div className="flex items-center justify-between gap-2">
                <span className="font-semibold">{r.label}</span>
                <span className={clsx("text-caption font-semibold", r.result === "pass" ? "text-moss-600" : r.result === "fail" ? "text-rust-700" : "text-ochre-600")}>{lineWords[r.result]}</span>
              </div>
              <span className="tabular-nums">
                {formatNumber(r.measuredHz, 3)} Hz ± {formatUncertainty(r.expandedUncertaintyHz, 0.001)} Hz (k = 2)
              </span>
              <span className="text-caption text-ink-soft tabular-nums">
                Deviation {formatCents(r.deviationCents)}, tolerance ± {r.toleranceCents} ¢
              </span>
            </li>
          ))}
        </ul>
        <p className="mt-2 text-caption text-ink-soft">{decisionRuleWords[v.decisionRule]}</p>
      </section>

      <section aria-labelledby="integrity-heading" className="text-caption">
        <h2 id="integrity-heading" className="text-lead font-semibold">
          Integrity
        </h2>
        <p className="mt-1 text-ink-soft">SHA-256 of the certificate PDF — compare it with the file you hold (e.g. <code>sha256sum file.pdf</code>):</p>
        <p className="mt-1 break-all rounded-control bg-sunken px-3 py-2 font-mono">{v.pdfSha256}</p>
        <p className="mt-1 text-ink-faint">
          Signed with {v.signatureAlgorithm}, key {v.signingKeyId}.
        </p>
      </section>
    </article>
  );
}
