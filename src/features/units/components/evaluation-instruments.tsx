/**
 * What the evaluation did with each strike's instruments — the calibration applied and the offset
 * removed, or the assumed tolerance — and the fundamental's uncertainty budget, component by
 * component. QA can ask for a re-evaluation, which appends a new evaluation with the calibrations
 * as they stand now (a certificate entered late); the earlier ones stay as they were.
 */
import clsx from "clsx";
import { useState } from "react";
import type { EvaluationView } from "@shared/schemas/evaluation";
import { budgetComponentLabels, type StrikeCorrection } from "@shared/schemas/instrument";
import type { StrikeSummary } from "@shared/schemas/strike";
import { twoSignificant } from "@shared/traceability";
import { Alert } from "@/components/ui/alert";
import { Badge } from "@/components/ui/panel";
import { Button } from "@/components/ui/button";
import { isApiError } from "@/lib/api-client";
import { formatDate } from "@/lib/format";
import { useReevaluateUnit } from "../api/reevaluate-unit";

const signed = (v: number, d: number, unit: string) => `${v < 0 ? "\u2212" : "+"}${Math.abs(v).toFixed(d)} ${unit}`;

export function correctionWords(c: StrikeCorrection): { recorder: string; thermometer: string | null } {
  const r = c.recorder;
  const recorder = !r.instrument
    ? "no recorder named: assumed tolerance"
    : r.status === "calibrated"
      ? `${r.instrument.name}: ${r.calibration!.number} applied, offset ${signed(r.offsetPpm, 2, "ppm")} removed`
      : r.status === "expired"
        ? `${r.instrument.name}: calibration expired ${formatDate(r.calibration!.validUntil)}, assumed tolerance`
        : `${r.instrument.name}: never calibrated, assumed tolerance`;
  const t = c.thermometer;
  const thermometer = !t
    ? null
    : !t.instrument
      ? `${t.readingC} °C, no thermometer named: assumed tolerance`
      : t.status === "calibrated"
        ? `${t.readingC} °C on ${t.instrument.name} → ${t.correctedC.toFixed(2)} °C (${t.calibration!.number}, offset ${signed(t.offsetC, 2, "°C")})`
        : `${t.readingC} °C on ${t.instrument.name}: ${t.status === "expired" ? "calibration expired" : "never calibrated"}, assumed tolerance`;
  return { recorder, thermometer };
}

export function EvaluationInstruments({ workshopId, unitId, evaluation, strikes, canReevaluate }: { workshopId: string; unitId: string; evaluation: EvaluationView; strikes: StrikeSummary[]; canReevaluate: boolean }) {
  const reevaluate = useReevaluateUnit(workshopId, unitId);
  const [message, setMessage] = useState<string | null>(null);
  const t = evaluation.traceability;
  const names = new Map(strikes.map((s) => [s.id, s.originalName]));
  return (
    <section aria-labelledby="instruments-used-heading" className="flex flex-col gap-3 border-t border-line pt-4">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h3 id="instruments-used-heading" className="font-semibold">
          Instruments and uncertainty{" "}
          {t ? <Badge tone={t.traceable ? "moss" : "ochre"}>{t.traceable ? "Traceable" : "Not traceable"}</Badge> : null}
        </h3>
        {canReevaluate ? (
          <Button
            variant="secondary"
            size="sm"
            pending={reevaluate.isPending}
            onClick={async () => {
              setMessage(null);
              try {
                await reevaluate.mutateAsync();
                setMessage("A new evaluation was added with the calibrations as they stand now; the earlier one stays in the history.");
              } catch (error) {
                setMessage(isApiError(error) ? error.message : "The re-evaluation failed. Try again.");
              }
            }}
          >
            Re-evaluate with current calibrations
          </Button>
        ) : null}
      </div>
      {message ? <Alert tone="info">{message}</Alert> : null}
      {!t ? (
        <p className="text-caption text-ink-soft">This evaluation predates instrument records: the assumed tolerances were used for every strike.</p>
      ) : (
        <>
          {t.notes.length > 0 ? (
            <Alert tone="caution" title="Assumed tolerances in this evaluation">
              <ul className="list-disc pl-5">
                {t.notes.map((n) => (
                  <li key={n}>{n}</li>
                ))}
              </ul>
            </Alert>
          ) : null}
          <ul aria-label="Corrections applied" className="flex flex-col gap-1 text-caption">
            {t.strikes.map((c) => {
              const w = correctionWords(c);
              return (
                <li key={c.strikeId}>
                  <span className="font-medium">{names.get(c.strikeId) ?? "Strike"}</span>: {w.recorder}
                  {w.thermometer ? `; ${w.thermometer}` : ""}.
                </li>
              );
            })}
          </ul>
          {t.budget ? <BudgetTable budget={t.budget} /> : null}
        </>
      )}
    </section>
  );
}

function BudgetTable({ budget }: { budget: NonNullable<NonNullable<EvaluationView["traceability"]>["budget"]> }) {
  return (
    <details className="rounded-control border border-line px-4 py-2">
      <summary className="cursor-pointer font-medium">
        Uncertainty budget of the {budget.label.toLowerCase()}: U = {twoSignificant(budget.expandedHz)} Hz (k = {budget.coverageFactor})
      </summary>
      <div className="mt-2 overflow-x-auto">
        <table className="w-full text-left text-caption">
          <caption className="sr-only">Uncertainty budget</caption>
          <thead className="border-b border-line-strong text-ink-soft">
            <tr>
              {["Component", "Basis", "Distribution", "Standard uncertainty", "Sensitivity", "Contribution"].map((h, i) => (
                <th key={h} scope="col" className={clsx("py-2 pr-3 font-semibold", i >= 3 && "text-right")}>
                  {h}
                </th>
              ))}
            </tr>
          </thead>
          <tbody className="divide-y divide-line">
            {budget.components.map((c) => (
              <tr key={c.source}>
                <th scope="row" className="py-2 pr-3 font-medium">
                  {budgetComponentLabels[c.source]}
                </th>
                <td className="py-2 pr-3">{c.basis}</td>
                <td className="py-2 pr-3">{c.distribution}</td>
                <td className="py-2 pr-3 text-right tabular-nums">
                  {twoSignificant(c.standardUncertainty)} {c.unit === "1/°C" ? "/°C" : c.unit}
                </td>
                <td className="py-2 pr-3 text-right tabular-nums">{twoSignificant(c.sensitivity)}</td>
                <td className="py-2 pr-3 text-right tabular-nums">{twoSignificant(c.contributionHz)} Hz</td>
              </tr>
            ))}
            <tr>
              <th scope="row" className="py-2 pr-3 font-medium">
                Combined (k = 1)
              </th>
              <td className="py-2 pr-3" colSpan={4}>
                root sum of squares of the contributions
              </td>
              <td className="py-2 pr-3 text-right tabular-nums">{twoSignificant(budget.combinedHz)} Hz</td>
            </tr>
            <tr className="font-semibold">
              <th scope="row" className="py-2 pr-3">
                Expanded (k = {budget.coverageFactor})
              </th>
              <td className="py-2 pr-3" colSpan={4}>
                about 95 % coverage
              </td>
              <td className="py-2 pr-3 text-right tabular-nums">{twoSignificant(budget.expandedHz)} Hz</td>
            </tr>
          </tbody>
        </table>
      </div>
    </details>
  );
}
