/**
 * Starting specifications per product family, for the spec editor. Overtone ratios come from
 * published beam theory; tolerances, strike counts and limits are starting points of the trade
 * (marked "common practice, no published source") that the workshop edits to its own design.
 */
import type { Family, SpecFormValues, SpecPartialInput } from "./schemas/spec.ts";
import { A4_HZ, CANTILEVER_BETA_L, FREE_FREE_BETA_L, STEEL_FREQUENCY_TEMPERATURE_COEFFICIENT_PER_C, beamFrequencyRatios } from "./physics.ts";

/** Rounded to the three decimals the handbooks print (Blevins Table 8-1; Thomson App. D). */
const round3 = (x: number) => Math.round(x * 1000) / 1000;

/**
 * Cantilever (clamped–free) Euler–Bernoulli beam, a fork tine clamped at the stem:
 * f₂/f₁ = (β₂L/β₁L)² = (4.6941/1.8751)² ≈ 6.267 (R. D. Blevins, Formulas for Natural Frequency
 * and Mode Shape, Table 8-1; W. T. Thomson, Theory of Vibration with Applications, App. D).
 */
export const FORK_OVERTONE_RATIO_THEORY = round3(beamFrequencyRatios(CANTILEVER_BETA_L)[1]);

/**
 * Free–free Euler–Bernoulli beam, a bar or tube resting on its nodes: 1 : 2.757 : 5.404 : 8.933,
 * i.e. (4.7300/4.7300)², (7.8532/4.7300)², (10.9956/4.7300)², (14.1372/4.7300)² (same sources).
 */
export const FREE_FREE_OVERTONE_RATIOS = beamFrequencyRatios(FREE_FREE_BETA_L).map(round3);

/**
 * Reference temperature, °C: 20 °C is the standard reference temperature of ISO 1 (geometrical
 * product specification), the usual workshop reference. The user edits it.
 */
const REFERENCE_TEMPERATURE_C = 20;

/**
 * Strikes per unit: three show the spread between strikes and give the median a middle value.
 * Common practice, no published source.
 */
const STRIKES_PER_UNIT = 3;

const STARTING_POINT_NOTE =
  "Tolerances and the number of strikes are starting points (common practice, no published source): set them to your own design and customers' needs.";
const STEEL_COEFFICIENT_NOTE =
  "The temperature coefficient −1×10⁻⁴ per °C is a value for steel quoted from memory; confirm it for your alloy, or measure your own parts at two temperatures.";

function fundamental(toleranceCents: number): SpecPartialInput {
  // A4 = 440 Hz (ISO 16:1975) as a neutral start; the user sets the product's own pitch.
  return { label: "Fundamental", isFundamental: true, targetKind: "absolute", targetHz: A4_HZ, toleranceCents, required: true };
}

function ratioPartial(label: string, ratio: number, toleranceCents: number, required: boolean): SpecPartialInput {
  return { label, isFundamental: false, targetKind: "ratio", ratio, toleranceCents, required };
}

function base(family: Family, name: string, description: string, partials: SpecPartialInput[]): SpecFormValues {
  return {
    name,
    family,
    description,
    referenceTemperatureC: REFERENCE_TEMPERATURE_C,
    tempCoefficientPerC: STEEL_FREQUENCY_TEMPERATURE_COEFFICIENT_PER_C,
    decisionRule: "simple",
    strikesRequired: STRIKES_PER_UNIT,
    lengthMm: null,
    partials,
    changeNote: "",
  };
}

function build(family: Family): SpecFormValues {
  switch (family) {
    case "tuning_fork":
      return base(
        family,
        "Tuning fork A4 (440 Hz)",
        [
          "Fundamental A4 = 440 Hz (ISO 16:1975); change it to your fork's pitch.",
          `First overtone at ${FORK_OVERTONE_RATIO_THEORY}× the fundamental: cantilever beam theory, (4.6941/1.8751)² (Blevins, Formulas for Natural Frequency and Mode Shape, Table 8-1; Thomson, Theory of Vibration with Applications, App. D).`,
          "A real steel fork's first balanced overtone usually sits nearer 6× (about 3.3 kHz on a 550 Hz fork) and dies away much faster than the fundamental (common practice, no published source), so it is optional here with a wide ±100 cents that covers both; narrow it to what your own forks show.",
          "±5 cents on the fundamental is a common starting point for musical forks; clinical and laboratory forks may call for guarded acceptance.",
          STARTING_POINT_NOTE,
          STEEL_COEFFICIENT_NOTE,
        ].join(" "),
        [
          // ±5 cents: common practice for musical forks, no published source.
          fundamental(5),
          // 6.267 from cantilever theory (Blevins Table 8-1); ±100 cents also covers the ~6× of real forks
          // (1200·log2(6.267/6) ≈ 75 cents), common practice, no published source.
          ratioPartial("First overtone", FORK_OVERTONE_RATIO_THEORY, 100, false),
        ],
      );
    case "free_bar":
    case "tube": {
      const [, r2, r3, r4] = FREE_FREE_OVERTONE_RATIOS;
      const what = family === "free_bar" ? "bar" : "tube";
      const extra =
        family === "free_bar"
          ? "These ratios hold for a bar of uniform section; bars undercut at the middle (as for marimba and xylophone bars) are tuned to other ratios such as 4× and 10× — enter your own (from memory: T. D. Rossing, Science of Percussion Instruments). A bar struck at its middle barely sounds the 2nd mode, which has a node there."
          : "A chime tube's heard strike note usually comes from its higher partials rather than the lowest mode (from memory: T. D. Rossing, Science of Percussion Instruments); set the fundamental to the mode you tune.";
      return base(
        family,
        family === "free_bar" ? "Free bar" : "Chime tube",
        [
          `Partials of a free–free ${what}, 1 : ${r2} : ${r3} : ${r4}, from Euler–Bernoulli beam theory: (7.8532/4.7300)², (10.9956/4.7300)², (14.1372/4.7300)² (Blevins, Formulas for Natural Frequency and Mode Shape, Table 8-1; Thomson, Theory of Vibration with Applications, App. D).`,
          "Thick bars and short tubes sit somewhat below these ratios (shear and rotary inertia), so the overtones are optional with wider tolerances; make them required once your own parts show them reliably.",
          extra,
          "Fundamental A4 = 440 Hz (ISO 16:1975); change it to the part's pitch.",
          STARTING_POINT_NOTE,
          STEEL_COEFFICIENT_NOTE,
        ].join(" "),
        [
          // ±5 cents on the fundamental, wider on the overtones: common practice, no published source.
          fundamental(5),
          ratioPartial("2nd mode", r2, 50, false), // 2.757 = (7.8532/4.7300)², Blevins Table 8-1
          ratioPartial("3rd mode", r3, 75, false), // 5.404 = (10.9956/4.7300)², Blevins Table 8-1
          ratioPartial("4th mode", r4, 100, false), // 8.933 = (14.1372/4.7300)², Blevins Table 8-1
        ],
      );
    }
    case "handbell":
    case "bowl":
    case "other": {
      const why =
        family === "other"
          ? "Add the partials your design needs, as ratios to the fundamental or in Hz."
          : `A ${family === "handbell" ? "bell" : "bowl"} is a shell whose partials have no simple closed-form theory: their ratios depend on the profile and wall thickness, and each workshop tunes them to its own design. Add the partials you tune (as ratios to the fundamental), and a maximum beat where doublets matter.`;
      const tolerance = family === "handbell" ? 5 : 10;
      return base(
        family,
        family === "handbell" ? "Handbell" : family === "bowl" ? "Singing bowl" : "Tuned part",
        [
          why,
          "Fundamental A4 = 440 Hz (ISO 16:1975); change it to the part's pitch.",
          STARTING_POINT_NOTE,
          family === "other"
            ? STEEL_COEFFICIENT_NOTE
            : "The temperature coefficient −1×10⁻⁴ per °C is a value for steel quoted from memory; bronze and brass differ — measure your own parts at two temperatures and enter it.",
        ].join(" "),
        // ±5 cents for bells, ±10 cents for bowls and other parts: common practice, no published source.
        [fundamental(tolerance)],
      );
    }
  }
}

/** A fresh starting specification for `family` (a new object each call: the editor may change it). */
export function specTemplate(family: Family): SpecFormValues {
  return build(family);
}
