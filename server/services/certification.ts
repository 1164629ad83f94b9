/**
 * Whether a unit may carry a certificate now, and if not why, in words. A certificate follows the
 * decision: none for a scrapped unit, none for one to be reworked or measured again until it has
 * been, none for one out of tolerance or inconclusive unless QA accepted it as it is (a concession,
 * which the certificate then states).
 */
import { verdictWhy } from "../../shared/verdict-why.ts";
import { batchStateLabels, dispositionLabels, type BatchState } from "../../shared/schemas/batch.ts";
import type { Concession } from "../../shared/schemas/certificate.ts";
import type { EvaluationView } from "../../shared/schemas/evaluation.ts";
import type { UnitCertification } from "../../shared/schemas/strike.ts";
import type { Db } from "../db/client.ts";
import { latestEvaluations, standingDispositions } from "./batches.ts";

/** `short`: the reason in a few words, for the list of units a batch certificate does not cover. */
export type Certifiability = (UnitCertification & { eligible: true; evaluation: EvaluationView; concession: Concession | null }) | (UnitCertification & { eligible: false; short: string });

const day = (d: Date) => d.toISOString().slice(0, 10);

/** Certifiability of each unit of one batch, keyed by unit id. */
export function certifiability(db: Db, batch: { code: string; state: BatchState }, units: { id: string; serial: string }[]): Map<string, Certifiability> {
  const out = new Map<string, Certifiability>();
  const ids = units.map((u) => u.id);
  const evals = latestEvaluations(db, ids);
  const standing = standingDispositions(db, ids, evals);
  const no = (reason: string, short: string): Certifiability => ({ eligible: false, reason, short, concession: null });
  for (const u of units) {
    const ev = evals.get(u.id);
    const d = standing.get(u.id);
    if (batch.state !== "released") {
      out.set(u.id, no(`Batch ${batch.code} is not released yet (it is ${batchStateLabels[batch.state].toLowerCase()}); QA releases the batch before certificates are issued.`, "batch not released"));
    } else if (!ev) {
      out.set(u.id, no(`Unit ${u.serial} has no evaluation; it must be measured before a certificate can be issued.`, "not measured"));
    } else if (d?.decision === "scrap") {
      out.set(u.id, no(`Unit ${u.serial} was scrapped (disposition of ${day(d.at)}: ${d.reason}). A scrapped unit gets no certificate.`, "scrapped"));
    } else if (d && (d.decision === "rework" || d.decision === "retest")) {
      out.set(u.id, no(`Unit ${u.serial} is to be ${d.decision === "rework" ? "reworked and measured again" : "measured again"} (disposition of ${day(d.at)}) and has not been measured since, so it gets no certificate yet.`, d.decision === "rework" ? "to be reworked" : "to be measured again"));
    } else if (ev.verdict === "within_tolerance") {
      out.set(u.id, { eligible: true, reason: null, evaluation: ev, concession: null });
    } else if (d?.decision === "use_as_is") {
      out.set(u.id, { eligible: true, reason: null, evaluation: ev, concession: { departures: verdictWhy(ev), reason: d.reason, decidedAt: d.at.toISOString() } });
    } else {
      const why = verdictWhy(ev);
      out.set(u.id, no(`Unit ${u.serial} is ${ev.verdict === "out_of_tolerance" ? "out of tolerance" : "inconclusive"}${why.length ? ` (${why.join("; ")})` : ""} and has no "${dispositionLabels.use_as_is}" disposition, so it gets no certificate.`, `${ev.verdict === "out_of_tolerance" ? "out of tolerance" : "inconclusive"}, not accepted`));
    }
  }
  return out;
}
