/**
 * A specification from a master unit: QA strikes the workshop's reference part, and its measured
 * partials become the targets — the lowest strong partial (a bell's prime, a tube's strike note)
 * in Hz, the others as ratios to it — with tolerances around them. Works for every family; a bell
 * gets the trade's partial names where the master's partials stand near them, a tube its strike note.
 *
 * Pure: the analysis' partials in, a draft the spec editor shows for review out.
 */
import type { Partial as MeasuredPartial } from "./schemas/analysis.ts";
import type { Family, SpecFormValues, SpecPartialInput } from "./schemas/spec.ts";
import { A4_HZ, cents, correctToReferenceTemperature, STEEL_FREQUENCY_TEMPERATURE_COEFFICIENT_PER_C } from "./physics.ts";
import { BELL_PARTIAL_RATIOS, specTemplate } from "./spec-templates.ts";
import { findStrikeNote } from "./strike-note.ts";
import { nearestNote } from "./tuning.ts";

export type MasterOptions = {
  family: Family;
  /** Most partials taken from the master (the strongest ones), 1–12. */
  maxPartials: number;
  /** Tolerance on the fundamental (or strike note), cents. */
  fundamentalToleranceCents: number;
  /** Tolerance on every other partial's ratio, cents. */
  partialToleranceCents: number;
  /** Temperature of the master when struck, °C; its frequencies are corrected to the reference temperature. */
  temperatureC: number | null;
  /** What the master recording was, for the description: file name, sha256, when. */
  source: { fileName: string; sha256: string; analysedAt: string };
};

/** Partials weaker than the strongest by more than this are left out: they may not show on every strike. */
export const MASTER_LEVEL_WINDOW_DB = 40;
/** A bell partial name is given when the master's partial stands within this many cents of its usual ratio. */
const BELL_NAME_WINDOW_CENTS = 100;

export type MasterDraft = {
  draft: SpecFormValues;
  /** Which of the master's partials (indices into its partials) became which requirement label. */
  used: { index: number; label: string }[];
  /** The strike note read from the master, when the family is a tube and one was found. */
  strikeNoteHz: number | null;
};

/** Targets keep enough digits that the master, evaluated against its own spec, deviates by < 0.001 cent. */
const hz4 = (x: number) => Math.round(x * 1e4) / 1e4;
const ratio6 = (x: number) => Math.round(x * 1e6) / 1e6;

/**
 * The bell names for the master's partials: the prime is the partial that lets the most others
 * stand near the usual ratios (0.5, 1.2, 1.5, 2); ties to the stronger prime.
 */
function bellNames(ps: readonly MeasuredPartial[], chosen: number[]): Map<number, string> {
  let best = new Map<number, string>();
  for (const prime of chosen) {
    const names = new Map<number, string>([[prime, "Prime"]]);
    for (const b of BELL_PARTIAL_RATIOS) {
      if (b.label === "Prime") continue;
      const target = b.ratio * ps[prime].frequencyHz;
      const near = chosen
        .filter((i) => !names.has(i) && Math.abs(cents(ps[i].frequencyHz, target)) <= BELL_NAME_WINDOW_CENTS)
        .sort((a, c) => Math.abs(cents(ps[a].frequencyHz, target)) - Math.abs(cents(ps[c].frequencyHz, target)))[0];
      if (near !== undefined) names.set(near, b.label);
    }
    if (names.size > best.size || (names.size === best.size && best.size > 0 && ps[prime].amplitudeDb > ps[[...best].find(([, l]) => l === "Prime")![0]].amplitudeDb)) best = names;
  }
  return best.size >= 3 ? best : new Map();
}

/** Builds the draft; throws a RangeError with a plain message when the master shows no usable partial. */
export function specFromMaster(partials: readonly MeasuredPartial[], opts: MasterOptions): MasterDraft {
  const template = specTemplate(opts.family);
  const referenceTemperatureC = template.referenceTemperatureC ?? 20;
  const coefficient = template.tempCoefficientPerC ?? STEEL_FREQUENCY_TEMPERATURE_COEFFICIENT_PER_C;
  const usable = partials.map((p, index) => ({ p, index })).filter(({ p }) => Number.isFinite(p.frequencyHz) && p.frequencyHz > 0);
  if (usable.length === 0) throw new RangeError("No partial stood clear of the noise in the master recording. Strike the master firmly near the microphone and record again.");
  const loudest = Math.max(...usable.map(({ p }) => p.amplitudeDb));
  const chosen = usable
    .filter(({ p }) => p.amplitudeDb >= loudest - MASTER_LEVEL_WINDOW_DB)
    .sort((a, b) => b.p.amplitudeDb - a.p.amplitudeDb)
    .slice(0, opts.maxPartials)
    .map(({ index }) => index)
    .sort((a, b) => partials[a].frequencyHz - partials[b].frequencyHz);
  // Corrected to the reference temperature, as the evaluation will correct the production units.
  const fHz = (i: number) => (opts.temperatureC === null ? partials[i].frequencyHz : correctToReferenceTemperature(partials[i].frequencyHz, opts.temperatureC, referenceTemperatureC, coefficient));

  const rows: SpecPartialInput[] = [];
  const used: { index: number; label: string }[] = [];
  let fundamentalHz: number;
  let strikeNoteHz: number | null = null;
  const note = opts.family === "tube" ? findStrikeNote(chosen.map((i) => partials[i])) : null;
  const names = opts.family === "handbell" ? bellNames(partials, chosen) : new Map<number, string>();

  if (note) {
    // The strike note is read from the same partials on every strike, so its own target is the master's.
    const factor = fHz(chosen[0]) / partials[chosen[0]].frequencyHz;
    fundamentalHz = hz4(note.frequencyHz * factor);
    strikeNoteHz = fundamentalHz;
    rows.push({ label: "Strike note", isFundamental: true, targetKind: "strike_note", targetHz: fundamentalHz, toleranceCents: opts.fundamentalToleranceCents, required: true });
    const members = new Map(note.members.map((m) => [chosen[m.index], m.harmonic]));
    chosen.forEach((i, k) => {
      const label = members.has(i) ? `Series partial ${members.get(i)}` : `Partial ${k + 1}`;
      rows.push({ label, targetKind: "ratio", ratio: ratio6(fHz(i) / fundamentalHz), toleranceCents: opts.partialToleranceCents, required: true });
      used.push({ index: i, label });
    });
  } else {
    const fi = names.size ? [...names].find(([, l]) => l === "Prime")![0] : chosen[0];
    fundamentalHz = hz4(fHz(fi));
    chosen.forEach((i, k) => {
      const label = names.get(i) ?? (i === fi ? "Fundamental" : `Partial ${k + 1}`);
      rows.push(
        i === fi
          ? { label, isFundamental: true, targetKind: "absolute", targetHz: fundamentalHz, toleranceCents: opts.fundamentalToleranceCents, required: true }
          : { label, targetKind: "ratio", ratio: ratio6(fHz(i) / fundamentalHz), toleranceCents: opts.partialToleranceCents, required: true },
      );
      used.push({ index: i, label });
    });
  }

  const near = nearestNote(fundamentalHz, A4_HZ);
  const sign = near.cents >= 0 ? "+" : "−";
  const description = [
    `From the master unit recorded in "${opts.source.fileName}" (sha256 ${opts.source.sha256.slice(0, 16)}…), analysed ${opts.source.analysedAt.slice(0, 10)}${opts.temperatureC !== null ? `, struck at ${opts.temperatureC} °C and corrected to ${referenceTemperatureC} °C` : ""}.`,
    `Its ${rows.length === 1 ? "partial is the target" : `${chosen.length} strongest partials are the targets`}: ${note ? "the strike note" : "the fundamental"} at ${fundamentalHz.toFixed(3)} Hz (${near.name} ${sign}${Math.abs(near.cents).toFixed(1)} cents at A4 = 440 Hz), the others as ratios to it.`,
    `Tolerances ±${opts.fundamentalToleranceCents} cents on the ${note ? "strike note" : "fundamental"} and ±${opts.partialToleranceCents} cents on the ratios are typical starting values — confirm with your own parts, and keep the master recording with this specification.`,
  ].join("\n");

  const draft: SpecFormValues = {
    ...template,
    name: `${template.name.replace(/ \(.*\)$| [A-G][#b]?\d.*$/, "")} from master`,
    description,
    partials: rows,
  };
  return { draft, used, strikeNoteHz };
}
