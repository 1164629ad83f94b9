/** Reading what a chart drew on its canvases, for the browser tests. */
import type { Page } from "playwright-core";

/**
 * Counts pixels on the canvases under `selector` (searching open shadow roots too, where
 * wavesurfer draws) whose colour is within `tolerance` of one of `colours` (#rrggbb) and opaque
 * enough to be seen. Axis text and grid use other colours, so a chart with axes but no data scores 0.
 */
export async function colouredPixels(page: Page, selector: string, colours: string[], tolerance = 40): Promise<number> {
  return page.evaluate(
    ({ selector, colours, tolerance }) => {
      const targets = colours.map((c) => [parseInt(c.slice(1, 3), 16), parseInt(c.slice(3, 5), 16), parseInt(c.slice(5, 7), 16)]);
      const canvases: HTMLCanvasElement[] = [];
      const collect = (root: ParentNode) => {
        root.querySelectorAll("canvas").forEach((c) => canvases.push(c));
        root.querySelectorAll("*").forEach((el) => {
          if (el.shadowRoot) collect(el.shadowRoot);
        });
      };
      document.querySelectorAll(selector).forEach((el) => collect(el));
      let count = 0;
      for (const canvas of canvases) {
        if (!canvas.width || !canvas.height) continue;
        const ctx = canvas.getContext("2d");
        if (!ctx) continue;
        const { data } = ctx.getImageData(0, 0, canvas.width, canvas.height);
        for (let i = 0; i < data.length; i += 4) {
          if (data[i + 3] < 128) continue;
          for (const [r, g, b] of targets) {
            if (Math.abs(data[i] - r) + Math.abs(data[i + 1] - g) + Math.abs(data[i + 2] - b) <= tolerance) {
              count++;
              break;
            }
          }
        }
      }
      return count;
    },
    { selector, colours, tolerance },
  );
}

/** Waits until `check` gives a number above zero (charts draw after the audio is decoded). */
export async function eventuallyPositive(check: () => Promise<number>, what: string, timeoutMs = 30_000): Promise<number> {
  const deadline = Date.now() + timeoutMs;
  let last = 0;
  while (Date.now() < deadline) {
    last = await check();
    if (last > 0) return last;
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`${what}: no pixels of the expected colour after ${timeoutMs / 1000} s`);
}
