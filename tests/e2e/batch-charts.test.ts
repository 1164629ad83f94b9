/**
 * The batch charts on the ledger page in a real browser: BTW-2611's
 * individuals chart carries its centre line and control limits, the moving-range chart its
 * limit, the histogram the spec limits (and the control chart none), and Cp/Cpk/Cpl are marked
 * low confidence for ten units. A batch with no measured unit says why the charts wait.
 *
 * The expected limits are computed here from the ledger's own deviations with the formulas of the
 * NIST/SEMATECH e-Handbook of Statistical Methods §6.3.2 (x̄ ± 2.66·MR̄, 3.267·MR̄, σ̂ = MR̄/1.128),
 * written out independently of shared/spc.ts; Cp = (USL − LSL)/6σ̂ and Cpk = min(USL − x̄, x̄ − LSL)/3σ̂
 * as in Montgomery, Introduction to Statistical Quality Control.
 */
import { beforeAll, describe, expect, it } from "vitest";
import type { BatchDetail } from "../../shared/schemas/batch.ts";
import { demo, screenshot, signIn } from "../support/browser";
import { apiGet, batchByCode, batchIdByCode, withServerAndBrowser } from "../support/e2e";

/** The page's cents format: sign always, a true minus (U+2212), one decimal, then " ¢". */
const cents = (v: number) => {
  const r = Number(v.toFixed(1));
  return `${r > 0 ? "+" : r < 0 ? "\u2212" : "±"}${Math.abs(r).toFixed(1)} ¢`;
};

describe("the batch charts on the ledger", () => {
  const e2e = withServerAndBrowser();
  let batch: BatchDetail;

  beforeAll(async () => {
    const { page } = e2e.browser;
    await signIn(page, e2e.server.baseUrl, demo.maker);
    const id = await batchIdByCode(page, "BTW-2611");
    // The seed's strikes are analysed at start, a unit's later strikes after its first: wait until
    // no strike is pending, or the chart and these sums would see different ledgers.
    for (let i = 0; i < 240; i++) {
      batch = await apiGet<BatchDetail>(page, `/api/batches/${id}`);
      if (batch.rows.every((r) => r.deviationCents !== null && r.pendingStrikes === 0)) break;
      await new Promise((r) => setTimeout(r, 500));
    }
  });

  it("draws the individuals chart with the centre line and control limits of the ledger's deviations", async () => {
    const { page } = e2e.browser;
    await page.goto(`${e2e.server.baseUrl}/app/batches/${batch.id}`);
    await page.getByRole("heading", { name: `Batch ${batch.code}`, level: 1 }).waitFor();
    const chart = page.locator('[data-testid="individuals-chart"]');
    await chart.waitFor();

    const x = batch.rows.map((r) => r.deviationCents as number);
    expect(x.length).toBe(10);
    const mean = x.reduce((a, b) => a + b, 0) / x.length;
    const mr = x.slice(1).map((v, i) => Math.abs(v - x[i]));
    const mrBar = mr.reduce((a, b) => a + b, 0) / mr.length;
    const label = async (limit: string) => (await chart.locator(`[data-limit="${limit}"] text`).textContent())?.trim();
    expect(await label("ucl")).toBe(`UCL ${cents(mean + 2.66 * mrBar)}`);
    expect(await label("centre")).toBe(`x̄ ${cents(mean)}`);
    expect(await label("lcl")).toBe(`LCL ${cents(mean - 2.66 * mrBar)}`);
    // One point per measured unit, in ledger order, each with accessible text naming the unit.
    const serials = await chart.locator("[data-serial]").evaluateAll((els) => els.map((e) => e.getAttribute("data-serial")));
    expect(serials).toEqual(batch.rows.map((r) => r.serial));
    // Spec limits belong on the histogram, not on the control chart.
    expect(await chart.locator('[data-limit="lsl"], [data-limit="usl"]').count()).toBe(0);
    expect(await chart.getByText(/LSL|USL/).count()).toBe(0);

    const mrChart = page.locator('[data-testid="moving-range-chart"]');
    // Read as a number: the label rounds to 0.1 ¢, and a value on a rounding tie may go either way.
    const mrUcl = /^UCL (-?[\d.]+) ¢$/.exec((await mrChart.locator('[data-limit="mr-ucl"] text').textContent())?.trim() ?? "");
    expect(mrUcl).not.toBeNull();
    expect(Math.abs(Number(mrUcl![1]) - 3.267 * mrBar)).toBeLessThanOrEqual(0.05 + 1e-9);
  });

  it("names the rule a point breaks, on hover and in text", async () => {
    const { page } = e2e.browser;
    const chart = page.locator('[data-testid="individuals-chart"]');
    // Independent check of rule 1 with σ = MR̄/1.128: a point beyond x̄ ± 3σ is flagged, others are not.
    const x = batch.rows.map((r) => r.deviationCents as number);
    const mean = x.reduce((a, b) => a + b, 0) / x.length;
    const mrBar = x.slice(1).reduce((a, v, i) => a + Math.abs(v - x[i]), 0) / (x.length - 1);
    const beyond = batch.rows.filter((r) => Math.abs((r.deviationCents as number) - mean) > (3 * mrBar) / 1.128).map((r) => r.serial);
    const flaggedRule1 = await chart.locator("[data-rules]").evaluateAll((els) => els.filter((e) => (e.getAttribute("data-rules") ?? "").split(",").includes("1")).map((e) => e.getAttribute("data-serial")));
    expect(flaggedRule1).toEqual(beyond);

    // Hovering a point shows its unit and deviation, and whether a rule is broken.
    const first = chart.locator(`[data-serial="${batch.rows[0].serial}"]`);
    await first.hover();
    const tip = page.locator(".tl-spc-tip");
    await tip.waitFor();
    expect(await tip.textContent()).toContain(`${batch.rows[0].serial}: ${cents(x[0])}`);
    // Keyboard: points are focusable and carry their text for screen readers.
    expect(await first.getAttribute("tabindex")).toBe("0");
    expect(await first.getAttribute("aria-label")).toContain(batch.rows[0].serial);
    await page.getByText(/No point breaks Nelson rules 1–4|Signs of a special cause/).waitFor();
  });

  it("shows the histogram with the spec limits and capability marked low confidence", async () => {
    const { page } = e2e.browser;
    const tol = batch.fundamentalToleranceCents!;
    expect(tol).toBeGreaterThan(0);
    const histogram = page.locator('[data-testid="deviation-histogram"]');
    expect((await histogram.locator('[data-limit="lsl"] text').textContent())?.trim()).toBe(`LSL ${cents(-tol)}`);
    expect((await histogram.locator('[data-limit="usl"] text').textContent())?.trim()).toBe(`USL ${cents(tol)}`);
    // Every measured unit is in one bar.
    const counts = await histogram.locator("rect title").allTextContents();
    expect(counts.reduce((n, t) => n + Number(/^(\d+) unit/.exec(t)?.[1] ?? 0), 0)).toBe(batch.rows.length);

    const x = batch.rows.map((r) => r.deviationCents as number);
    const mean = x.reduce((a, b) => a + b, 0) / x.length;
    const sigma = x.slice(1).reduce((a, v, i) => a + Math.abs(v - x[i]), 0) / (x.length - 1) / 1.128;
    const cp = (2 * tol) / (6 * sigma);
    const cpk = Math.min(tol - mean, mean + tol) / (3 * sigma);
    const capability = page.locator('[data-testid="capability"]');
    expect(await capability.locator('[data-index="Cp"]').textContent()).toBe(cp.toFixed(2));
    expect(await capability.locator('[data-index="Cpk"]').textContent()).toBe(cpk.toFixed(2));
    // Cpl of ln T60 against the minimum T60, σ̂ from moving ranges of ln T60.
    // T60s marked unreliable (a decay that is not exponential) are left out of the capability.
    const lt = batch.rows.filter((r) => !r.t60Unreliable).map((r) => Math.log(r.t60S as number));
    const lMean = lt.reduce((a, b) => a + b, 0) / lt.length;
    const lSigma = lt.slice(1).reduce((a, v, i) => a + Math.abs(v - lt[i]), 0) / (lt.length - 1) / 1.128;
    const cpl = (lMean - Math.log(batch.minT60S!)) / (3 * lSigma);
    // Read as a number: the test's sums and the chart's differ in the last floating-point bits, so a
    // value near a rounding tie (2.235) may print either way in the second decimal the chart shows.
    expect(Number(await capability.locator('[data-index="Cpl"]').textContent())).toBeCloseTo(cpl, 1);
    expect(await capability.getByText(/low confidence/).count()).toBe(3);
    await screenshot(page, "e2e-batch-charts");
    await page.emulateMedia({ media: "print" });
    await screenshot(page, "e2e-batch-charts-print");
    await page.emulateMedia({ media: "screen" });
  });

  it("says why the charts wait on a batch with no measured unit", async () => {
    const { page } = e2e.browser;
    const empty = await batchByCode(page, "BTW-2612");
    await page.goto(`${e2e.server.baseUrl}/app/batches/${empty.id}`);
    await page.getByRole("heading", { name: `Batch ${empty.code}`, level: 1 }).waitFor();
    await page.getByText("The charts wait for at least two measured units").waitFor();
    expect(await page.locator('[data-testid="individuals-chart"]').count()).toBe(0);
  });
});
