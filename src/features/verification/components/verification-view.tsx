/**
 * The public verification page's body, laid out for a phone first (one column, the verdict and
 * the signature check at the top, results as a short list rather than a wide table). A withdrawn
 * certificate says so first, with when and why; a concession is stated where the verdict is.
 */
import clsx from "clsx";
import { decisionRuleWords, verdictWords, type LineResult, type Verdict } from "@shared/schemas/certificate";
import { Alert } from "@/components/ui/alert";
import { formatCents, formatDate, formatDateTime, formatNumber, formatUncertainty } from "@/lib/format";
import type { BatchVerification, UnitVerification, Verification } from "../api/get-verification";

const lineWords = { pass: "Pass", fail: "Fail", inconclusive: "Inconclusive" } as const;
const verdictColour = (v: Verdict) => (v === "within_tolerance" ? "text-moss-600" : v === "out_of_tolerance" ? "text-rust-700" : "text-ochre-600");
const lineColour = (r: LineResult) => (r === "pass" ? "text-moss-600" : r === "fail" ? "text-rust-700" : "text-ochre-600");

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
        <p className="text-caption font-semibold uppercase tracking-wide text-ink-faint">{v.kind === "batch" ? "Batch test certificate" : "Test certificate"}</p>
        <h1 id="cert-number" className="break-all text-heading font-semibold">
          {v.number}
        </h1>
        <p className="text-ink-soft">Issued by {v.workshop}</p>
      </header>

      {v.withdrawn ? (
        <Alert tone="error" title={`Withdrawn on ${formatDate(v.withdrawn.at)}`}>
          The workshop withdrew this certificate because: {v.withdrawn.reason} It is no longer valid; do not rely on it. Ask the workshop what replaces it.
        </Alert>
      ) : null}

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

      {v.kind === "unit" ? <UnitBody v={v} /> : <BatchBody v={v} />}

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

/** When it was measured and issued, and who authorised it (both kinds). */
function IssueFacts({ v }: { v: Verification }) {
  return (
    <>
      <dt className="text-ink-faint">Measured</dt>
      <dd>{v.measuredFrom.slice(0, 10) === v.measuredTo.slice(0, 10) ? formatDate(v.measuredFrom) : `${formatDate(v.measuredFrom)} – ${formatDate(v.measuredTo)}`}</dd>
      <dt className="text-ink-faint">Issued</dt>
      <dd>{formatDateTime(v.issuedAt)}</dd>
      <dt className="text-ink-faint">Authorised by</dt>
      <dd>
        {v.authorisedBy.name} ({v.authorisedBy.role})
      </dd>
    </>
  );
}

function ResultLines({ results }: { results: UnitVerification["results"] }) {
  return (
    <ul className="divide-y divide-line rounded-control border border-line">
      {results.map((r) => (
        <li key={r.label} className="flex flex-col gap-0.5 px-4 py-3">
          <div className="flex items-center justify-between gap-2">
            <span className="font-semibold">{r.label}</span>
            <span className={clsx("text-caption font-semibold", lineColour(r.result))}>{lineWords[r.result]}</span>
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
  );
}

function UnitBody({ v }: { v: UnitVerification }) {
  return (
    <>
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
      {v.concession ? (
        <Alert tone="caution" title="Released under a concession">
          The item does not conform in: {v.concession.departures.join("; ")}. The workshop recorded on {formatDate(v.concession.decidedAt)} that it is released as it is, because: {v.concession.reason}
        </Alert>
      ) : null}

      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-2">
        <dt className="text-ink-faint">Unit</dt>
        <dd className="font-semibold break-all">{v.unit}</dd>
        <dt className="text-ink-faint">Product</dt>
        <dd>{v.product}</dd>
        <IssueFacts v={v} />
        <dt className="text-ink-faint">Verdict</dt>
        <dd className={clsx("font-semibold", verdictColour(v.verdict))}>
          {verdictWords[v.verdict]}
          {v.concession ? <span className="font-normal text-ink-soft"> — released under a concession</span> : null}
        </dd>
      </dl>

      <section aria-labelledby="results-heading">
        <h2 id="results-heading" className="text-title font-semibold">
          Results
        </h2>
        <div className="mt-2">
          <ResultLines results={v.results} />
        </div>
        <p className="mt-2 text-caption text-ink-soft">{decisionRuleWords[v.decisionRule]}</p>
      </section>
    </>
  );
}

function BatchBody({ v }: { v: BatchVerification }) {
  const conceded = v.units.filter((u) => u.concession).length;
  return (
    <>
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-2">
        <dt className="text-ink-faint">Batch</dt>
        <dd className="font-semibold break-all">{v.batch}</dd>
        <dt className="text-ink-faint">Product</dt>
        <dd>{v.product}</dd>
        <dt className="text-ink-faint">Units covered</dt>
        <dd>
          {v.units.length}
          {conceded ? `, ${conceded} under a concession` : ""}
          {v.excluded.length ? `; ${v.excluded.length} not covered` : ""}
        </dd>
        <IssueFacts v={v} />
      </dl>
      <p className="text-ink">{v.statementOfConformity}</p>

      <section aria-labelledby="units-heading">
        <h2 id="units-heading" className="text-title font-semibold">
          Units
        </h2>
        <ul aria-label="Units covered" className="mt-2 flex flex-col gap-3">
          {v.units.map((u) => (
            <li key={u.serial} className="flex flex-col gap-1">
              <p className="flex items-center justify-between gap-2">
                <span className="font-semibold">{u.serial}</span>
                <span className={clsx("text-caption font-semibold", verdictColour(u.verdict))}>
                  {verdictWords[u.verdict]}
                  {u.concession ? " — concession" : ""}
                </span>
              </p>
              {u.concession ? (
                <p className="text-caption text-ink-soft">
                  Departs in {u.concession.departures.join("; ")}; released as it is because: {u.concession.reason}
                </p>
              ) : null}
              <ResultLines results={u.results} />
            </li>
          ))}
        </ul>
        {v.excluded.length ? (
          <p className="mt-3 text-caption text-ink-soft">Not covered by this certificate: {v.excluded.map((e) => `${e.serial} (${e.reason})`).join(", ")}.</p>
        ) : null}
        <p className="mt-2 text-caption text-ink-soft">{decisionRuleWords[v.decisionRule]}</p>
      </section>
    </>
  );
}
