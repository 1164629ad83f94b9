import { verdictLabels, type Verdict } from "@shared/schemas/evaluation";
import { dispositionLabels, type DispositionDecision } from "@shared/schemas/batch";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { Spinner } from "@/components/ui/spinner";
import { formatDateTime } from "@/lib/format";
import { useUnitHistory, type AuditEvent } from "../api/get-unit-history";

const actionWords: Record<string, string> = {
  "unit.evaluate": "Evaluated",
  "unit.disposition": "Disposition recorded",
  "unit.disposition.supersede": "Disposition superseded",
  "strike.void": "Strike voided",
  "unit.update": "Customer details changed",
  "strike.upload": "Strike uploaded",
  "certificate.issue": "Certificate issued",
  "certificate.amend": "Certificate amended",
  "certificate.withdraw": "Certificate withdrawn",
  "certificate.resend": "Certificate e-mail sent again",
};

function detail(event: AuditEvent): string | null {
  const after = (event.after ?? {}) as Record<string, unknown>;
  if (typeof after.verdict === "string" && after.verdict in verdictLabels) return verdictLabels[after.verdict as Verdict];
  if (typeof after.decision === "string" && after.decision in dispositionLabels) return `${dispositionLabels[after.decision as DispositionDecision]}${typeof after.reason === "string" ? ` (${after.reason})` : ""}`;
  if (event.action === "strike.void" && typeof after.originalName === "string") return `${after.originalName} (${String(after.reason ?? "")})`;
  if (event.action === "certificate.withdraw" && typeof after.number === "string") return `${after.number} (${String(after.reason ?? "")})`;
  if (typeof after.originalName === "string") return after.originalName;
  if (typeof after.number === "string") return after.number;
  return null;
}

/** Who did what to this unit, newest first, from the append-only audit trail. */
export function UnitHistory({ workshopId, unitId, revision }: { workshopId: string; unitId: string; revision: string }) {
  const history = useUnitHistory(workshopId, unitId, revision);
  if (history.isPending) return <Spinner label="Loading the history…" />;
  if (history.isError) return <Alert tone="error">{history.error.message}</Alert>;
  const events = history.data.pages.flatMap((page) => page.events);
  if (events.length === 0) return <p className="text-ink-soft">Nothing has happened to this unit yet beyond its creation.</p>;
  return (
    <div className="flex flex-col gap-2">
      <ol aria-label="Unit history" className="divide-y divide-line text-caption">
        {events.map((event) => {
          const more = detail(event);
          return (
            <li key={event.id} className="flex flex-wrap justify-between gap-2 py-2">
              <span>
                <span className="font-semibold">{actionWords[event.action] ?? event.action}</span>
                {more ? `: ${more}` : ""}
              </span>
              <span className="text-ink-soft">
                {event.actor} · {formatDateTime(event.at)}
              </span>
            </li>
          );
        })}
      </ol>
      {history.hasNextPage ? (
        <Button variant="secondary" className="self-start" pending={history.isFetchingNextPage} onClick={() => void history.fetchNextPage()}>
          Show older entries
        </Button>
      ) : null}
    </div>
  );
}
