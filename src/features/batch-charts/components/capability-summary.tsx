import type { BatchDetail } from "@shared/schemas/batch";
import { SpcInputError, t60LowerCapability, toleranceCapability, LOW_CONFIDENCE_BELOW, type CapabilityIndices } from "@shared/spc";
import { Badge } from "@/components/ui/panel";

type Outcome = { indices: CapabilityIndices } | { reason: string };

function attempt(run: () => CapabilityIndices): Outcome {
  try {
    return { indices: run() };
  } catch (error) {
    if (error instanceof SpcInputError) return { reason: error.message };
    throw error;
  }
}

const fmt = (v: number | null) => (v === null || !Number.isFinite(v) ? "—" : v.toFixed(2));

/**
 * Cp and Cpk of the deviation against ±tolerance, and Cpl of ln T60 against the minimum T60
 * (shared/spc.ts; Montgomery). Under 30 units each index is marked "low confidence".
 */
export function CapabilitySummary({ batch, deviations }: { batch: BatchDetail; deviations: number[] }) {
  const tol = batch.fundamentalToleranceCents;
  const pitch: Outcome = tol === null ? { reason: "The spec version gives no tolerance for the fundamental." } : attempt(() => toleranceCapability(deviations, tol));
  const t60s = batch.rows.filter((r) => !r.t60Unreliable).map((r) => r.t60S).filter((t): t is number => t !== null && Number.isFinite(t) && t > 0);
  const decay: Outcome =
    batch.minT60S === null
      ? { reason: "The spec version sets no minimum T60." }
      : t60s.length < 2
        ? { reason: `Needs T60 of at least two units; ${t60s.length} measured.` }
        : attempt(() => t60LowerCapability(t60s, batch.minT60S as number));

  return (
    <section aria-labelledby="capability-heading" className="tl-capability">
      <h3 id="capability-heading" className="text-body font-semibold">Capability</h3>
      <p className="text-caption text-ink-soft">σ̂ from the moving ranges (MR̄/1.128). 1.33 or more is the usual aim — a typical target; agree yours with the customer.</p>
      <dl className="mt-3 flex flex-col gap-2" data-testid="capability">
        <Index name="Cp" hint={`deviation against ±${tol ?? "?"} cents`} outcome={pitch} pick={(i) => i.cp} />
        <Index name="Cpk" hint="deviation, nearer limit" outcome={pitch} pick={(i) => i.cpk} />
        <Index name="Cpl" hint={`log T60 against ${batch.minT60S ?? "?"} s minimum`} outcome={decay} pick={(i) => i.cpl} />
      </dl>
      {"reason" in pitch ? <p className="mt-2 text-caption text-ink-soft">Cp, Cpk: {pitch.reason}</p> : null}
      {"reason" in decay ? <p className="mt-1 text-caption text-ink-soft">Cpl: {decay.reason}</p> : null}
    </section>
  );
}

function Index({ name, hint, outcome, pick }: { name: string; hint: string; outcome: Outcome; pick: (i: CapabilityIndices) => number | null }) {
  const value = "indices" in outcome ? pick(outcome.indices) : null;
  const low = "indices" in outcome && outcome.indices.lowConfidence;
  return (
    <div className="grid grid-cols-[1fr_auto] items-baseline gap-x-3 border-b border-line pb-2 last:border-b-0">
      <dt className="font-semibold">{name}</dt>
      <dd className="font-mono text-title tabular-nums" data-index={name}>
        {fmt(value)}
      </dd>
      <dd className="col-span-2 text-caption text-ink-faint">{hint}</dd>
      {low && "indices" in outcome ? (
        <dd className="col-span-2 mt-1">
          <Badge tone="ochre">
            low confidence (n = {outcome.indices.n}, under {LOW_CONFIDENCE_BELOW})
          </Badge>
        </dd>
      ) : null}
    </div>
  );
}
