/**
 * The Modes table as CSV (RFC 4180, quoting by papaparse): one row per predicted mode of each model,
 * then one per measured partial no model matched. Numbers in Hz, s and cents with a point as the
 * decimal mark, so any spreadsheet reads them back.
 */
import Papa from "papaparse";
import type { HoldEffect, MeasuredModeView, ModeMap, TauBySupport } from "@shared/schemas/modes";

const num = (v: number | null | undefined, decimals: number) => (v == null || !Number.isFinite(v) ? "" : v.toFixed(decimals));

const header = [
  "model",
  "mode",
  "label",
  "kind",
  "predictedHz",
  "calibratedHz",
  "measuredHz",
  "measuredSpreadHz",
  "units",
  "ratio",
  "residualCents",
  "inFit",
  "tauSuspendedS",
  "tauHandS",
  "tauStandS",
  "holdSupport",
  "tauHeldOverFree",
  "tauHeldOverFreeUncertainty",
  "holdEffect",
  "modelAgreement",
];

function tau(t: TauBySupport) {
  return [num(t.suspended, 3), num(t.hand, 3), num(t.stand, 3)];
}
function hold(h: HoldEffect | null) {
  return h ? [h.support, num(h.ratio, 3), num(h.ratioUncertainty, 3), h.verdict, h.agreement ?? ""] : ["", "", "", "", ""];
}

export function modeMapCsv(map: ModeMap): string {
  const rows: string[][] = map.modes.map((r) => [
    r.condition,
    String(r.mode),
    r.label,
    r.kind ?? "",
    num(r.predictedHz, r.predictedHz < 1 ? 6 : 3),
    num(r.calibratedHz, 3),
    num(r.measuredHz, 3),
    num(r.measuredSpreadHz, 3),
    String(r.units),
    num(r.ratio, 5),
    num(r.residualCents, 1),
    r.inFit === null ? "" : r.inFit ? "yes" : "no",
    ...tau(r.tauBySupport),
    ...hold(r.holdEffect),
  ]);
  const unmatched = (m: MeasuredModeView): string[] => ["measured only", "", "", m.supportMode ? "support" : "", "", "", num(m.measuredHz, 3), num(m.measuredSpreadHz, 3), String(m.units), "", "", "", ...tau(m.tauBySupport), ...hold(m.holdEffect)];
  return Papa.unparse({ fields: header, data: [...rows, ...map.unmatchedPartials.map(unmatched)] }, { newline: "\r\n" }) + "\r\n";
}
