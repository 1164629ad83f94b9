/** The workshop's instruments with where each stands: calibrated, due soon, expired or never calibrated. */
import { Link } from "react-router";
import { instrumentKindLabels, type InstrumentSummary } from "@shared/schemas/instrument";
import { EmptyState } from "@/components/ui/panel";
import { formatDate } from "@/lib/format";
import { calibrationResult, dueWords } from "../lib/format";
import { CalibrationStatusBadge } from "./calibration-status-badge";

export function InstrumentsList({ instruments, instrumentHref, emptyAction }: { instruments: InstrumentSummary[]; instrumentHref: (id: string) => string; emptyAction?: React.ReactNode }) {
  if (instruments.length === 0) {
    return (
      <EmptyState title="No instruments yet" action={emptyAction}>
        Add the recorders you measure strikes with and the thermometers you read the temperature on, then calibrate each: the certificates can then show where every number comes from.
      </EmptyState>
    );
  }
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left">
        <caption className="sr-only">Instruments and their calibration status</caption>
        <thead className="border-b border-line-strong text-caption text-ink-soft">
          <tr>
            {["Instrument", "Kind", "Status", "Current calibration", "Valid until"].map((h) => (
              <th key={h} scope="col" className="py-2 pr-4 font-semibold">
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody className="divide-y divide-line">
          {instruments.map((i) => (
            <tr key={i.id}>
              <th scope="row" className="py-3 pr-4 font-medium">
                <Link to={instrumentHref(i.id)} className="font-semibold text-steel-700 underline underline-offset-2">
                  {i.name}
                </Link>
                <span className="block text-caption font-normal text-ink-soft">{[i.model, i.serial && `serial ${i.serial}`].filter(Boolean).join(" · ") || "—"}</span>
              </th>
              <td className="py-3 pr-4">{instrumentKindLabels[i.kind]}</td>
              <td className="py-3 pr-4">
                <CalibrationStatusBadge status={i.status} />
              </td>
              <td className="py-3 pr-4 tabular-nums">{i.latest ? `${i.latest.number}: ${calibrationResult(i.latest)}` : "—"}</td>
              <td className="py-3 pr-4 text-caption">
                {i.latest ? formatDate(i.latest.validUntil) : "—"}
                <span className="block text-ink-soft">{dueWords(i.status, i.dueInDays)}</span>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
