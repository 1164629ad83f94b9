/**
 * The strike's instruments and the correction its frequencies received: the recorder's clock
 * offset removed (the partials table above shows the values as recorded), the thermometer reading
 * corrected — or the assumed tolerance where an instrument had no valid calibration.
 */
import type { StrikeDetail } from "@shared/schemas/strike";
import { Alert } from "@/components/ui/alert";
import { formatDate, formatDateTime } from "@/lib/format";
import { formatHz } from "../lib/format";

const statusWords = { calibrated: "calibrated", expired: "calibration expired", uncalibrated: "never calibrated", not_named: "not named" } as const;
const signed = (v: number, d: number, unit: string) => `${v < 0 ? "\u2212" : "+"}${Math.abs(v).toFixed(d)} ${unit}`;

export function StrikeCorrection({ strike }: { strike: StrikeDetail }) {
  const { recorder, thermometer } = strike.correction;
  const fundamental = strike.fundamentalHz;
  const corrected = fundamental !== null && !recorder.assumed ? fundamental / (1 + recorder.offsetPpm * 1e-6) : null;
  return (
    <div className="flex flex-col gap-3" data-testid="strike-correction">
      <dl className="grid gap-x-6 gap-y-3 sm:grid-cols-2">
        <div>
          <dt className="text-caption text-ink-faint">Recorder</dt>
          <dd>
            <span className="font-medium">{recorder.instrument?.name ?? "Not named"}</span> · {statusWords[recorder.status]}
            {recorder.calibration ? (
              <span className="block text-caption text-ink-soft">
                {recorder.calibration.number}, {formatDate(recorder.calibration.calibratedAt)}, valid until {formatDate(recorder.calibration.validUntil)}
              </span>
            ) : null}
            <span className="block">
              {recorder.assumed
                ? "Frequencies as recorded; the assumed clock tolerance is in their uncertainty."
                : `Clock offset ${signed(recorder.offsetPpm, 2, "ppm")} removed from every frequency (u = ${recorder.standardUncertaintyPpm.toFixed(2)} ppm).`}
            </span>
            {corrected !== null ? (
              <span className="block tabular-nums">
                Fundamental {formatHz(fundamental!, 4)} as recorded → <strong>{formatHz(corrected, 4)}</strong> corrected
              </span>
            ) : null}
          </dd>
        </div>
        <div>
          <dt className="text-caption text-ink-faint">Thermometer</dt>
          <dd>
            {thermometer ? (
              <>
                <span className="font-medium">{thermometer.instrument?.name ?? "Not named"}</span> · {statusWords[thermometer.status]}
                <span className="block">
                  {thermometer.assumed
                    ? `Read ${thermometer.readingC} °C, used as read; the assumed tolerance is in the uncertainty.`
                    : `Read ${thermometer.readingC} °C, offset ${signed(thermometer.offsetC, 2, "°C")}: ${thermometer.correctedC.toFixed(2)} °C used (u = ${thermometer.standardUncertaintyC.toFixed(2)} °C).`}
                </span>
                {!thermometer.withinCalibratedRange && !thermometer.assumed ? <span className="block text-caption text-ochre-600">The reading lies outside the calibrated points; the nearest point's offset was used.</span> : null}
              </>
            ) : (
              "No temperature given: no temperature correction."
            )}
          </dd>
        </div>
      </dl>
      {recorder.assumed || thermometer?.assumed ? (
        <Alert tone="caution">Uncalibrated instrument: assumed tolerance used. Calibrate it under Instruments to have its offset corrected and the result stated as traceable.</Alert>
      ) : null}
      <p className="text-caption text-ink-faint">
        {strike.appliedIn ? `As applied in the unit's evaluation of ${formatDateTime(strike.appliedIn.at)}.` : "Applied when the unit is next evaluated."} The partials below are the values as recorded.
      </p>
    </div>
  );
}
