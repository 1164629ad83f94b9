/**
 * The Modes page of a specification: which measured partial is which mode of the design, what
 * stiffness the parts really have, and which modes survive being held. Works with measurements
 * only, a model only, or both.
 */
import type { ModeMap } from "@shared/schemas/modes";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { EmptyState, Panel } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { useModeMap, type ModeMapParams } from "../api/get-mode-map";
import { modeMapCsv } from "../lib/mode-csv";
import { geometrySentence, holdSentences, residualSentences, stiffnessSentence } from "../lib/words";
import { GeometryForm, ModeScope, type BatchChoice } from "./mode-controls";
import { ModeFrequencyChart } from "./mode-frequency-chart";
import { ModeImportForm } from "./mode-import-form";
import { ModeTable } from "./mode-table";
import { ModeTauChart } from "./mode-tau-chart";

export type ModesSpec = { id: string; name: string; family: string; currentVersion: number; currentVersionId: string; lengthMm: number | null };

function download(map: ModeMap, spec: ModesSpec) {
  const blob = new Blob([modeMapCsv(map)], { type: "text/csv;charset=utf-8" });
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = `${spec.name.replace(/[^\w.-]+/g, "-")}-modes${map.scope.batch ? `-${map.scope.batch.code}` : ""}.csv`;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

export function ModesView({ workshopId, spec, params, onParams, batches, canWrite }: { workshopId: string; spec: ModesSpec; params: ModeMapParams; onParams: (next: ModeMapParams) => void; batches: BatchChoice[]; canWrite: boolean }) {
  const query = useModeMap(workshopId, spec.id, params);
  if (query.isPending) return <Spinner label="Matching modes to partials…" />;
  if (query.isError) throw query.error;
  const map = query.data;
  const hasModel = map.models.length > 0;
  const hasMeasured = map.measuredModes.length > 0;
  const residuals = residualSentences(map.modes);
  const hold = holdSentences(map);

  return (
    <div className={query.isFetching ? "flex flex-col gap-6 opacity-70 transition-opacity" : "flex flex-col gap-6"}>
      <Panel aria-labelledby="material-heading">
        <h2 id="material-heading" className="text-title font-semibold">
          Material the measurements imply
        </h2>
        <p className="mt-2 max-w-prose text-lead" data-testid="stiffness-sentence">
          {stiffnessSentence(map)}
        </p>
        {map.geometry && map.youngsModulusSource !== "geometry" ? <p className="mt-2 max-w-prose text-ink-soft">{geometrySentence(map)}</p> : null}
        {residuals.length ? (
          <ul className="mt-3 flex max-w-prose list-disc flex-col gap-1 pl-5 text-body">
            {residuals.map((s) => (
              <li key={s}>{s}</li>
            ))}
          </ul>
        ) : null}
        {residuals.length ? (
          <p className="mt-3 max-w-prose text-caption text-ink-soft">
            Before removing metal to move a mode, confirm the change on a few parts. Grinding follows the workshop's own procedures and safety rules — eye and hearing protection, dust extraction, guards on — and a fork for clinical or laboratory use is measured and released again after any change.
          </p>
        ) : null}
        <div className="mt-4 grid gap-4 lg:grid-cols-2">
          <ModeScope key={`${params.batch ?? ""}|${params.units ?? ""}`} map={map} batches={batches} params={params} onChange={onParams} />
          <details className="rounded-control border border-line px-3 py-2 lg:col-span-2" open={!hasModel && hasMeasured}>
            <summary className="cursor-pointer text-caption font-semibold text-ink">E from geometry (beam template)</summary>
            <div className="mt-2">
              <GeometryForm params={params} family={spec.family} lengthMm={spec.lengthMm} onApply={onParams} />
            </div>
          </details>
        </div>
      </Panel>

      <Panel aria-labelledby="map-heading">
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h2 id="map-heading" className="text-title font-semibold">
            Predicted and measured
          </h2>
          {hasModel || hasMeasured ? (
            <Button size="sm" variant="secondary" onClick={() => download(map, spec)}>
              Download the table (CSV)
            </Button>
          ) : null}
        </div>
        {!hasModel && !hasMeasured ? (
          <div className="mt-4">
            <EmptyState title="Nothing to show yet">
              Import the predicted modes of this design{canWrite ? " below" : " (quality or the owner can)"}, or strike units of this specification — the partials found appear here as measured modes.
            </EmptyState>
          </div>
        ) : (
          <div className="mt-4 flex flex-col gap-6">
            <ModeFrequencyChart map={map} />
            <ModeTable map={map} />
          </div>
        )}
      </Panel>

      <Panel aria-labelledby="hold-heading">
        <h2 id="hold-heading" className="text-title font-semibold">
          What the hold does
        </h2>
        <ul className="mt-2 flex max-w-prose flex-col gap-1 text-body" data-testid="hold-sentences">
          {hold.map((s) => (
            <li key={s}>{s}</li>
          ))}
        </ul>
        <p className="mt-2 max-w-prose text-caption text-ink-soft">
          τ held/free is taken over the units struck both ways (geometric mean, ± standard uncertainty): at 0.5 or less the hold takes most of the ring, at 0.8 or more the mode rings on. A balanced mode should ring on; an unbalanced one moves the stem and is damped.
        </p>
        {hasMeasured ? (
          <div className="mt-4">
            <ModeTauChart map={map} />
          </div>
        ) : null}
      </Panel>

      {canWrite ? (
        <Panel aria-labelledby="import-heading">
          <h2 id="import-heading" className="mb-2 text-title font-semibold">
            Import a predicted mode list
          </h2>
          <ModeImportForm workshopId={workshopId} specId={spec.id} versionId={spec.currentVersionId} version={spec.currentVersion} />
        </Panel>
      ) : !hasModel ? (
        <Alert tone="info">Quality or the owner can import the model's predicted modes for this specification.</Alert>
      ) : null}
    </div>
  );
}
