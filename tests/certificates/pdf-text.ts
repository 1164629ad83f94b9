/** Test helpers that read a rendered certificate back with outside tools (pdf-parse, poppler, jsQR). */
import { execFileSync } from "node:child_process";
import jsQR from "jsqr";
import { PDFParse } from "pdf-parse";

export interface ParsedPdf {
  /** Whole text with runs of whitespace collapsed to one space. */
  text: string;
  /** Per-page text, whitespace collapsed. */
  pages: string[];
  total: number;
  /** Embedded images per page (width × height in pixels). */
  images: { page: number; width: number; height: number }[];
}

const squash = (s: string) => s.replace(/\s+/g, " ").trim();

/** Parses a PDF with pdf-parse 2 (pdf.js underneath), an independent reader of what pdfkit wrote. */
export async function parsePdf(pdf: Buffer): Promise<ParsedPdf> {
  const parser = new PDFParse({ data: new Uint8Array(pdf) });
  try {
    const text = await parser.getText();
    const images = await parser.getImage({ imageThreshold: 0, imageDataUrl: false, imageBuffer: false });
    return {
      text: squash(text.pages.map((p) => p.text).join(" ")),
      pages: text.pages.map((p) => squash(p.text)),
      total: text.total,
      images: images.pages.flatMap((p) => p.images.map((im) => ({ page: p.pageNumber, width: im.width, height: im.height }))),
    };
  } finally {
    await parser.destroy();
  }
}

/** True when poppler's pdftoppm is on the PATH (Debian package poppler-utils). */
export function hasPdftoppm(): boolean {
  try {
    execFileSync("pdftoppm", ["-v"], { stdio: "ignore" });
    return true;
  } catch {
    return false;
  }
}

/**
 * Rasterises one page with poppler's pdftoppm (PPM on stdout) and scans it for a QR code with
 * jsQR, as a phone camera would read the printed page. Returns the decoded text or null.
 */
export function scanQrOnPage(pdf: Buffer, page: number, dpi = 150): string | null {
  const ppm = execFileSync("pdftoppm", ["-r", String(dpi), "-f", String(page), "-l", String(page)], { input: pdf, maxBuffer: 64 * 1024 * 1024 });
  // Binary PPM (P6): "P6\n<width> <height>\n<maxval>\n" then RGB bytes.
  const header = ppm.subarray(0, 64).toString("latin1");
  const m = /^P6\s+(\d+)\s+(\d+)\s+(\d+)\s/.exec(header);
  if (!m) throw new Error(`pdftoppm did not return a P6 image (header ${JSON.stringify(header.slice(0, 20))}).`);
  const [width, height] = [Number(m[1]), Number(m[2])];
  const rgb = ppm.subarray(m[0].length);
  const rgba = new Uint8ClampedArray(width * height * 4);
  for (let i = 0, j = 0; i < width * height; i++, j += 3) {
    rgba[i * 4] = rgb[j];
    rgba[i * 4 + 1] = rgb[j + 1];
    rgba[i * 4 + 2] = rgb[j + 2];
    rgba[i * 4 + 3] = 255;
  }
  return jsQR(rgba, width, height)?.data ?? null;
}
