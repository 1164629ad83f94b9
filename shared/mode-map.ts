/**
 * The mode map: a design's predicted mode lists against its measured modes. Joins the matching
 * (shared/mode-matching.ts), the measured modes and their hold effect (shared/mode-measurements.ts)
 * and the beam templates (shared/beam.ts) into what the Modes page and the API show. Pure.
 */
import { betaL, BeamInputError, youngsModulusFromFrequencyPa, youngsModulusRelativeUncertainty, type BeamTemplate } from "./beam.ts";
import { holdAgreement } from "./mode-measurements.ts";
import { defaultMatchOptions, matchAtScale, matchModes, type MatchedPair, type MatchOptions } from "./mode-matching.ts";
import { RIGID_BODY_BELOW_HZ, type GeometryEstimate, type HoldEffect, type MeasuredModeView, type ModeKind, type ModeList, type ModeMap, type ModeMapQuery, type ModeMapRow } from "./schemas/modes.ts";

export type ModelInput = Omit<ModeList, "modes"> & { modes: ModeList["modes"] };

/** Rigid-body modes (by kind, or below 1 Hz) are kept in the list but never matched. */
export function isRigidBody(m: { kind: ModeKind | null; frequencyHz: number }): boolean {
  return m.kind === "rigid_body" || m.frequencyHz < RIGID_BODY_BELOW_HZ;
}

const keyOf = (list: number, mode: number) => `${list}:${mode}`;

type Material = Pick<ModeMap, "stiffnessFactor" | "stiffnessFactorUncertainty" | "youngsModulusGPa" | "youngsModulusUncertaintyGPa" | "youngsModulusSource" | "modelYoungsModulusGPa" | "modelDensityKgM3" | "fitModes">;

export function buildModeMap(models: ModelInput[], measured: MeasuredModeView[], opts: MatchOptions = defaultMatchOptions): Material & Pick<ModeMap, "modes" | "unmatchedPartials" | "measuredModes"> {
  const byId = new Map(measured.map((m) => [m.id, m]));
  // Free models meet the suspended strikes' frequencies, held models the held ones; a mode of the
  // support never meets the metal's modes.
  const frequencyFor = (m: MeasuredModeView, condition: ModelInput["condition"]) => (condition === "free" ? m.freeHz : m.heldHz) ?? m.measuredHz;
  const structuralMeasured = measured.filter((m) => m.supportMode !== true);
  const sets = models.map((model, li) => ({
    predicted: model.modes.filter((m) => !isRigidBody(m) && m.kind !== "support").map((m) => ({ key: keyOf(li, m.mode), frequencyHz: m.frequencyHz })),
    measured: structuralMeasured.map((m) => ({ key: String(m.id), frequencyHz: frequencyFor(m, model.condition), uncertaintyHz: m.measuredUncertaintyHz })),
  }));
  const result = matchModes(sets, opts);
  const k = result.fit?.k ?? null;
  const pairs = new Map<string, MatchedPair>();
  result.pairs.forEach((list) => list.forEach((p) => pairs.set(p.predictedKey, p)));

  // Support modes of a held model: matched at the fitted k to what rang only when held (or, before
  // any unit was struck both ways, to whatever the structural matching left).
  models.forEach((model, li) => {
    const support = model.modes.filter((m) => m.kind === "support" && !isRigidBody(m));
    if (!support.length) return;
    const used = new Set([...pairs.values()].filter((p) => p.predictedKey.startsWith(`${li}:`)).map((p) => p.measuredKey));
    const candidates = measured.filter((m) => (m.supportMode === null ? !used.has(String(m.id)) : m.supportMode));
    const found = matchAtScale(
      { predicted: support.map((m) => ({ key: keyOf(li, m.mode), frequencyHz: m.frequencyHz })), measured: candidates.map((m) => ({ key: String(m.id), frequencyHz: frequencyFor(m, model.condition) })) },
      k ?? 1,
      opts,
    );
    for (const p of found) pairs.set(p.predictedKey, p);
  });

  // The model's label of each measured mode: the held model's where it has one (it is the model of
  // the part as held), else the free model's.
  const kindOfMeasured = new Map<number, ModeKind>();
  [...models.keys()]
    .sort((a, b) => (models[a].condition === models[b].condition ? a - b : models[a].condition === "held" ? -1 : 1))
    .forEach((li) => {
      for (const m of models[li].modes) {
        const p = pairs.get(keyOf(li, m.mode));
        if (p && m.kind && !kindOfMeasured.has(Number(p.measuredKey))) kindOfMeasured.set(Number(p.measuredKey), m.kind);
      }
    });
  const withModel = (h: HoldEffect | null, kind: ModeKind | null): HoldEffect | null => (h ? { ...h, modelKind: kind, agreement: holdAgreement(h.verdict, kind) } : null);
  const measuredModes = measured.map((m) => ({ ...m, holdEffect: withModel(m.holdEffect, kindOfMeasured.get(m.id) ?? null) }));

  const rows: ModeMapRow[] = [];
  const order = [...models.keys()].sort((a, b) => (models[a].condition === models[b].condition ? a - b : models[a].condition === "free" ? -1 : 1));
  for (const li of order) {
    const model = models[li];
    for (const m of [...model.modes].sort((a, b) => a.mode - b.mode)) {
      const p = pairs.get(keyOf(li, m.mode));
      const mm = p ? byId.get(Number(p.measuredKey)) ?? null : null;
      const measuredHz = p ? p.measuredHz : null;
      rows.push({
        mode: m.mode,
        label: m.label,
        kind: isRigidBody(m) ? "rigid_body" : m.kind,
        condition: model.condition,
        listId: model.id,
        predictedHz: m.frequencyHz,
        calibratedHz: k !== null && !isRigidBody(m) ? m.frequencyHz * k : null,
        measuredHz,
        measuredSpreadHz: mm?.measuredSpreadHz ?? null,
        ratio: measuredHz !== null ? measuredHz / m.frequencyHz : null,
        residualCents: p ? p.residualCents : null,
        inFit: p ? (m.kind === "support" ? false : p.inFit) : null,
        units: mm?.units ?? 0,
        tauBySupport: mm?.tauBySupport ?? { hand: null, suspended: null, stand: null },
        holdEffect: mm ? withModel(mm.holdEffect, m.kind) : null,
        measuredModeId: mm?.id ?? null,
      });
    }
  }
  const matchedIds = new Set(rows.map((r) => r.measuredModeId).filter((id): id is number => id !== null));

  const withE = models.find((m) => m.condition === "free" && m.youngsModulusGPa !== null) ?? models.find((m) => m.youngsModulusGPa !== null) ?? null;
  const eModel = withE?.youngsModulusGPa ?? null;
  const fit = result.fit;
  return {
    stiffnessFactor: fit?.k ?? null,
    stiffnessFactorUncertainty: fit?.uK ?? null,
    // E_eff = k²·E_model (the density in the model assumed right); u(E)/E = 2·u(k)/k.
    youngsModulusGPa: fit && eModel !== null ? fit.k * fit.k * eModel : null,
    youngsModulusUncertaintyGPa: fit && eModel !== null ? 2 * (fit.uK / fit.k) * fit.k * fit.k * eModel : null,
    youngsModulusSource: fit && eModel !== null ? "model" : null,
    modelYoungsModulusGPa: eModel,
    modelDensityKgM3: withE?.densityKgM3 ?? models.find((m) => m.densityKgM3 !== null)?.densityKgM3 ?? null,
    fitModes: fit?.n ?? 0,
    modes: rows,
    unmatchedPartials: measuredModes.filter((m) => !matchedIds.has(m.id)),
    measuredModes,
  };
}

/**
 * Typical starting values for the geometry's uncertainties when none are given: a caliper reading
 * of a length (±0.1 mm), a micrometer reading of a thickness (±0.01 mm), and a handbook density
 * for an alloy class (±0.5 %). Our own choices; the page asks the user to confirm them.
 */
export const GEOMETRY_DEFAULT_UNCERTAINTY = { lengthMm: 0.1, thicknessMm: 0.01, densityRelative: 0.005 };

/** The beam template of a product family: a fork tine is a cantilever, a bar or tube free–free. */
export function templateForFamily(family: string): BeamTemplate | null {
  if (family === "tuning_fork") return "cantilever";
  if (family === "free_bar" || family === "tube") return "free_free";
  return null;
}

/**
 * E from geometry: the measured mode nearest the specification's fundamental, read as the first
 * bending mode of the template. Null when geometry is incomplete or nothing was measured near it.
 */
export function geometryEstimate(q: ModeMapQuery, family: string, fundamentalTargetHz: number | null, measured: MeasuredModeView[]): GeometryEstimate | null {
  const template = q.template ?? templateForFamily(family);
  if (!template || !q.lengthMm || !q.thicknessMm || !q.densityKgM3 || !measured.length) return null;
  betaL(template, 1);
  const target = fundamentalTargetHz ?? measured[0].measuredHz;
  const nearest = [...measured]
    .filter((m) => m.supportMode !== true)
    .sort((a, b) => Math.abs(Math.log(a.measuredHz / target)) - Math.abs(Math.log(b.measuredHz / target)) || b.units - a.units)[0];
  // More than half an octave away is another mode, not the fundamental.
  if (!nearest || Math.abs(1200 * Math.log2(nearest.measuredHz / target)) > 600) return null;
  const f = nearest.freeHz ?? nearest.measuredHz;
  const section = q.section === "round" ? ({ shape: "round", diameterM: q.thicknessMm / 1000 } as const) : ({ shape: "rectangular", thicknessM: q.thicknessMm / 1000 } as const);
  try {
    const e = youngsModulusFromFrequencyPa({ template, frequencyHz: f, lengthM: q.lengthMm / 1000, section, densityKgM3: q.densityKgM3 });
    const rel = youngsModulusRelativeUncertainty({
      frequency: nearest.measuredUncertaintyHz / f,
      length: (q.lengthUncertaintyMm ?? GEOMETRY_DEFAULT_UNCERTAINTY.lengthMm) / q.lengthMm,
      thickness: (q.thicknessUncertaintyMm ?? GEOMETRY_DEFAULT_UNCERTAINTY.thicknessMm) / q.thicknessMm,
      density: q.densityUncertaintyKgM3 !== undefined ? q.densityUncertaintyKgM3 / q.densityKgM3 : GEOMETRY_DEFAULT_UNCERTAINTY.densityRelative,
    });
    return { template, section: q.section, lengthMm: q.lengthMm, thicknessMm: q.thicknessMm, densityKgM3: q.densityKgM3, fundamentalHz: f, youngsModulusGPa: e / 1e9, youngsModulusUncertaintyGPa: (rel * e) / 1e9 };
  } catch (error) {
    if (error instanceof BeamInputError) return null;
    throw error;
  }
}
