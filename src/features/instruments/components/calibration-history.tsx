/** Every calibration of an instrument, newest first: the record, what it found and against what. */
import type { CalibrationView } from "@shared/schemas/instrument";
import { EmptyState } from "@/components/ui/panel";
import { formatDate } from "@/lib/format";
import { calibrationResult, formatPpm } from "../lib/format";

export function CalibrationHistory({ history }: { history: CalibrationView[] }) {
  if (history.length === 0) return <EmptyState title="Never calibrated">Until it is, its measurements carry the workshop's assumed tolerance, and certificates cannot state traceability for them.</EmptyState>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-caption">
        <caption className="sr-only">Calibration history</caption>
        <thead className="border-b border-line-strong text-ink-soft">
          <tr>
            {["Record", "Calibrated", "Valid until", "Result", "Against", "Entered by"].map((h) => (
              <th key={h} scope="col" className="py-2 pr-3 font-semibold">
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody className="divide-y divide-line">
          {history.map((c) => (
            <tr key={c.id} className="align-top">
              <th scope="row" className="py-2 pr-3 font-medium">
                {c.number}
              </th>
              <td className="py-2 pr-3">{formatDate(c.calibratedAt)}</td>
              <td className="py-2 pr-3">{formatDate(c.validUntil)}</td>
              <td className="py-2 pr-3 tabular-nums">
                {calibrationResult(c)}
                {c.tones && c.tones.length > 1
                  ? c.tones.map((t) => (
                      <span key={t.sha256} className="block text-ink-soft">
                        {t.referenceHz} Hz: {formatPpm(t.offsetPpm)}
                      </span>
                    ))
                  : null}
                {c.warnings.map((w) => (
                  <span key={w} className="mt-1 block font-medium text-ochre-600">
                    {w}
                  </span>
                ))}
              </td>
              <td className="py-2 pr-3">
                {c.kind === "recorder" ? `Reference ${c.tones?.map((t) => `${t.referenceHz} Hz`).join(", ")}; certificate ${c.certificateNumber}` : `Certificate ${c.certificateNumber}`}
                {c.referenceDescription || c.calibratedBy ? <span className="block text-ink-soft">{c.referenceDescription || c.calibratedBy}</span> : null}
              </td>
              <td className="py-2 pr-3">{c.createdBy?.name ?? "—"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
