/**
 * Every screen at a phone's width (390 px) and a desktop's (1280 px), signed out and signed in:
 * the page does not scroll sideways, no box with hidden overflow cuts its content off, no select
 * cuts its choice short, the spectrum's labels do not overlap, and the console stays free of
 * errors (tests/support/screen-check.ts). To cover a new screen, add a line to SCREENS.
 *
 * The data is the demo seed (seeds/demo.ts): Brightwater's forks, and Fernhollow's chime tubes and
 * handbells, where dense spectra (a bell) and a strike note (a tube) are drawn. One batch is
 * released and one certificate issued first, so the certificate screens have something to show.
 */
import { mkdirSync } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import type { BatchDetail, BatchSummary } from "../../shared/schemas/batch.ts";
import type { SpecSummary } from "../../shared/schemas/spec.ts";
import type { UnitDetail } from "../../shared/schemas/strike.ts";
import { demo, screenshotDir, signIn } from "../support/browser";
import { apiGet, withServerAndBrowser } from "../support/e2e";
import { layoutProblems, settle, watchConsole, type ScreenProblem } from "../support/screen-check";

type Ids = Record<string, string>;
type Who = "signed out" | "owner" | "other";
/** One screen: who looks, where, and (optionally) what to do before checking it. */
type Screen = { name: string; who: Who; path: (ids: Ids) => string; prepare?: (page: Page) => Promise<void> };

const SCREENS: Screen[] = [
  // Signed out
  { name: "sign-in", who: "signed out", path: () => "/sign-in" },
  { name: "sign-up", who: "signed out", path: () => "/sign-up" },
  { name: "verify", who: "signed out", path: (i) => `/verify/${i.verifyCode}` },
  { name: "verify-not-found", who: "signed out", path: () => "/verify/not-a-real-code-0000000000" },
  { name: "invitation-not-found", who: "signed out", path: () => "/invite/no-such-invitation" },
  { name: "no-such-page", who: "signed out", path: () => "/nowhere" },
  // Signed in, Brightwater (forks), as the owner, who sees every screen
  { name: "dashboard", who: "owner", path: () => "/app" },
  { name: "batches", who: "owner", path: () => "/app/batches" },
  { name: "new-batch", who: "owner", path: () => "/app/batches/new" },
  { name: "ledger-released", who: "owner", path: (i) => `/app/batches/${i.forkBatch}` },
  { name: "ledger-open", who: "owner", path: (i) => `/app/batches/${i.openBatch}` },
  { name: "unit-out-of-tolerance", who: "owner", path: (i) => `/app/units/${i.forkUnitOut}` },
  { name: "unit-certified", who: "owner", path: (i) => `/app/units/${i.forkUnitCertified}` },
  {
    name: "certificate-preview",
    who: "owner",
    path: (i) => `/app/units/${i.forkUnitToCertify}`,
    prepare: async (page) => {
      const form = page.getByRole("form", { name: "Issue a certificate" });
      await form.getByLabel("Recipient e-mail").fill("customer@example.com");
      await form.getByRole("button", { name: "Preview" }).click();
      await page.locator('iframe[title="Certificate preview"]').waitFor();
    },
  },
  { name: "strike-fork", who: "owner", path: (i) => `/strikes/${i.forkStrike}` },
  { name: "specifications", who: "owner", path: () => "/app/specifications" },
  { name: "specification", who: "owner", path: (i) => `/app/specifications/${i.forkSpec}` },
  { name: "specification-edit", who: "owner", path: (i) => `/app/specifications/${i.forkSpec}/edit` },
  { name: "new-specification-fork", who: "owner", path: () => "/app/specifications/new" },
  { name: "new-specification-tube", who: "owner", path: () => "/app/specifications/new?family=tube" },
  { name: "new-specification-bell", who: "owner", path: () => "/app/specifications/new?family=handbell" },
  { name: "new-specification-master", who: "owner", path: () => "/app/specifications/new?family=bowl&from=master" },
  { name: "members", who: "owner", path: () => "/app/members" },
  { name: "outbox", who: "owner", path: () => "/app/outbox" },
  { name: "outbox-message", who: "owner", path: (i) => `/app/outbox/${i.certificateMail}` },
  { name: "settings", who: "owner", path: () => "/app/settings" },
  { name: "create-workshop", who: "owner", path: () => "/create-workshop" },
  { name: "app-not-found", who: "owner", path: () => "/app/nowhere" },
  // Signed in, Fernhollow (chime tubes and handbells)
  { name: "ledger-bells", who: "other", path: (i) => `/app/batches/${i.bellBatch}` },
  { name: "unit-bell", who: "other", path: (i) => `/app/units/${i.bellUnitOut}` },
  { name: "strike-bell", who: "other", path: (i) => `/strikes/${i.bellStrike}` },
  { name: "strike-tube", who: "other", path: (i) => `/strikes/${i.tubeStrike}` },
  { name: "specification-tube", who: "other", path: (i) => `/app/specifications/${i.tubeSpec}` },
];

const WIDTHS = [390, 1280] as const;

async function post(page: Page, url: string, body: unknown): Promise<{ status: number; body: Record<string, unknown> }> {
  return page.evaluate(
    async ({ url, body }) => {
      const r = await fetch(url, { method: "POST", credentials: "same-origin", headers: { "Content-Type": "application/json" }, body: JSON.stringify(body) });
      return { status: r.status, body: await r.json() };
    },
    { url, body },
  );
}

/** Units of a demo batch, with their strikes, once every strike is analysed. */
async function analysedUnits(page: Page, code: string): Promise<UnitDetail[]> {
  const { batches } = await apiGet<{ batches: BatchSummary[] }>(page, "/api/batches");
  const id = batches.find((b) => b.code === code)!.id;
  for (let i = 0; i < 240; i++) {
    const b = await apiGet<BatchDetail>(page, `/api/batches/${id}`);
    if (b.rows.every((r) => r.verdict !== null && r.pendingStrikes === 0)) return Promise.all(b.rows.map((r) => apiGet<UnitDetail>(page, `/api/units/${r.id}`)));
    await page.waitForTimeout(500);
  }
  throw new Error(`The demo batch ${code} was not analysed in 2 minutes.`);
}

describe("every screen reads at 390 px and 1280 px, signed in and out", () => {
  const e2e = withServerAndBrowser({ viewport: { width: 1280, height: 900 } });
  const ids: Ids = {};
  const shots = path.join(screenshotDir, "screens");

  beforeAll(async () => {
    mkdirSync(shots, { recursive: true });
    const { page, context } = e2e.browser;
    const base = e2e.server.baseUrl;
    // Fernhollow: the chime tubes and handbells.
    await signIn(page, base, demo.other);
    const tubes = await analysedUnits(page, "FHC-T-07");
    const bells = await analysedUnits(page, "FHC-B-02");
    ids.tubeStrike = tubes.find((u) => u.evaluation?.verdict === "out_of_tolerance")!.strikes[0].id;
    ids.tubeSpec = tubes[0].spec.id;
    const bellOut = bells.find((u) => u.evaluation?.verdict === "out_of_tolerance")!;
    ids.bellUnitOut = bellOut.id;
    ids.bellStrike = bellOut.strikes[0].id;
    ids.bellBatch = bellOut.batch.id;
    await context.clearCookies();

    // Brightwater: release BTW-2611 after disposing of its two forks out of tolerance, and certify one.
    await signIn(page, base, demo.owner);
    const forks = await analysedUnits(page, "BTW-2611");
    for (const u of forks.filter((f) => f.evaluation?.verdict !== "within_tolerance")) {
      expect((await post(page, `/api/units/${u.id}/dispositions`, { decision: "scrap", reason: "Out of tolerance (screen test)." })).status).toBe(201);
    }
    expect((await post(page, `/api/batches/${forks[0].batch.id}/release`, {})).status).toBe(200);
    const [certified, toCertify] = forks.filter((f) => f.evaluation?.verdict === "within_tolerance");
    ids.forkUnitToCertify = toCertify.id;
    const cert = await post(page, `/api/units/${certified.id}/certificates`, { recipientEmail: "customer@example.com", recipientName: "A. Customer" });
    expect(cert.status, JSON.stringify(cert.body)).toBe(201);
    ids.verifyCode = String(cert.body.verifyUrl).split("/").pop()!;
    ids.forkBatch = certified.batch.id;
    ids.forkUnitCertified = certified.id;
    const out = forks.find((f) => f.evaluation?.verdict === "out_of_tolerance")!;
    ids.forkUnitOut = out.id;
    ids.forkStrike = out.strikes[0].id;
    ids.forkSpec = certified.spec.id;
    const { batches } = await apiGet<{ batches: BatchSummary[] }>(page, "/api/batches");
    ids.openBatch = batches.find((b) => b.code === "BTW-2612")!.id;
    const { messages } = await apiGet<{ messages: { id: string; subject: string }[] }>(page, "/api/mail");
    ids.certificateMail = messages.find((m) => /certificate/i.test(m.subject))!.id;
    const { specs } = await apiGet<{ specs: SpecSummary[] }>(page, "/api/specs");
    expect(specs.length).toBeGreaterThan(0);
    await context.clearCookies();
  }, 300_000);

  it("the check itself finds a page that scrolls sideways, a box that cuts text off, a select cut short and overlapping labels", async () => {
    const { page } = e2e.browser;
    await page.setViewportSize({ width: 390, height: 900 });
    await page.setContent(`
      <div style="width: 600px">wide</div>
      <p style="width: 80px; overflow: hidden; white-space: nowrap">a sentence far longer than its box</p>
      <select style="width: 90px"><option>An option much longer than the box</option></select>
      <div class="tl-spectrum" style="position: relative; width: 300px; height: 40px">
        <span class="tl-marker" style="position: absolute; left: 10px; width: 60px">Prime</span>
        <span class="tl-marker" style="position: absolute; left: 40px; width: 60px">Tierce</span>
      </div>
      <span class="sr-only" style="position: absolute; width: 1px; height: 1px; overflow: hidden; clip: rect(0, 0, 0, 0)">screen-reader text is not a problem</span>`);
    const kinds = (await layoutProblems(page)).map((p) => p.kind);
    expect(kinds).toEqual(expect.arrayContaining(["page scrolls sideways", "content cut off", "choice cut off", "labels overlap"]));
    expect(kinds.filter((k) => k === "content cut off")).toHaveLength(1);
  });

  for (const who of ["signed out", "owner", "other"] as const) {
    it(`${who}: every screen at ${WIDTHS.join(" px and ")} px`, { timeout: 600_000 }, async () => {
      const { page, context } = e2e.browser;
      const base = e2e.server.baseUrl;
      await context.clearCookies();
      await page.setViewportSize({ width: 1280, height: 900 });
      if (who !== "signed out") await signIn(page, base, who === "owner" ? demo.owner : demo.other);
      const errors = watchConsole(page);
      const found: string[] = [];
      for (const screen of SCREENS.filter((s) => s.who === who)) {
        for (const width of WIDTHS) {
          await page.setViewportSize({ width, height: 900 });
          errors.length = 0;
          await page.goto(`${base}${screen.path(ids)}`);
          await settle(page);
          await screen.prepare?.(page);
          if (screen.prepare) await settle(page);
          const problems: ScreenProblem[] = [...(await layoutProblems(page)), ...errors.map((e) => ({ kind: "console error" as const, detail: e }))];
          await page.screenshot({ path: path.join(shots, `${screen.name}-${width}.png`), fullPage: true });
          for (const p of problems) found.push(`${screen.name} at ${width} px — ${p.kind}: ${p.detail}`);
        }
      }
      expect(found).toEqual([]);
    });
  }
});
