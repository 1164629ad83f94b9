/**
 * Importing a predicted mode list: choose the file, see it read in the browser with the same code
 * the server runs (shared/mode-import.ts), map its columns, fix what the preview flags, import.
 */
import { useState, type FormEvent } from "react";
import { decodeTableBytes, frequencyUnits, guessMapping, ModeTableError, modeFieldLabels, modeFields, modesFromTable, readModeTable, unitFromHeader, type ColumnMapping, type ModeImport, type ModeTable } from "@shared/mode-import";
import { MAX_MODE_FILE_BYTES, modeKindLabels, modelConditionLabels, modelConditions, type ModelCondition } from "@shared/schemas/modes";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField, SelectField } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";
import { useImportPredictedModes } from "../api/import-predicted-modes";

const PREVIEW_ROWS = 12;

export function ModeImportForm({ workshopId, specId, versionId, version }: { workshopId: string; specId: string; versionId: string; version: number }) {
  const [file, setFile] = useState<File | null>(null);
  const [table, setTable] = useState<ModeTable | null>(null);
  const [readError, setReadError] = useState<string | null>(null);
  const [mapping, setMapping] = useState<ColumnMapping | null>(null);
  const [condition, setCondition] = useState<ModelCondition>("free");
  const [name, setName] = useState("");
  const [modulus, setModulus] = useState("");
  const [density, setDensity] = useState("");
  const [done, setDone] = useState<string | null>(null);
  // A new key clears the file input after an import (its value cannot be set from script).
  const [inputKey, setInputKey] = useState(0);
  const importer = useImportPredictedModes(workshopId, specId, versionId);

  const preview: ModeImport | null = table && mapping ? modesFromTable(table, mapping) : null;

  async function choose(f: File | null) {
    setDone(null);
    importer.reset();
    setFile(f);
    setTable(null);
    setMapping(null);
    setReadError(null);
    if (!f) return;
    if (f.size > MAX_MODE_FILE_BYTES) return setReadError(`The file is ${(f.size / 1024).toFixed(0)} KB; mode lists up to ${MAX_MODE_FILE_BYTES / 1024} KB are accepted. Export only the mode table.`);
    try {
      const t = readModeTable(decodeTableBytes(new Uint8Array(await f.arrayBuffer())));
      setTable(t);
      setMapping(guessMapping(t.columns));
      if (t.meta.name && !name) setName(t.meta.name);
      if (t.meta.condition === "free" || t.meta.condition === "held") setCondition(t.meta.condition);
      if (t.meta.youngsModulusGPa && !modulus) setModulus(String(t.meta.youngsModulusGPa));
      if (t.meta.densityKgM3 && !density) setDensity(String(t.meta.densityKgM3));
    } catch (error) {
      setReadError(error instanceof ModeTableError ? error.message : "The file could not be read as text.");
    }
  }

  function submit(event: FormEvent) {
    event.preventDefault();
    if (!file || !mapping || !preview || preview.errors.length) return;
    importer.mutate(
      { file, mapping, condition, name, youngsModulusGPa: modulus, densityKgM3: density },
      {
        onSuccess: (result) => {
          setDone(`Imported ${result.lists.map((l) => `${l.modes.length} modes (${l.condition} model)`).join(" and ")} with version ${version}.`);
          setFile(null);
          setTable(null);
          setMapping(null);
          setName("");
          setModulus("");
          setDensity("");
          setInputKey((k) => k + 1);
        },
      },
    );
  }

  const serverError = importer.error;
  const serverLines = isApiError(serverError) && serverError.fields ? Object.entries(serverError.fields) : [];

  return (
    <form onSubmit={submit} className="flex flex-col gap-4" aria-label="Import a predicted mode list">
      <p className="max-w-prose text-ink-soft">
        A table of natural frequencies from your modal analysis, as CSV (any separator, decimal commas welcome) or JSON. Columns are matched by name; check them in the preview. The list is stored with version {version} of this specification, and later versions use it until you import a new one; rows
        below 1 Hz are rigid-body motion and are never matched.
      </p>
      <div className="flex flex-col gap-1.5">
        <label htmlFor="mode-file" className="text-caption font-semibold text-ink">
          Mode list file
        </label>
        <input
          key={inputKey}
          id="mode-file"
          type="file"
          accept=".csv,.txt,.tsv,.json,.dat,text/csv,text/plain,application/json"
          onChange={(e) => void choose(e.target.files?.[0] ?? null)}
          className="block w-full text-body file:mr-3 file:min-h-touch file:rounded-control file:border file:border-line-strong file:bg-surface file:px-4 file:text-body file:font-medium"
        />
      </div>
      {readError ? <Alert tone="error" title="This file cannot be read">{readError}</Alert> : null}
      {table && mapping ? (
        <>
          <fieldset className="grid gap-3 sm:grid-cols-3">
            <legend className="mb-2 text-caption font-semibold text-ink">Columns in the file</legend>
            {modeFields.map((field) => (
              <SelectField
                key={field}
                label={modeFieldLabels[field]}
                value={mapping[field] ?? ""}
                onChange={(e) => {
                  const column = e.target.value || null;
                  setMapping({ ...mapping, [field]: column, ...(field === "frequencyHz" && column ? { frequencyUnit: unitFromHeader(column) } : {}) });
                }}
              >
                <option value="">{field === "mode" ? "— number rows in order —" : "— not in the file —"}</option>
                {table.columns.map((c) => (
                  <option key={c} value={c}>
                    {c}
                  </option>
                ))}
              </SelectField>
            ))}
            <SelectField label="Frequency unit" value={mapping.frequencyUnit} onChange={(e) => setMapping({ ...mapping, frequencyUnit: e.target.value as ColumnMapping["frequencyUnit"] })}>
              {frequencyUnits.map((u) => (
                <option key={u} value={u}>
                  {u === "rad/s" ? "rad/s (angular frequency)" : u}
                </option>
              ))}
            </SelectField>
          </fieldset>
          {preview ? <Preview preview={preview} /> : null}
        </>
      ) : null}
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField label="The model is of the part" value={condition} onChange={(e) => setCondition(e.target.value as ModelCondition)} hint="Rows with their own condition column override this.">
          {modelConditions.map((c) => (
            <option key={c} value={c}>
              {modelConditionLabels[c]}
            </option>
          ))}
        </SelectField>
        <InputField label="Name of the list" value={name} onChange={(e) => setName(e.target.value)} maxLength={120} placeholder="e.g. Free model, design review 3" />
        <InputField
          label="Young's modulus the model assumed (GPa)"
          inputMode="decimal"
          value={modulus}
          onChange={(e) => setModulus(e.target.value)}
          hint="For the modulus the parts really have. Carbon steel is usually modelled near 200–210 GPa — use the value your model used."
        />
        <InputField label="Density the model used (kg/m³)" inputMode="decimal" value={density} onChange={(e) => setDensity(e.target.value)} hint="Taken as right: only E is corrected." />
      </div>
      {importer.isError ? (
        <Alert tone="error" title="Nothing was imported">
          <p>{serverError?.message}</p>
          {serverLines.length > 1 ? (
            <ul className="mt-1 list-disc pl-5">
              {serverLines.slice(0, 12).map(([k, v]) => (
                <li key={k}>
                  {k}: {v}
                </li>
              ))}
            </ul>
          ) : null}
        </Alert>
      ) : null}
      {done ? <Alert tone="success">{done}</Alert> : null}
      <div>
        <Button type="submit" pending={importer.isPending} disabled={!preview || preview.errors.length > 0 || preview.modes.length === 0}>
          Import {preview && !preview.errors.length ? `${preview.modes.length} modes` : "the list"}
        </Button>
      </div>
    </form>
  );
}

function Preview({ preview }: { preview: ModeImport }) {
  const { modes, errors, notes } = preview;
  return (
    <div className="flex flex-col gap-2" aria-live="polite">
      {errors.length ? (
        <Alert tone="error" title={`${errors.length === 1 ? "One line needs" : `${errors.length} lines need`} fixing before import`}>
          <ul className="list-disc pl-5">
            {errors.slice(0, 12).map((e) => (
              <li key={`${e.line}-${e.message}`}>
                Line {e.line}: {e.message}
              </li>
            ))}
          </ul>
        </Alert>
      ) : null}
      {notes.length ? <p className="text-caption text-ink-soft">{notes.join(" ")}</p> : null}
      {modes.length ? (
        <div className="overflow-x-auto">
          <table className="w-full min-w-[28rem] text-caption" data-testid="mode-import-preview">
            <caption className="mb-1 text-left text-caption font-semibold text-ink">
              Preview: {modes.length} mode{modes.length === 1 ? "" : "s"}
              {modes.length > PREVIEW_ROWS ? `, the first ${PREVIEW_ROWS} shown` : ""}
            </caption>
            <thead>
              <tr className="text-left text-ink-soft">
                <th className="px-2 py-1">Line</th>
                <th className="px-2 py-1">Mode</th>
                <th className="px-2 py-1 text-right">Frequency (Hz)</th>
                <th className="px-2 py-1">Kind</th>
                <th className="px-2 py-1">Condition</th>
                <th className="px-2 py-1">Label</th>
              </tr>
            </thead>
            <tbody>
              {modes.slice(0, PREVIEW_ROWS).map((m) => (
                <tr key={`${m.condition}-${m.mode}`} className="border-t border-line">
                  <td className="px-2 py-1 tabular-nums text-ink-faint">{m.line}</td>
                  <td className="px-2 py-1 tabular-nums">{m.mode}</td>
                  <td className="px-2 py-1 text-right tabular-nums">{m.frequencyHz < 1 ? m.frequencyHz.toPrecision(2) : m.frequencyHz.toFixed(2)}</td>
                  <td className="px-2 py-1">{m.kind ? modeKindLabels[m.kind] : "—"}</td>
                  <td className="px-2 py-1">{m.condition ?? "as chosen below"}</td>
                  <td className="px-2 py-1">{m.label || "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
    </div>
  );
}
