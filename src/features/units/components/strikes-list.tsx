import { Link } from "react-router";
import { supportLabels } from "@shared/schemas/spec";
import type { UnitDetail } from "@shared/schemas/strike";
import { EmptyState } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { StrikeStateBadge } from "@/components/ui/status-badges";
import { formatDateTime, formatHz } from "@/lib/format";

export function StrikesList({ unit, strikeHref }: { unit: UnitDetail; strikeHref: (id: string) => string }) {
  if (unit.strikes.length === 0) {
    return <EmptyState title="No strikes yet">Strike the unit, record it, and drop the WAV file above. Each strike is analysed in a few seconds.</EmptyState>;
  }
  return (
    <ul aria-label="Strikes" className="divide-y divide-line rounded-control border border-line">
      {unit.strikes.map((strike) => (
        <li key={strike.id} className="flex flex-wrap items-start justify-between gap-3 px-4 py-3">
          <div className="min-w-0">
            <Link to={strikeHref(strike.id)} className="font-semibold text-steel-700 underline underline-offset-2">
              {strike.originalName}
            </Link>
            <p className="text-caption text-ink-soft">
              {formatDateTime(strike.uploadedAt)}
              {strike.uploadedBy ? ` · ${strike.uploadedBy.name}` : ""}
              {strike.temperatureC != null ? ` · ${strike.temperatureC} °C` : ""}
              {strike.support ? ` · ${supportLabels[strike.support]}` : ""}
              {strike.recorder ? ` · ${strike.recorder.name}` : ""}
              {strike.durationS != null ? ` · ${strike.durationS.toFixed(1)} s` : ""}
            </p>
            {strike.state === "failed" ? (
              <p role="alert" className="mt-1 text-caption font-medium text-rust-700">
                Not analysed: {strike.failureReason ?? "the analysis stopped without a reason; upload the recording again."}
              </p>
            ) : null}
          </div>
          <div className="flex items-center gap-3">
            {strike.state === "done" ? <span className="tabular-nums">{formatHz(strike.fundamentalHz)}</span> : null}
            {strike.state === "queued" || strike.state === "analysing" ? <Spinner size="sm" /> : null}
            <StrikeStateBadge state={strike.state} />
          </div>
        </li>
      ))}
    </ul>
  );
}
