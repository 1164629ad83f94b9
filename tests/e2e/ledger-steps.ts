/** Steps the ledger browser tests share (not a test file itself: vitest picks only *.test.ts). */
import type { Page } from "playwright-core";

/** The ledger table's row for a serial (the serial cell is a link to the unit page). */
export function ledgerRow(page: Page, serial: string) {
  return page.getByRole("table", { name: "Units of the batch" }).getByRole("row").filter({ has: page.getByRole("link", { name: serial, exact: true }) });
}

/** From the batches list, opens a batch's ledger page. */
export async function openBatch(page: Page, code: string): Promise<void> {
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Batches" }).click();
  await page.getByRole("heading", { name: "Batches", level: 1 }).waitFor();
  await page.getByRole("link", { name: code, exact: true }).click();
  await page.getByRole("heading", { name: `Batch ${code}`, level: 1 }).waitFor();
}

/** Waits until every unit of the open ledger has a verdict (the seeded strikes are analysed at start). */
export async function waitForVerdicts(page: Page, serials: string[]): Promise<void> {
  for (const serial of serials) {
    await ledgerRow(page, serial).getByText(/^(Within tolerance|Out of tolerance|Inconclusive)$/).waitFor({ timeout: 90_000 });
  }
}

/** On a unit page: records a disposition with its reason, and sees it in the history. */
export async function dispose(page: Page, serial: string, decision: "use_as_is" | "scrap" | "rework" | "retest", reason: string): Promise<void> {
  await ledgerRow(page, serial).getByRole("link", { name: serial, exact: true }).click();
  await page.getByRole("heading", { name: `Unit ${serial}`, level: 1 }).waitFor();
  const form = page.getByRole("form", { name: "Disposition" });
  await form.getByLabel("Decision").selectOption(decision);
  await form.getByLabel("Reason").fill(reason);
  await form.getByRole("button", { name: "Record disposition" }).click();
  await page.getByRole("list", { name: "Disposition history" }).getByText(reason).waitFor();
  // The audit trail (qa and owner read it) records the decision too.
  await page.getByRole("list", { name: "Unit history" }).getByText("Disposition recorded").first().waitFor();
}

/** Disposes of the two seeded nonconforming forks of BTW-2611 and releases the batch. */
export async function disposeAndRelease(page: Page): Promise<void> {
  await dispose(page, "F-0004", "use_as_is", "Customer accepts −9 cents for a practice fork (demo concession).");
  await page.getByRole("link", { name: "← Batch BTW-2611" }).click();
  await page.getByRole("heading", { name: "Batch BTW-2611", level: 1 }).waitFor();
  await dispose(page, "F-0008", "scrap", "Too sharp to rework within the tine length left.");
  await page.getByRole("link", { name: "← Batch BTW-2611" }).click();
  await page.getByRole("heading", { name: "Batch BTW-2611", level: 1 }).waitFor();
  await page.getByRole("button", { name: "Release batch…" }).click();
  await page.getByRole("button", { name: "Release BTW-2611 now" }).click();
  await page.getByRole("status").filter({ hasText: /^Released \d.*No more strikes can be added/ }).waitFor();
}
