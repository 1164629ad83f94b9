/** The unit's verdict against its spec version, with each requirement as measured (strikes combined). */
import clsx from "clsx";
import { decisionRuleLabels } from "@shared/schemas/spec";
import type { CheckResult, EvaluationView as Evaluation, RequirementResult } from "@shared/schemas/evaluation";
import { t60ExtrapolatedFrom } from "@shared/physics";
import { Badge, EmptyState } from "@/components/ui/panel";
import { VerdictBadge } from "@/components/ui/status-badges";
import { formatCents, formatDateTime, formatNumber, formatUncertainty } from "@/lib/format";

const resultWords: Record<CheckResult, string> = { pass: "Pass", fail: "Fail", inconclusive: "Inconclusive", not_found: "Not found", not_checked: "Not checked" };
const resultTone = { pass: "moss", fail: "rust", inconclusive: "ochre", not_found: "rust", not_checked: "neutral" } as const;

export function ResultBadge({ result }: { result: CheckResult }) {
  return <Badge tone={resultTone[result]}>{resultWords[result]}</Badge>;
}

/** "2 strikes (1 required)", "1 strike (3 required)". */
export function strikesWords(used: number, required: number): string {
  return `${used} ${used === 1 ? "strike" : "strikes"} (${required} required)`;
}

export function EvaluationPanel({ evaluation, pending, referenceTemperatureC = 20 }: { evaluation: Evaluation | null; pending: boolean; referenceTemperatureC?: number }) {
  if (!evaluation) {
    return (
      <EmptyState title={pending ? "Waiting for the analysis" : "No evaluation yet"}>
        {pending ? "The verdict appears here as soon as the strike has been analysed." : "Upload a strike of this unit: it is evaluated against its specification version as soon as the analysis is done."}
      </EmptyState>
    );
  }
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center gap-3">
        <span className="text-lead font-semibold">Verdict:</span>
        <VerdictBadge verdict={evaluation.verdict} />
        <span className="text-caption text-ink-soft">
          {strikesWords(evaluation.strikesUsed, evaluation.strikesRequired)} · {decisionRuleLabels[evaluation.decisionRule].split(" (")[0]}
          {evaluation.temperatureCorrected ? ` · corrected to ${referenceTemperatureC} °C` : ""} · {formatDateTime(evaluation.createdAt)}
        </span>
      </div>
      {evaluation.reasons.length > 0 ? (
        <ul className="list-disc pl-6 text-ink-soft" aria-label="Reasons">
          {evaluation.reasons.map((reason) => (
            <li key={reason}>{reason}</li>
          ))}
        </ul>
      ) : null}
      <div className="overflow-x-auto">
        <table className="w-full text-left text-caption">
          <caption className="sr-only">Requirements as measured</caption>
          <thead className="border-b border-line-strong text-ink-soft">
            <tr>
              {["Partial", "Result", evaluation.temperatureCorrected ? `Measured at ${referenceTemperatureC}\u00a0°C ± U (k\u00a0=\u00a02)` : "Measured ± U (k = 2)", "Target", "Deviation ± U (k = 2)", "T60 ± U (k = 2)", "Q", "Beat"].map((h, i) => (
                <th key={h} scope="col" className={clsx("py-2 pr-3 align-bottom font-semibold", i > 1 && "text-right")}>
                  {h}
                </th>
              ))}
            </tr>
          </thead>
          <tbody className="divide-y divide-line">
            {evaluation.requirements.map((r) => (
              <RequirementRow key={r.label} r={r} repeatsReason={r.note !== null && evaluation.reasons.some((reason) => reason.includes(r.note as string))} />
            ))}
          </tbody>
        </table>
      </div>
      <p className="text-caption text-ink-faint">
        U is the expanded uncertainty with coverage factor k = 2 (about 95 %): the fit, the scatter between strikes
        {evaluation.traceability
          ? ", the recording clock and the thermometer — from their calibrations where they had one, else the assumed tolerances (see below)"
          : evaluation.assumptions
            ? `, the recording clock (± ${evaluation.assumptions.clockHalfWidthPpm} ppm) and the thermometer (± ${evaluation.assumptions.thermometerHalfWidthC ?? 0.5} °C, when a temperature was given)`
            : ""}
        . Deviations are 1200·log₂(measured / target) cents.
      </p>
    </div>
  );
}

function RequirementRow({ r, repeatsReason }: { r: RequirementResult; repeatsReason: boolean }) {
  const failed = (c: CheckResult) => (c === "fail" || c === "not_found" ? "font-semibold text-rust-700" : undefined);
  return (
    <>
      <tr>
        <th scope="row" className="py-2 pr-3 font-medium">
          {r.label}
          {!r.required ? <span className="ml-1 font-normal text-ink-faint">(optional)</span> : null}
        </th>
        <td className="py-2 pr-3">
          <ResultBadge result={r.result} />
        </td>
        <td className="whitespace-nowrap py-2 pr-3 text-right tabular-nums">
          {r.measuredHz != null ? `${formatNumber(r.measuredHz, 3)} ± ${formatUncertainty(r.expandedUncertaintyHz, 0.001)} Hz` : "—"}
        </td>
        <td className="whitespace-nowrap py-2 pr-3 text-right tabular-nums">
          {r.targetHz != null ? `${formatNumber(r.targetHz, 3)} Hz` : "—"}
          {r.targetRatio != null ? <span className="block text-ink-faint">{formatNumber(r.targetRatio, 3)} × f₁</span> : null}
          {r.measuredRatio != null ? <span className="block text-ink-faint">measured {formatNumber(r.measuredRatio, 3)} ×</span> : null}
        </td>
        <td className={clsx("whitespace-nowrap py-2 pr-3 text-right tabular-nums", failed(r.pitch))}>
          {r.deviationCents != null ? `${formatCents(r.deviationCents)} ± ${formatUncertainty(r.deviationUncertaintyCents, 0.01)}` : "—"}
          <span className="block font-normal text-ink-faint">tolerance ± {r.toleranceCents} ¢</span>
        </td>
        <td className={clsx("whitespace-nowrap py-2 pr-3 text-right tabular-nums", failed(r.t60))}>
          {r.t60S != null ? `${formatNumber(r.t60S, 1)}${r.t60UncertaintyS != null ? ` ± ${formatUncertainty(r.t60UncertaintyS, 0.01)}` : ""} s` : "—"}
          {r.t60S != null && t60ExtrapolatedFrom(r.t60ObservedDecayDb) ? <span className="block font-normal text-ink-faint">extrapolated {t60ExtrapolatedFrom(r.t60ObservedDecayDb)}</span> : null}
          {r.minT60S != null ? <span className="block font-normal text-ink-faint">min {r.minT60S} s</span> : null}
        </td>
        <td className={clsx("whitespace-nowrap py-2 pr-3 text-right tabular-nums", failed(r.qResult))}>
          {formatNumber(r.q, 0)}
          {r.minQ != null ? <span className="block font-normal text-ink-faint">min {r.minQ}</span> : null}
        </td>
        <td className={clsx("whitespace-nowrap py-2 pr-3 text-right tabular-nums", failed(r.beat))}>
          {r.beatHz != null ? `${formatNumber(r.beatHz, 2)} Hz` : "—"}
          {r.maxBeatHz != null ? <span className="block font-normal text-ink-faint">max {r.maxBeatHz} Hz</span> : null}
        </td>
      </tr>
      {r.note && !repeatsReason ? (
        <tr>
          <td colSpan={8} className="pb-2 pr-3 text-ink-soft">
            {r.label}: {r.note}
          </td>
        </tr>
      ) : null}
    </>
  );
}
