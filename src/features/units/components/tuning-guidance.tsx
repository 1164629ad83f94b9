/** What to do about a unit out of tolerance, in the trade's words, with the caution set apart. */
import type { TuningGuidance as Guidance } from "@shared/schemas/evaluation";
import { Alert } from "@/components/ui/alert";

export function TuningGuidance({ guidance }: { guidance: Guidance }) {
  const direction = guidance.direction === "raise" ? "Raise the pitch" : "Lower the pitch";
  return (
    <div className="flex flex-col gap-3">
      <p className="text-lead font-semibold">
        {direction} by about {Math.abs(guidance.cents).toFixed(1)} cents
      </p>
      <p>{guidance.remedy}</p>
      {guidance.estimate ? <p className="text-ink-soft">{guidance.estimate}</p> : null}
      <Alert tone="caution" title="Caution">
        {guidance.caution}
      </Alert>
    </div>
  );
}
