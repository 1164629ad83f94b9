/**
 * Text the certificate's Inter font cannot show: names and addresses in Chinese or Japanese script,
 * Arabic or Hebrew. pdfkit has no font fallback and no bidirectional layout, so this adds both at
 * its two text primitives, after its own line breaking (the Unicode Bidirectional Algorithm, UAX #9,
 * reorders per line, and pdfkit's wrapper hands over one line at a time):
 *
 * - `widthOfString` measures each run in the font that will draw it, so wrapping and alignment hold;
 * - `_fragment` (pdfkit's line renderer) draws a line as runs in visual order (bidi-js computes the
 *   levels), each in the first font that has its characters: Inter, then Noto Sans Hebrew, Noto Sans
 *   Arabic, Noto Sans SC (TTF files from @expo-google-fonts, embedded as subsets like Inter).
 *   A right-to-left run is passed in logical order: fontkit shapes it (Arabic joining forms) and lays
 *   its glyphs out right to left itself.
 *
 * Lines that Inter covers entirely and that hold no right-to-left character take pdfkit's own path,
 * byte for byte as before.
 */
import { createRequire } from "node:module";
import { readFileSync } from "node:fs";
import bidiFactory from "bidi-js";

const require = createRequire(import.meta.url);
const bidi = bidiFactory();

type Weight = "regular" | "semibold";
const FALLBACKS = [
  { key: "hebrew", covers: (cp: number) => (cp >= 0x0590 && cp <= 0x05ff) || (cp >= 0xfb1d && cp <= 0xfb4f), files: { regular: "@expo-google-fonts/noto-sans-hebrew/400Regular/NotoSansHebrew_400Regular.ttf", semibold: "@expo-google-fonts/noto-sans-hebrew/600SemiBold/NotoSansHebrew_600SemiBold.ttf" } },
  { key: "arabic", covers: (cp: number) => (cp >= 0x0600 && cp <= 0x06ff) || (cp >= 0x0750 && cp <= 0x077f) || (cp >= 0x08a0 && cp <= 0x08ff) || (cp >= 0xfb50 && cp <= 0xfdff) || (cp >= 0xfe70 && cp <= 0xfeff), files: { regular: "@expo-google-fonts/noto-sans-arabic/400Regular/NotoSansArabic_400Regular.ttf", semibold: "@expo-google-fonts/noto-sans-arabic/600SemiBold/NotoSansArabic_600SemiBold.ttf" } },
  // Han, kana, CJK punctuation and full-width forms; also the last resort for anything else Inter lacks.
  { key: "cjk", covers: () => true, files: { regular: "@expo-google-fonts/noto-sans-sc/400Regular/NotoSansSC_400Regular.ttf", semibold: "@expo-google-fonts/noto-sans-sc/600SemiBold/NotoSansSC_600SemiBold.ttf" } },
] as const;

const RTL = /[\u0590-\u08FF\uFB1D-\uFDFF\uFE70-\uFEFF]/;

/** Font files are read once per process, and only when a certificate needs them (Noto Sans SC is 10 MB). */
const buffers = new Map<string, Buffer>();
function fontBuffer(file: string): Buffer {
  let b = buffers.get(file);
  if (!b) buffers.set(file, (b = readFileSync(require.resolve(file))));
  return b;
}

type FontkitFont = { hasGlyphForCodePoint(cp: number): boolean };
type PdfFont = { name: string; font: FontkitFont; ascender: number };
type Doc = PDFKit.PDFDocument & {
  _font: PdfFont;
  _fontSize: number;
  _fragment(text: string, x: number, y: number, options: Record<string, unknown>): void;
  widthOfString(text: string, options?: Record<string, unknown>): number;
};

type Run = { text: string; font: PdfFont };

/** A run's text → the pdfkit font that draws it (the current font, or a fallback registered on first use). */
function fallbackFont(doc: Doc, base: PdfFont, key: (typeof FALLBACKS)[number]["key"]): PdfFont {
  const weight: Weight = /semibold|bold/i.test(base.name) ? "semibold" : "regular";
  const entry = FALLBACKS.find((f) => f.key === key)!;
  const name = `fallback-${key}-${weight}`;
  if (!(doc as unknown as { _registeredFonts: Record<string, unknown> })._registeredFonts[name]) doc.registerFont(name, fontBuffer(entry.files[weight]));
  doc.font(name);
  const font = doc._font;
  doc._font = base; // font() switched; switch back, the caller draws with each run's font itself
  return font;
}

function fontFor(doc: Doc, base: PdfFont, cp: number): PdfFont {
  if (base.font.hasGlyphForCodePoint(cp)) return base;
  for (const f of FALLBACKS) {
    if (!f.covers(cp)) continue;
    const font = fallbackFont(doc, base, f.key);
    if (font.font.hasGlyphForCodePoint(cp) || f.key === "cjk") return font;
  }
  return base;
}

function needsHelp(base: PdfFont, text: string): boolean {
  if (RTL.test(text)) return true;
  for (const ch of text) if (!base.font.hasGlyphForCodePoint(ch.codePointAt(0)!)) return true;
  return false;
}

/**
 * The line as runs in visual (left-to-right drawing) order, each in one font and one direction.
 * A right-to-left run keeps logical order (fontkit lays it out right to left).
 */
export function visualRuns(doc: Doc, base: PdfFont, line: string): Run[] {
  const chars = Array.from(line);
  // Per character (code point): its font; white space takes its neighbour's, so a word gap does not split a run.
  const fonts = chars.map((ch) => (/\s/.test(ch) ? null : fontFor(doc, base, ch.codePointAt(0)!)));
  for (let i = 0; i < fonts.length; i++) fonts[i] ??= fonts[i - 1] ?? fonts.slice(i).find((f) => f) ?? base;
  // bidi-js works on UTF-16 indices; map them to code point indices.
  // The certificate is a left-to-right document: every line is a left-to-right paragraph (UAX #9 P3 overridden, as HTML dir="ltr").
  const levelsU16 = bidi.getEmbeddingLevels(line, "ltr").levels;
  const levels: number[] = [];
  let u = 0;
  for (const ch of chars) {
    levels.push(levelsU16[u]);
    u += ch.length;
  }
  const order = chars.map((_, i) => i);
  // UAX #9 L2: from the highest level down to the lowest odd one, reverse every run at that level or higher.
  const max = Math.max(...levels);
  const minOdd = Math.min(...levels.filter((l) => l % 2 === 1), max + 1);
  for (let level = max; level >= minOdd; level--) {
    for (let i = 0; i < order.length; ) {
      if (levels[order[i]] < level) {
        i++;
        continue;
      }
      let j = i;
      while (j < order.length && levels[order[j]] >= level) j++;
      order.splice(i, j - i, ...order.slice(i, j).reverse());
      i = j;
    }
  }
  const runs: { from: number; to: number; rtl: boolean; font: PdfFont }[] = [];
  for (const idx of order) {
    const rtl = levels[idx] % 2 === 1;
    const last = runs.at(-1);
    if (last && last.font === fonts[idx] && last.rtl === rtl && (rtl ? idx === last.from - 1 : idx === last.to + 1)) {
      if (rtl) last.from = idx;
      else last.to = idx;
    } else runs.push({ from: idx, to: idx, rtl, font: fonts[idx]! });
  }
  return runs.flatMap((r): Run[] => {
    const text = chars.slice(r.from, r.to + 1).join("");
    if (!r.rtl) return [{ text, font: r.font }];
    // A right-to-left run with no right-to-left letter (brackets, digits at an odd level) is not
    // reversed by fontkit: reverse it here, mirroring brackets (UAX #9 L4).
    if (!RTL.test(text)) return [{ text: Array.from(text).reverse().map((c) => bidi.getMirroredCharacter(c) ?? c).join(""), font: r.font }];
    // Words of a right-to-left run are drawn one by one, right to left, with the gaps in the base font
    // (the fallback fonts' shaping drops a space inside a run).
    return text
      .split(/(\s+)/)
      .filter(Boolean)
      .reverse()
      .map((part) => ({ text: part, font: /^\s+$/.test(part) ? base : r.font }));
  });
}

/** Installs the fallback fonts and bidirectional layout on `doc` (call once, after creating it). */
export function useFallbackText(pdf: PDFKit.PDFDocument): void {
  const doc = pdf as Doc;
  const width = doc.widthOfString.bind(doc);
  const fragment = doc._fragment.bind(doc);

  const measure = (runs: Run[], options?: Record<string, unknown>) => {
    const base = doc._font;
    let total = 0;
    for (const run of runs) {
      doc._font = run.font;
      total += width(run.text, options);
    }
    doc._font = base;
    return total;
  };

  doc.widthOfString = (text: string, options?: Record<string, unknown>) => {
    const s = `${text}`;
    return needsHelp(doc._font, s) ? measure(visualRuns(doc, doc._font, s), options) : width(s, options);
  };

  doc._fragment = (text: string, x: number, y: number, options: Record<string, unknown>) => {
    const line = `${text}`.replace(/\n/g, "");
    const base = doc._font;
    if (!needsHelp(base, line)) return fragment(text, x, y, options);
    const runs = visualRuns(doc, base, line);
    const total = measure(runs, options);
    const align = (options.align as string | undefined) ?? "left";
    if (options.width && align === "right") x += (options.lineWidth as number) - measure(visualRuns(doc, base, line.replace(/\s+$/, "")), options);
    else if (options.width && align === "center") x += (options.lineWidth as number) / 2 - total / 2;
    // One baseline for the whole line: the current font's, whatever each run's font puts its ascender at.
    const baseline = typeof options.baseline === "number" ? options.baseline : options.baseline === undefined ? -(base.ascender / 1000) * doc._fontSize : undefined;
    for (const run of runs) {
      doc._font = run.font;
      const w = width(run.text, options);
      fragment(run.text, x, y, { ...options, align: "left", baseline: baseline ?? options.baseline, textWidth: undefined, wordCount: undefined, wordSpacing: 0 });
      x += w;
    }
    doc._font = base;
  };
}
