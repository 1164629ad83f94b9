/** Enter a thermometer's calibration certificate: the offset at each point, the uncertainty, the number and dates. */
import { useState } from "react";
import { thermometerCalibrationSchema, type CalibrationCreated } from "@shared/schemas/instrument";
import { fieldMessages } from "@shared/errors";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";
import { formatDate } from "@/lib/format";
import { useCalibrateThermometer } from "../api/calibrate-instrument";

type Point = { key: number; referenceC: string; offsetC: string };
const today = () => new Date().toISOString().slice(0, 10);
const num = (s: string) => (s.trim() === "" ? Number.NaN : Number(s.replace(",", ".").replace("\u2212", "-")));

export function ThermometerCalibrationForm({ workshopId, instrumentId }: { workshopId: string; instrumentId: string }) {
  const calibrate = useCalibrateThermometer(workshopId, instrumentId);
  const [points, setPoints] = useState<Point[]>([{ key: 1, referenceC: "20", offsetC: "" }]);
  const [uncertainty, setUncertainty] = useState("");
  const [certificate, setCertificate] = useState("");
  const [calibratedBy, setCalibratedBy] = useState("");
  const [calibratedOn, setCalibratedOn] = useState(today());
  const [dueOn, setDueOn] = useState("");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [failure, setFailure] = useState<string | null>(null);
  const [result, setResult] = useState<CalibrationCreated | null>(null);

  const submit = async () => {
    setFailure(null);
    setResult(null);
    const body = {
      points: points.map((p) => ({ referenceC: num(p.referenceC), offsetC: num(p.offsetC) })),
      uncertaintyC: num(uncertainty),
      certificateNumber: certificate,
      calibratedBy,
      calibratedOn,
      dueOn,
    };
    const parsed = thermometerCalibrationSchema.safeParse(body);
    if (!parsed.success) {
      setErrors(fieldMessages(parsed.error));
      return;
    }
    setErrors({});
    try {
      setResult(await calibrate.mutateAsync(body));
    } catch (error) {
      if (isApiError(error)) {
        setFailure(error.message);
        if (error.fields) setErrors(error.fields);
      } else setFailure("The calibration could not be sent. Check the connection and try again.");
    }
  };

  return (
    <div className="flex flex-col gap-4">
      <fieldset className="flex flex-col gap-3">
        <legend className="mb-1 text-caption font-semibold">Calibration points (offset = reading − reference)</legend>
        {points.map((p, i) => (
          <div key={p.key} className="grid items-end gap-3 sm:grid-cols-[12rem_12rem_auto]">
            <InputField label={`Point ${i + 1}: reference (°C)`} inputMode="decimal" value={p.referenceC} error={errors[`points.${i}.referenceC`]} onChange={(e) => setPoints((all) => all.map((x) => (x.key === p.key ? { ...x, referenceC: e.target.value } : x)))} />
            <InputField label={`Point ${i + 1}: offset (°C)`} inputMode="decimal" placeholder="e.g. 0.2 or −0.1" value={p.offsetC} error={errors[`points.${i}.offsetC`]} onChange={(e) => setPoints((all) => all.map((x) => (x.key === p.key ? { ...x, offsetC: e.target.value } : x)))} />
            {points.length > 1 ? (
              <Button variant="quiet" size="sm" onClick={() => setPoints((all) => all.filter((x) => x.key !== p.key))}>
                Remove
              </Button>
            ) : null}
          </div>
        ))}
        {errors.points ? <p className="text-caption font-medium text-rust-700">{errors.points}</p> : null}
        <div>
          <Button variant="secondary" size="sm" disabled={points.length >= 12} onClick={() => setPoints((all) => [...all, { key: Math.max(...all.map((x) => x.key)) + 1, referenceC: "", offsetC: "" }])}>
            Add a point
          </Button>
        </div>
      </fieldset>
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-5">
        <InputField label="Uncertainty U (°C, k = 2)" inputMode="decimal" value={uncertainty} error={errors.uncertaintyC} hint="As stated on the certificate." onChange={(e) => setUncertainty(e.target.value)} />
        <InputField label="Certificate number" value={certificate} error={errors.certificateNumber} onChange={(e) => setCertificate(e.target.value)} />
        <InputField label="Calibrated by (optional)" value={calibratedBy} onChange={(e) => setCalibratedBy(e.target.value)} />
        <InputField label="Calibrated on" type="date" max={today()} value={calibratedOn} error={errors.calibratedOn} onChange={(e) => setCalibratedOn(e.target.value)} />
        <InputField label="Due date (optional)" type="date" value={dueOn} error={errors.dueOn} hint="Empty: the calibration date plus the validity." onChange={(e) => setDueOn(e.target.value)} />
      </div>
      <div>
        <Button onClick={() => void submit()} pending={calibrate.isPending}>
          Record calibration
        </Button>
      </div>
      {failure ? <Alert tone="error" title="Not recorded">{failure}</Alert> : null}
      {result ? (
        <Alert tone="success" title={`Calibration ${result.calibration.number} recorded`}>
          Valid until {formatDate(result.validUntil)}. Readings on this thermometer from its calibration date on are corrected for the offsets, and its uncertainty replaces the assumed tolerance.
        </Alert>
      ) : null}
    </div>
  );
}
