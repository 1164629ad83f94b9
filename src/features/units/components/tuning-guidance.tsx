/** What to do about a unit out of tolerance, in the trade's words, with the caution set apart. */
import type { TuningGuidance as Guidance } from "@shared/schemas/evaluation";
import { Alert } from "@/components/ui/alert";

const verb = (direction: Guidance["direction"]) => (direction === "raise" ? "raise" : "lower");

export function TuningGuidance({ guidance }: { guidance: Guidance }) {
  // The lead partial is in the list too; repeat it only where its own direction adds to the remedy above.
  const others = (guidance.partials ?? []).filter((p) => p.label !== guidance.label || p.remedy !== guidance.remedy);
  const lead = guidance.partials?.find((p) => p.label === guidance.label);
  const headline = guidance.label && lead ? `${guidance.label}: ${verb(guidance.direction)} it by about ${Math.abs(guidance.cents).toFixed(1)} cents` : `${guidance.direction === "raise" ? "Raise" : "Lower"} the pitch by about ${Math.abs(guidance.cents).toFixed(1)} cents`;
  return (
    <div className="flex flex-col gap-3">
      <p className="text-lead font-semibold">{headline}</p>
      <p>{guidance.remedy}</p>
      {guidance.estimate ? <p className="text-ink-soft">{guidance.estimate}</p> : null}
      {others.length ? (
        <ul className="flex flex-col gap-2" aria-label="Other partials out of tolerance">
          {others.map((p) => (
            <li key={p.label}>
              <span className="font-semibold">
                {p.label}: {verb(p.direction)} it by about {p.cents.toFixed(1)} cents.
              </span>{" "}
              {p.remedy}
            </li>
          ))}
        </ul>
      ) : null}
      {guidance.estimate ? null : <p className="text-caption text-ink-faint">Directions only: how much metal to take depends on the design; take a little, then measure again.</p>}
      <Alert tone="caution" title="Caution">
        {guidance.caution}
      </Alert>
    </div>
  );
}
