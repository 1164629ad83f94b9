/**
 * The batch ledger as CSV, one row per unit, saying what was measured: for each requirement of the
 * spec version its target, tolerance, the measured value with its expanded uncertainty (k = 2) and
 * the line's result; the temperature of the strikes used and whether the frequencies are corrected
 * to the reference temperature; verdict and disposition in words with their codes beside; voided
 * strikes left out and counted.
 */
import { and, asc, eq, inArray } from "drizzle-orm";
import { dispositionLabels } from "../../shared/schemas/batch.ts";
import { verdictLabels, type CheckResult } from "../../shared/schemas/evaluation.ts";
import type { Db } from "../db/client.ts";
import { specPartial, specVersion, strike, unit } from "../db/schema.ts";
import { csvDocument, num, type CsvCell } from "./csv.ts";
import { findBatch, getBatch, latestEvaluations } from "./batches.ts";
import { voidsByUnit } from "./strike-voids.ts";

const resultWords: Record<CheckResult, string> = { pass: "Pass", fail: "Fail", inconclusive: "Inconclusive", not_found: "Not found", not_checked: "Not checked" };

/** Column stems from the requirement labels ("First overtone" → first_overtone), unique and ASCII. */
function stems(labels: string[]): string[] {
  const seen = new Set<string>();
  return labels.map((label, i) => {
    let stem = label.toLowerCase().normalize("NFKD").replace(/[^a-z0-9]+/g, "_").replace(/^_+|_+$/g, "") || `partial_${i + 1}`;
    if (seen.has(stem)) stem = `${stem}_${i + 1}`;
    seen.add(stem);
    return stem;
  });
}

export function ledgerCsv(db: Db, workshopId: string, batchId: string): { filename: string; csv: string } {
  const b = findBatch(db, workshopId, batchId);
  const detail = getBatch(db, workshopId, batchId);
  const version = db.select().from(specVersion).where(eq(specVersion.id, b.specVersionId)).get()!;
  const partials = db.select().from(specPartial).where(eq(specPartial.specVersionId, b.specVersionId)).orderBy(asc(specPartial.position)).all();
  const units = db.select({ id: unit.id }).from(unit).where(eq(unit.batchId, batchId)).all().map((u) => u.id);
  const evaluations = latestEvaluations(db, units);
  const voided = new Set([...voidsByUnit(db, units).values()].flat().map((v) => v.strikeId));
  const temps = new Map<string, number[]>();
  if (units.length) {
    for (const s of db.select({ id: strike.id, unitId: strike.unitId, t: strike.temperatureC }).from(strike).where(and(inArray(strike.unitId, units), eq(strike.state, "done"))).all()) {
      if (voided.has(s.id) || s.t === null) continue;
      temps.set(s.unitId, [...(temps.get(s.unitId) ?? []), s.t]);
    }
  }

  const stem = stems(partials.map((p) => p.label));
  const header: CsvCell[] = [
    "serial",
    "verdict",
    "verdict_code",
    "why",
    "strikes_used",
    "voided_strikes",
    "temperature_c",
    "corrected_to_reference",
    "reference_temperature_c",
    ...partials.flatMap((_, i) => [
      `${stem[i]}_target_hz`,
      `${stem[i]}_target_ratio`,
      `${stem[i]}_tolerance_cents`,
      `${stem[i]}_measured_hz`,
      `${stem[i]}_expanded_uncertainty_hz_k2`,
      `${stem[i]}_deviation_cents`,
      `${stem[i]}_t60_s`,
      `${stem[i]}_t60_observed_decay_db`,
      `${stem[i]}_t60_reliable`,
      `${stem[i]}_q`,
      `${stem[i]}_result`,
      `${stem[i]}_result_code`,
    ]),
    "disposition",
    "disposition_code",
    "disposition_reason",
    "disposition_by",
    "disposition_at",
    "customer_name",
    "last_measured_at",
  ];
  const lines = detail.rows.map((r): CsvCell[] => {
    const ev = evaluations.get(r.id) ?? null;
    const t = temps.get(r.id) ?? [];
    const meanT = t.length ? t.reduce((a, x) => a + x, 0) / t.length : null;
    return [
      r.serial,
      ev ? verdictLabels[ev.verdict] : "Not measured",
      ev?.verdict ?? "not_measured",
      r.why.join("; ") || null,
      num(ev?.strikesUsed ?? 0, 0),
      num(r.voidedStrikes, 0),
      num(meanT, 1),
      ev ? (ev.temperatureCorrected ? "yes" : "no") : null,
      ev?.temperatureCorrected ? num(version.referenceTemperatureC, 1) : null,
      ...partials.flatMap((p) => {
        const line = ev?.requirements.find((x) => x.label === p.label);
        return [
          num(line?.targetHz ?? p.targetHz, 4),
          num(p.ratio, 4),
          num(p.toleranceCents, 2),
          num(line?.measuredHz, 4),
          num(line?.expandedUncertaintyHz, 4),
          num(line?.deviationCents, 2),
          num(line?.t60S, 3),
          num(line?.t60ObservedDecayDb, 0),
          line?.t60S == null ? null : line.t60Unreliable ? "no" : "yes",
          num(line?.q, 0),
          line ? resultWords[line.result] : null,
          line?.result ?? null,
        ];
      }),
      r.disposition ? dispositionLabels[r.disposition.decision] : null,
      r.disposition?.decision ?? null,
      r.disposition?.reason ?? null,
      r.disposition?.by ?? null,
      r.disposition?.at ?? null,
      r.customerName,
      r.lastMeasuredAt,
    ];
  });
  return { filename: `${b.code}-ledger.csv`, csv: csvDocument([header, ...lines]) };
}
