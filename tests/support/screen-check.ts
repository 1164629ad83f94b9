/**
 * One check for every screen, at any width: the page does not scroll sideways, no box with hidden
 * overflow cuts its content off, no select shows its choice cut short, the spectrum's labels do
 * not overlap, and the browser logged no error. Runs in the page; searches open shadow roots too
 * (wavesurfer draws in one).
 */
import type { Page } from "playwright-core";

export type ScreenProblem = { kind: "page scrolls sideways" | "content cut off" | "choice cut off" | "labels overlap" | "console error"; detail: string };

/**
 * Boxes that clip on purpose, each with its reason. Keep this list short: a box that cuts text
 * off is what the check is for.
 */
const DELIBERATE_CLIPS: { selector: string; why: string }[] = [
  // wavesurfer's "played so far" overlay is the waveform clipped at the play position.
  { selector: '[part~="progress"]', why: "the played part of the waveform is the waveform clipped at the cursor" },
  // uPlot keeps its drag-to-zoom box and under-layer inside the plot area.
  { selector: ".u-under, .u-select", why: "uPlot's plot-area layers" },
];

/** Waits until the page has loaded, stopped fetching and shows no spinner; charts get a moment to draw. */
export async function settle(page: Page): Promise<void> {
  await page.waitForLoadState("load");
  await page.waitForLoadState("networkidle", { timeout: 15_000 }).catch(() => undefined);
  await page.waitForFunction(() => !document.querySelector('[aria-busy="true"], .animate-spin'), undefined, { timeout: 30_000 }).catch(() => undefined);
  await page.waitForTimeout(400);
}

/** The layout problems on the page as it is now (console errors are collected by {@link watchConsole}). */
export async function layoutProblems(page: Page): Promise<ScreenProblem[]> {
  return page.evaluate((deliberate) => {
    const problems: { kind: string; detail: string }[] = [];
    const describe = (el: Element) => {
      const id = el.id ? `#${el.id}` : "";
      const cls = typeof el.className === "string" && el.className ? `.${el.className.trim().split(/\s+/).slice(0, 3).join(".")}` : "";
      const text = (el.textContent ?? "").trim().replace(/\s+/g, " ").slice(0, 60);
      return `<${el.tagName.toLowerCase()}${id}${cls}> "${text}"`;
    };
    const all: Element[] = [];
    const collect = (root: Document | ShadowRoot) => {
      root.querySelectorAll("*").forEach((el) => {
        all.push(el);
        if (el.shadowRoot) collect(el.shadowRoot);
      });
    };
    collect(document);
    const visible = (el: Element) => {
      const r = el.getBoundingClientRect();
      const cs = getComputedStyle(el);
      return r.width > 1 && r.height > 1 && cs.visibility !== "hidden" && cs.display !== "none";
    };

    // 1. The page itself never scrolls sideways.
    const doc = document.documentElement;
    if (doc.scrollWidth > doc.clientWidth + 1) {
      const wide = all.filter((el) => visible(el) && el.getBoundingClientRect().right > doc.clientWidth + 1).slice(-3);
      problems.push({ kind: "page scrolls sideways", detail: `scrollWidth ${doc.scrollWidth} > clientWidth ${doc.clientWidth}; widest: ${wide.map(describe).join(" | ")}` });
    }

    // 2. No box with hidden (or clipped) overflow holds more than it shows.
    for (const el of all) {
      if (!(el instanceof HTMLElement) || !visible(el)) continue;
      if (deliberate.some((d) => el.matches(d.selector))) continue;
      const cs = getComputedStyle(el);
      // Screen-reader-only text is clipped to a 1 px box by design.
      if (cs.position === "absolute" && (cs.clip === "rect(0px, 0px, 0px, 0px)" || cs.clipPath === "inset(50%)")) continue;
      const hiddenX = cs.overflowX === "hidden" || cs.overflowX === "clip";
      const hiddenY = cs.overflowY === "hidden" || cs.overflowY === "clip";
      if (hiddenX && el.scrollWidth > el.clientWidth + 1) problems.push({ kind: "content cut off", detail: `${describe(el)} is ${el.clientWidth} px wide and holds ${el.scrollWidth} px` });
      else if (hiddenY && el.scrollHeight > el.clientHeight + 1) problems.push({ kind: "content cut off", detail: `${describe(el)} is ${el.clientHeight} px high and holds ${el.scrollHeight} px` });
    }

    // 3. A select shows its whole choice (the closed box cuts a long option short).
    const canvas = document.createElement("canvas");
    const ctx = canvas.getContext("2d")!;
    for (const el of all) {
      if (!(el instanceof HTMLSelectElement) || !visible(el) || el.multiple) continue;
      const option = el.options[el.selectedIndex];
      if (!option) continue;
      const cs = getComputedStyle(el);
      ctx.font = `${cs.fontWeight} ${cs.fontSize} ${cs.fontFamily}`;
      const text = ctx.measureText(option.text).width;
      // Room inside the box: its width less both paddings and, for a native select, its drop-down arrow (about 20 px beside the padding).
      const arrow = cs.appearance === "none" ? 0 : 20;
      const room = el.clientWidth - parseFloat(cs.paddingLeft) - parseFloat(cs.paddingRight) - arrow;
      if (text > room + 1) problems.push({ kind: "choice cut off", detail: `select "${el.getAttribute("aria-label") ?? el.labels?.[0]?.textContent ?? el.name}" shows "${option.text}" (${Math.round(text)} px) in ${Math.round(room)} px` });
    }

    // 4. Spectrum labels do not overlap, and stay inside their chart.
    document.querySelectorAll(".tl-spectrum").forEach((chart) => {
      const box = chart.getBoundingClientRect();
      const labels = [...chart.querySelectorAll(".tl-marker")].map((el) => ({ el, r: el.getBoundingClientRect() }));
      labels.forEach((a, i) => {
        if (a.r.left < box.left - 1 || a.r.right > box.right + 1) problems.push({ kind: "labels overlap", detail: `label "${a.el.textContent}" runs outside its chart` });
        for (const b of labels.slice(i + 1)) {
          const overlap = a.r.left < b.r.right && b.r.left < a.r.right && a.r.top < b.r.bottom && b.r.top < a.r.bottom;
          if (overlap) problems.push({ kind: "labels overlap", detail: `"${a.el.textContent}" and "${b.el.textContent}"` });
        }
      });
    });
    return problems as { kind: ScreenProblem["kind"]; detail: string }[];
  }, DELIBERATE_CLIPS);
}

/** Collects console errors and uncaught page errors from now on; returns the list it fills. */
export function watchConsole(page: Page): string[] {
  const errors: string[] = [];
  page.on("console", (message) => {
    if (message.type() === "error") errors.push(`${message.text()}${message.location().url ? ` (${message.location().url})` : ""}`);
  });
  page.on("pageerror", (error) => errors.push(`uncaught: ${error.message}`));
  return errors;
}
