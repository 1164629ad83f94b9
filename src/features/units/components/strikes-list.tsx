/**
 * The unit's strikes, newest first. A voided strike stays in the list, struck through, with who
 * voided it, when and why; it no longer counts in the evaluation. Voiding asks for a reason.
 */
import { useState } from "react";
import { Link } from "react-router";
import { supportLabels } from "@shared/schemas/spec";
import type { StrikeSummary, UnitDetail } from "@shared/schemas/strike";
import { Button } from "@/components/ui/button";
import { Badge, EmptyState } from "@/components/ui/panel";
import { ReasonForm } from "@/components/ui/reason-form";
import { Spinner } from "@/components/ui/spinner";
import { StrikeStateBadge } from "@/components/ui/status-badges";
import { formatDateTime, formatHz } from "@/lib/format";
import { useVoidStrike } from "../api/void-strike";

type Props = {
  unit: UnitDetail;
  strikeHref: (id: string) => string;
  workshopId: string;
  /** Whether the signed-in member may void this strike (their own, or quality for any); false once released. */
  canVoid: (strike: StrikeSummary) => boolean;
};

export function StrikesList({ unit, strikeHref, workshopId, canVoid }: Props) {
  const [voiding, setVoiding] = useState<string | null>(null);
  if (unit.strikes.length === 0) {
    return <EmptyState title="No strikes yet">Strike the unit, record it, and drop the WAV file above. Each strike is analysed in a few seconds.</EmptyState>;
  }
  const voided = unit.strikes.filter((s) => s.voided).length;
  return (
    <div className="flex flex-col gap-2">
      <ul aria-label="Strikes" className="divide-y divide-line rounded-control border border-line">
        {unit.strikes.map((strike) => (
          <li key={strike.id} className="flex flex-col gap-2 px-4 py-3">
            <div className="flex flex-wrap items-start justify-between gap-3">
              <div className="min-w-0">
                <Link to={strikeHref(strike.id)} className={strike.voided ? "font-semibold text-ink-faint line-through" : "font-semibold text-steel-700 underline underline-offset-2"}>
                  {strike.originalName}
                </Link>
                <p className={strike.voided ? "text-caption text-ink-faint line-through" : "text-caption text-ink-soft"}>
                  {formatDateTime(strike.uploadedAt)}
                  {strike.uploadedBy ? ` · ${strike.uploadedBy.name}` : ""}
                  {strike.temperatureC != null ? ` · ${strike.temperatureC} °C` : ""}
                  {strike.support ? ` · ${supportLabels[strike.support]}` : ""}
                  {strike.recorder ? ` · ${strike.recorder.name}` : ""}
                  {strike.durationS != null ? ` · ${strike.durationS.toFixed(1)} s` : ""}
                </p>
                {strike.voided ? (
                  <p className="mt-1 text-caption text-ink">
                    <span className="font-semibold">Voided</span> {formatDateTime(strike.voided.at)}
                    {strike.voided.by ? ` by ${strike.voided.by.name}` : ""}: {strike.voided.reason}
                  </p>
                ) : null}
                {strike.state === "failed" && !strike.voided ? (
                  <p role="alert" className="mt-1 text-caption font-medium text-rust-700">
                    Not analysed: {strike.failureReason ?? "the analysis stopped without a reason; upload the recording again."}
                  </p>
                ) : null}
              </div>
              <div className="flex items-center gap-3">
                {strike.state === "done" ? <span className={strike.voided ? "tabular-nums text-ink-faint line-through" : "tabular-nums"}>{formatHz(strike.fundamentalHz)}</span> : null}
                {strike.state === "queued" || strike.state === "analysing" ? <Spinner size="sm" /> : null}
                {strike.voided ? <Badge>Voided</Badge> : <StrikeStateBadge state={strike.state} />}
                {!strike.voided && canVoid(strike) && voiding !== strike.id ? (
                  <Button size="sm" variant="quiet" onClick={() => setVoiding(strike.id)} aria-label={`Void ${strike.originalName}…`}>
                    Void…
                  </Button>
                ) : null}
              </div>
            </div>
            {voiding === strike.id ? <VoidForm workshopId={workshopId} unitId={unit.id} strike={strike} onDone={() => setVoiding(null)} /> : null}
          </li>
        ))}
      </ul>
      {voided > 0 ? <p className="text-caption text-ink-soft">{voided} voided strike{voided === 1 ? " is" : "s are"} kept in the record but not evaluated.</p> : null}
    </div>
  );
}

function VoidForm({ workshopId, unitId, strike, onDone }: { workshopId: string; unitId: string; strike: StrikeSummary; onDone: () => void }) {
  const mutation = useVoidStrike(workshopId, unitId);
  return (
    <ReasonForm
      name={`Void ${strike.originalName}`}
      warning="Voiding keeps the strike in the record, struck through, and evaluates the unit again from the other strikes. It cannot be undone: if the recording does belong to this unit, upload it again."
      label="Why is this strike void?"
      hint="For example: a recording of another unit, a knock on the bench."
      submitLabel="Void strike"
      onSubmit={async (reason) => {
        await mutation.mutateAsync({ strikeId: strike.id, reason });
        onDone();
      }}
      onCancel={onDone}
    />
  );
}
