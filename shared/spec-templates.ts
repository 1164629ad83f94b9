/**
 * Starting specifications per product family, for the spec editor. Overtone ratios come from
 * published beam theory where there is one (forks, bars); bell ratios and every tolerance, strike
 * count and limit are starting points of the trade (common practice, no published source — marked
 * beside each value here) that the workshop edits to its own design.
 */
import type { Family, SpecFormValues, SpecPartialInput } from "./schemas/spec.ts";
import { noteNameHz } from "./tuning.ts";
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

// Template texts are shown to the workshop as written: they speak as a colleague would and name a
// published source where there is one. Where a value is only a starting point of the trade (common
// practice, no published source — kept in these comments and in the tests, not on screen), the text
// says "typical starting value — confirm with your own parts".
const STARTING_POINT_NOTE = "Tolerances and the number of strikes are typical starting values — confirm with your own parts and your customers' needs.";
// −1×10⁻⁴ per °C for steel: from memory (E falls by about 2–2.5×10⁻⁴ per °C, f ∝ √E); see shared/physics.ts.
const STEEL_COEFFICIENT_NOTE = "Temperature coefficient −1×10⁻⁴ per °C: a typical starting value for steel — confirm with your own parts by measuring a few at two temperatures.";
const NON_STEEL_COEFFICIENT_NOTE =
  "Temperature coefficient −1×10⁻⁴ per °C is a typical starting value for steel; bronze and brass differ — measure a few of your own parts at two temperatures and enter yours.";
const PITCH_NOTE = "A4 = 440 Hz is the standard tuning frequency (ISO 16); set the note and the reference pitch the customer orders (442, 443, 432 Hz …).";
const MASTER_NOTE = "To take the targets from your own reference part instead, start from a master unit.";

function fundamental(toleranceCents: number, label = "Fundamental", note = "A4"): SpecPartialInput {
  // A4 = 440 Hz (ISO 16:1975) as a neutral start; the user sets the product's own pitch.
  return { label, isFundamental: true, targetKind: "absolute", targetNote: note, targetHz: noteNameHz(note, A4_HZ), toleranceCents, required: true };
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
    referencePitchHz: A4_HZ,
    decisionRule: "simple",
    strikesRequired: STRIKES_PER_UNIT,
    lengthMm: null,
    partials,
    changeNote: "",
  };
}

/**
 * Bell partials as the trade names them, with the usual starting ratios to the prime:
 * hum 0.5, prime 1, tierce 1.2 (a minor third), quint 1.5, nominal 2 — common practice for tuned
 * bells, no published source. Tolerances: common practice, no published source.
 */
export const BELL_PARTIAL_RATIOS = [
  { label: "Hum", ratio: 0.5, toleranceCents: 20, required: true },
  { label: "Prime", ratio: 1, toleranceCents: 5, required: true },
  { label: "Tierce", ratio: 1.2, toleranceCents: 15, required: true },
  { label: "Quint", ratio: 1.5, toleranceCents: 30, required: false },
  { label: "Nominal", ratio: 2, toleranceCents: 10, required: true },
] as const;

/** The series a tube's strike note is read from (shared/strike-note.ts), as ratios to the strike note. */
export const TUBE_SERIES = [
  { label: "Series partial 2", ratio: 2 },
  { label: "Series partial 3", ratio: 3 },
  { label: "Series partial 4", ratio: 4 },
] as const;

function build(family: Family): SpecFormValues {
  switch (family) {
    case "tuning_fork":
      return base(
        family,
        "Tuning fork A4 (440 Hz)",
        [
          PITCH_NOTE,
          `First overtone at ${FORK_OVERTONE_RATIO_THEORY}× the fundamental, from cantilever beam theory, (4.6941/1.8751)² (Blevins, Formulas for Natural Frequency and Mode Shape, Table 8-1).`,
          "On real steel forks the first overtone usually sits nearer 6× and dies away much faster than the fundamental, so it is optional here with a wide ±100 cents that covers both — typical starting value, confirm with your own parts.",
          "±5 cents on the fundamental is a typical starting value for musical forks; clinical and laboratory forks may call for guarded acceptance.",
          STARTING_POINT_NOTE,
          STEEL_COEFFICIENT_NOTE,
        ].join("\n"),
        [
          // ±5 cents: common practice for musical forks, no published source.
          fundamental(5),
          // 6.267 from cantilever theory (Blevins Table 8-1); ±100 cents also covers the ~6× of real forks
          // (1200·log2(6.267/6) ≈ 75 cents), common practice, no published source.
          ratioPartial("First overtone", FORK_OVERTONE_RATIO_THEORY, 100, false),
        ],
      );
    case "free_bar": {
      const [, r2, r3, r4] = FREE_FREE_OVERTONE_RATIOS;
      return base(
        family,
        "Free bar",
        [
          `Partials of a free–free bar, 1 : ${r2} : ${r3} : ${r4}, from Euler–Bernoulli beam theory: (7.8532/4.7300)², (10.9956/4.7300)², (14.1372/4.7300)² (Blevins, Formulas for Natural Frequency and Mode Shape, Table 8-1).`,
          "Thick bars sit somewhat below these ratios, so the overtones are optional with wider tolerances; make them required once your own bars show them reliably.",
          "They hold for a bar of uniform section; bars undercut at the middle are tuned to other ratios, such as 4× and 10× — enter your own. A bar struck at its middle barely sounds the 2nd mode, which has a node there.",
          PITCH_NOTE,
          STARTING_POINT_NOTE,
          STEEL_COEFFICIENT_NOTE,
        ].join("\n"),
        [
          // ±5 cents on the fundamental, wider on the overtones: common practice, no published source.
          fundamental(5),
          ratioPartial("2nd mode", r2, 50, false), // 2.757 = (7.8532/4.7300)², Blevins Table 8-1
          ratioPartial("3rd mode", r3, 75, false), // 5.404 = (10.9956/4.7300)², Blevins Table 8-1
          ratioPartial("4th mode", r4, 100, false), // 8.933 = (14.1372/4.7300)², Blevins Table 8-1
        ],
      );
    }
    case "tube":
      return base(
        family,
        "Chime tube C5 (strike note)",
        [
          "A chime tube is heard at its strike note, not at its lowest partial: the usual reading for tubular chimes takes the partials that stand near 2 : 3 : 4 and hears their common fundamental, about an octave below the lowest of them. Tinelog reads it from each strike and shows on the strike page which partials it used.",
          "Target C5 at A4 = 440 Hz (ISO 16); set your tube's note and the reference pitch the customer orders.",
          "The three partials of the series are optional, at 2, 3 and 4 × the strike note with ±75 cents: a uniform tube puts the highest of them a little sharp of 4× (Euler–Bernoulli beam theory gives about 4.17× half the lowest of them) — typical starting values, confirm with your own tubes.",
          STARTING_POINT_NOTE,
          STEEL_COEFFICIENT_NOTE,
        ].join("\n"),
        [
          // ±5 cents on the strike note: common practice for chimes, no published source.
          { label: "Strike note", isFundamental: true, targetKind: "strike_note", targetNote: "C5", targetHz: noteNameHz("C5", A4_HZ), toleranceCents: 5, required: true },
          // ±75 cents covers the Euler–Bernoulli 4.17 (+73 cents at the 4th partial); common practice, no published source.
          ...TUBE_SERIES.map((p) => ratioPartial(p.label, p.ratio, 75, false)),
        ],
      );
    case "handbell":
      return base(
        family,
        "Handbell A4 (prime 440 Hz)",
        [
          "Partials named as the bell trade names them, with the usual starting ratios to the prime: hum 0.5, prime 1, tierce 1.2 (a minor third above), quint 1.5, nominal 2 — typical starting values, confirm with your own bells.",
          "Many handbells are tuned to another profile (a twelfth, 3×, above the fundamental): edit the partials to your design. Add a maximum beat where a doublet matters.",
          "A bell is a shell, not a beam: no length estimate is offered; the tuning guidance says where metal is usually taken for each partial.",
          PITCH_NOTE,
          MASTER_NOTE,
          STARTING_POINT_NOTE,
          NON_STEEL_COEFFICIENT_NOTE,
        ].join("\n"),
        BELL_PARTIAL_RATIOS.map((b) => (b.label === "Prime" ? fundamental(b.toleranceCents, "Prime") : ratioPartial(b.label, b.ratio, b.toleranceCents, b.required))),
      );
    case "bowl":
      return base(
        family,
        "Singing bowl",
        [
          "A singing bowl's partials follow its profile and wall, and each workshop voices them its own way. The usual start is a master unit: strike your reference bowl and its measured partials become the targets, with tolerances around them.",
          "Or set the fundamental here and add the partials you tune, as ratios to it, with a maximum beat where doublets matter.",
          PITCH_NOTE,
          STARTING_POINT_NOTE,
          NON_STEEL_COEFFICIENT_NOTE,
        ].join("\n"),
        // ±10 cents for bowls: common practice, no published source.
        [fundamental(10)],
      );
    case "other":
      return base(
        family,
        "Tuned part",
        ["Add the partials your design needs, as ratios to the fundamental, in Hz or by note.", PITCH_NOTE, MASTER_NOTE, STARTING_POINT_NOTE, STEEL_COEFFICIENT_NOTE].join("\n"),
        // ±10 cents: common practice, no published source.
        [fundamental(10)],
      );
  }
}

/** A fresh starting specification for `family` (a new object each call: the editor may change it). */
export function specTemplate(family: Family): SpecFormValues {
  return build(family);
}
