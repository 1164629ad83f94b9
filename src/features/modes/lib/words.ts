/**
 * The mode map in sentences, as an engineer would say it: the stiffness the parts really have, the
 * modes that stay off after calibration, and what the hold does.
 */
import { holdVerdictLabels, modeKindLabels, type HoldEffect, type ModeMap, type ModeMapRow } from "@shared/schemas/modes";
import { formatCents, formatUncertainty } from "@/lib/format";

const centsOf = (ratio: number) => 1200 * Math.log2(ratio);

/** A number with as many decimals as its uncertainty's two significant figures need. */
export function withUncertainty(value: number, u: number, unit = ""): string {
  const text = formatUncertainty(u);
  const decimals = text.includes(".") ? text.split(".")[1].length : 0;
  return `${value.toFixed(decimals)} ± ${text}${unit}`;
}

export function modeName(row: Pick<ModeMapRow, "mode" | "label">): string {
  return row.label ? `mode ${row.mode} (${row.label})` : `mode ${row.mode}`;
}

/** "The parts are 5.5 % less stiff than the model assumed: E ≈ 198.5 GPa ± 0.44 …" */
export function stiffnessSentence(map: ModeMap): string {
  const k = map.stiffnessFactor;
  const uK = map.stiffnessFactorUncertainty;
  if (k === null || uK === null) {
    if (map.geometry && map.youngsModulusSource === "geometry") return geometrySentence(map);
    if (!map.models.length) return "No model yet: import the predicted modes of this design to see which partial is which mode and what stiffness the parts really have.";
    if (!map.measuredModes.length) return "No measurements yet: strike units of this specification (suspended, if you can) and the partials found are matched to the model's modes here.";
    return "No stiffness factor yet: no measured partial lies within reach of the model's modes. Strike a few units of this specification (suspended, if you can), or check that the model is of this part.";
  }
  const shift = `Every frequency sits ${Math.abs((k - 1) * 100).toFixed(1)} % (${formatCents(centsOf(k))}) ${k >= 1 ? "above" : "below"} the model's`;
  const from = `${map.fitModes} matched mode${map.fitModes === 1 ? "" : "s"}; k = ${withUncertainty(k, uK)}, standard uncertainty`;
  if (map.youngsModulusGPa === null || map.youngsModulusUncertaintyGPa === null || map.modelYoungsModulusGPa === null) {
    return `${shift} (from ${from}). Enter the Young's modulus the model assumed with the mode list to see the modulus the parts really have.`;
  }
  const stiffer = (k * k - 1) * 100;
  const e = withUncertainty(map.youngsModulusGPa, map.youngsModulusUncertaintyGPa, " GPa");
  const one = map.fitModes === 1 ? " With one mode only, a wrong geometry in the model cannot be told from a wrong material." : "";
  return `The parts are ${Math.abs(stiffer).toFixed(1)} % ${stiffer >= 0 ? "stiffer" : "less stiff"} than the model assumed: E ≈ ${e} instead of ${map.modelYoungsModulusGPa} GPa, taking the model's density${map.modelDensityKgM3 ? ` (${map.modelDensityKgM3} kg/m³)` : ""} as right. ${shift} (from ${from}).${one}`;
}

export function geometrySentence(map: ModeMap): string {
  const g = map.geometry;
  if (!g) return "";
  const template = g.template === "cantilever" ? "cantilever (a tine clamped at the crotch)" : "free–free beam (a bar resting at its nodes)";
  const caveat =
    g.template === "cantilever"
      ? " The template treats the stem as a rigid clamp; a real stem gives a little, so this modulus reads low — a rough check, not a calibration."
      : " Thick or short bars ring a little below the slender-beam formula, so this modulus reads low for them.";
  return `From the ${template}: E ≈ ${withUncertainty(g.youngsModulusGPa, g.youngsModulusUncertaintyGPa, " GPa")} (standard uncertainty), from the measured fundamental ${g.fundamentalHz.toFixed(1)} Hz, length ${g.lengthMm} mm, ${g.section === "round" ? "diameter" : "thickness"} ${g.thicknessMm} mm and density ${g.densityKgM3} kg/m³.${caveat}`;
}

/**
 * The modes matched but left out of the fit: off after calibration, pointing at geometry. One
 * sentence per measured mode, naming each model that puts it off.
 */
export function residualSentences(rows: ModeMapRow[]): string[] {
  const off = rows.filter((r) => r.inFit === false && r.kind !== "support" && r.residualCents !== null);
  const byMeasured = new Map<number, ModeMapRow[]>();
  for (const r of off) byMeasured.set(r.measuredModeId ?? -1, [...(byMeasured.get(r.measuredModeId ?? -1) ?? []), r]);
  return [...byMeasured.values()].map((list) => {
    const [first, ...rest] = [...list].sort((a, b) => (a.condition === b.condition ? 0 : a.condition === "free" ? -1 : 1));
    const also = rest.map((r) => ` (${formatCents(r.residualCents)} in the ${r.condition} model, its mode ${r.mode})`).join("");
    return `${capitalise(modeName(first))} stays ${formatCents(first.residualCents)} off in the ${first.condition} model after calibration${also}, so it is left out of the fit: a mode that stays off when the material is right points at the geometry (a tine length or width, a thickness), not the material.`;
  });
}

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

const verdictWord = (h: HoldEffect) => holdVerdictLabels[h.verdict];

/** What the hold does, in a few sentences: counts, the modes of the support, where model and measurement disagree. */
export function holdSentences(map: ModeMap): string[] {
  const out: string[] = [];
  const withHold = map.measuredModes.filter((m) => m.holdEffect);
  if (!withHold.length) {
    out.push(
      map.scope.unitsBothWays === 0
        ? "To see what the hold does, strike a few units both ways — suspended (or resting on soft foam) and held as they are used — and tag each strike with its support."
        : "No mode was found in both a held and a suspended strike of the same unit yet.",
    );
    return out;
  }
  const support = withHold[0].holdEffect!.support === "hand" ? "in the hand" : "on the stand";
  const count = (v: HoldEffect["verdict"]) => withHold.filter((m) => m.holdEffect!.verdict === v).length;
  const parts = [
    count("rings") ? `${count("rings")} ring${count("rings") === 1 ? "s" : ""} on` : null,
    count("partly_damped") ? `${count("partly_damped")} partly damped` : null,
    count("damped") ? `${count("damped")} damped by the hold` : null,
  ].filter(Boolean);
  out.push(`Held ${support} (${map.scope.unitsBothWays} unit${map.scope.unitsBothWays === 1 ? "" : "s"} struck both ways): of the modes of the part, ${parts.join(", ")}.`);
  const supportModes = withHold.filter((m) => m.holdEffect!.verdict === "support_mode");
  if (supportModes.length) {
    out.push(`${supportModes.length === 1 ? "One partial appears" : `${supportModes.length} partials appear`} only when held — modes of the support: ${supportModes.map((m) => `${m.measuredHz.toFixed(1)} Hz`).join(", ")}.`);
  }
  for (const row of disagreements(map)) {
    const h = row.holdEffect!;
    const ratio = h.ratio !== null && h.ratioUncertainty !== null ? ` (τ held/free ${ratioText(h.ratio, h.ratioUncertainty)})` : "";
    const measured = { rings: "it rings when held", damped: "the hold damps it", partly_damped: "the hold damps it partly", support_mode: "it is found only when held" }[h.verdict];
    out.push(`The ${row.condition} model calls its ${modeName(row)} ${row.kind ? modeKindLabels[row.kind].toLowerCase() : "unlabelled"}, but ${measured}${ratio}: model and measurement disagree.`);
  }
  return out;
}

/** One row per measured mode where a model label disagrees with the measurement (the held model's row first). */
export function disagreements(map: ModeMap): ModeMapRow[] {
  const seen = new Set<number>();
  return [...map.modes]
    .sort((a, b) => (a.condition === b.condition ? 0 : a.condition === "held" ? -1 : 1))
    .filter((r) => {
      if (r.holdEffect?.agreement !== "disagrees" || r.measuredModeId === null || seen.has(r.measuredModeId)) return false;
      seen.add(r.measuredModeId);
      return true;
    });
}

/** The modes a chart or table names a measured mode by: its match in the free model, else the held. */
export function measuredModeNames(map: ModeMap): Map<number, string> {
  const names = new Map<number, string>();
  for (const cond of ["free", "held"] as const) {
    for (const r of map.modes) if (r.condition === cond && r.measuredModeId !== null && !names.has(r.measuredModeId)) names.set(r.measuredModeId, `${cond === "free" ? "F" : "H"}${r.mode}`);
  }
  return names;
}

/** τ_held/τ_free with its uncertainty: two decimals, three when the uncertainty is below 0.01. */
export function ratioText(ratio: number, u: number): string {
  const d = u < 0.01 ? 3 : 2;
  return `${ratio.toFixed(d)} ± ${Math.max(u, 10 ** -d).toFixed(d)}`;
}

/** The verdict, with how often a mode vanished when it has no ratio. */
export function holdVerdictText(h: HoldEffect): string {
  if (h.ratio === null && h.goneWhenHeld && h.verdict !== "support_mode") return `${verdictWord(h)} (gone in ${h.goneWhenHeld} of ${h.units})`;
  return verdictWord(h);
}

export function holdText(h: HoldEffect | null): string {
  if (!h) return "—";
  const ratio = h.ratio !== null && h.ratioUncertainty !== null ? `${ratioText(h.ratio, h.ratioUncertainty)}: ` : "";
  return `${ratio}${holdVerdictText(h)}`;
}
