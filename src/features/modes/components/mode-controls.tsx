/**
 * What the Modes page is computed over (a batch or all of them, a set of units) and the beam
 * geometry for E without a model. Both write to the page's URL, so a view can be shared.
 */
import { useState, type FormEvent } from "react";
import type { ModeMap } from "@shared/schemas/modes";
import { Button } from "@/components/ui/button";
import { InputField, SelectField } from "@/components/ui/field";
import type { ModeMapParams } from "../api/get-mode-map";

export type BatchChoice = { id: string; code: string; units: number; measured: number };

export function ModeScope({ map, batches, params, onChange }: { map: ModeMap; batches: BatchChoice[]; params: ModeMapParams; onChange: (next: ModeMapParams) => void }) {
  const chosen = new Set(params.units ? params.units.split(",") : []);
  const [picked, setPicked] = useState<Set<string>>(chosen);
  const units = map.scope.units;
  return (
    <div className="flex flex-col gap-3">
      <SelectField
        label="Measured partials from"
        value={params.batch ?? ""}
        onChange={(e) => onChange({ ...params, batch: e.target.value || undefined, units: undefined })}
        hint={`${map.scope.unitsMeasured} unit${map.scope.unitsMeasured === 1 ? "" : "s"} measured; ${map.scope.unitsBothWays} struck both held and suspended. Frequencies at ${map.scope.referenceTemperatureC} °C.`}
      >
        <option value="">All batches of this specification</option>
        {batches.map((b) => (
          <option key={b.id} value={b.id}>
            Batch {b.code} ({b.measured} of {b.units} measured)
          </option>
        ))}
      </SelectField>
      {units.length > 1 || chosen.size ? (
        <details className="rounded-control border border-line px-3 py-2">
          <summary className="cursor-pointer text-caption font-semibold text-ink">
            Units: {chosen.size ? `${chosen.size} chosen` : `all ${units.length}`}
          </summary>
          <form
            className="mt-2 flex flex-col gap-2"
            onSubmit={(e) => {
              e.preventDefault();
              onChange({ ...params, units: picked.size ? [...picked].join(",") : undefined });
            }}
          >
            <div className="grid max-h-56 grid-cols-2 gap-1 overflow-y-auto sm:grid-cols-3">
              {units.map((u) => (
                <label key={u.id} className="inline-flex min-h-9 items-center gap-2 text-caption">
                  <input
                    type="checkbox"
                    className="size-5 accent-steel-600"
                    checked={picked.has(u.id)}
                    onChange={(e) => {
                      const next = new Set(picked);
                      if (e.target.checked) next.add(u.id);
                      else next.delete(u.id);
                      setPicked(next);
                    }}
                  />
                  {u.serial}
                  <span className="text-ink-faint">{u.supports.join(", ")}</span>
                </label>
              ))}
            </div>
            <div className="flex gap-2">
              <Button type="submit" size="sm">
                Use {picked.size ? `these ${picked.size}` : "all units"}
              </Button>
              {chosen.size ? (
                <Button
                  size="sm"
                  variant="quiet"
                  onClick={() => {
                    setPicked(new Set());
                    onChange({ ...params, units: undefined });
                  }}
                >
                  All units
                </Button>
              ) : null}
            </div>
          </form>
        </details>
      ) : null}
    </div>
  );
}

/** Typical starting values (confirm with your own parts): carbon steel's density; a caliper and a micrometer. */
const DEFAULTS = { densityKgM3: "7850", lengthUncertaintyMm: "0.1", thicknessUncertaintyMm: "0.01" };

export function GeometryForm({ params, family, lengthMm, onApply }: { params: ModeMapParams; family: string; lengthMm: number | null; onApply: (next: ModeMapParams) => void }) {
  const defaultTemplate = family === "tuning_fork" ? "cantilever" : "free_free";
  const [v, setV] = useState({
    template: params.template ?? defaultTemplate,
    section: params.section ?? "rectangular",
    lengthMm: params.lengthMm ?? (lengthMm ? String(lengthMm) : ""),
    thicknessMm: params.thicknessMm ?? "",
    densityKgM3: params.densityKgM3 ?? DEFAULTS.densityKgM3,
    lengthUncertaintyMm: params.lengthUncertaintyMm ?? DEFAULTS.lengthUncertaintyMm,
    thicknessUncertaintyMm: params.thicknessUncertaintyMm ?? DEFAULTS.thicknessUncertaintyMm,
  });
  const set = (k: keyof typeof v) => (e: { target: { value: string } }) => setV({ ...v, [k]: e.target.value.replace(",", ".") });
  const submit = (e: FormEvent) => {
    e.preventDefault();
    onApply({ ...params, ...v });
  };
  return (
    <form onSubmit={submit} className="flex flex-col gap-3" aria-label="Young's modulus from geometry">
      <p className="max-w-prose text-caption text-ink-soft">
        Without a model, the measured fundamental gives the modulus through a slender-beam formula: a fork tine as a cantilever from the crotch, a bar as a free–free beam. Measure the part itself; the density and the reading uncertainties below are typical starting values — confirm them with your own parts.
      </p>
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <SelectField label="Template" value={v.template} onChange={set("template")}>
          <option value="cantilever">Tine (cantilever)</option>
          <option value="free_free">Bar (free–free)</option>
        </SelectField>
        <SelectField label="Section" value={v.section} onChange={set("section")}>
          <option value="rectangular">Rectangular</option>
          <option value="round">Round</option>
        </SelectField>
        <InputField label="Vibrating length (mm)" inputMode="decimal" required value={v.lengthMm} onChange={set("lengthMm")} hint={v.template === "cantilever" ? "From the crotch to the tine end." : "End to end."} />
        <InputField label={v.section === "round" ? "Diameter (mm)" : "Thickness in the plane of vibration (mm)"} inputMode="decimal" required value={v.thicknessMm} onChange={set("thicknessMm")} />
        <InputField label="Density (kg/m³)" inputMode="decimal" required value={v.densityKgM3} onChange={set("densityKgM3")} />
        <InputField label="Length reading ± (mm)" inputMode="decimal" value={v.lengthUncertaintyMm} onChange={set("lengthUncertaintyMm")} />
        <InputField label="Thickness reading ± (mm)" inputMode="decimal" value={v.thicknessUncertaintyMm} onChange={set("thicknessUncertaintyMm")} />
      </div>
      <div>
        <Button type="submit" variant="secondary">
          Work out E
        </Button>
      </div>
    </form>
  );
}
