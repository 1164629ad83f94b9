/**
 * What the browser-test files share beyond the harness in browser.ts: one server and one browser
 * per file, GETs with the page's own session cookie, and finding a demo batch by its code.
 */
import { afterAll, beforeAll } from "vitest";
import type { Page } from "playwright-core";
import type { BatchDetail, BatchSummary } from "../../shared/schemas/batch.ts";
import { launchBrowser, startServer, type LaunchedBrowser, type RunningServer } from "./browser";

export type E2eSession = { readonly server: RunningServer; readonly browser: LaunchedBrowser };

/**
 * Starts the server and then the browser before the file's tests and closes both after them.
 * Read `server` and `browser` inside hooks and tests (they exist once the first hook has run).
 */
export function withServerAndBrowser(browserOptions?: Parameters<typeof launchBrowser>[0]): E2eSession {
  let server: RunningServer | undefined;
  let browser: LaunchedBrowser | undefined;
  beforeAll(async () => {
    server = await startServer();
    browser = await launchBrowser(browserOptions);
  });
  afterAll(async () => {
    await browser?.close();
    await server?.stop();
  });
  return {
    get server() {
      if (!server) throw new Error("The e2e server is not running: read it inside a hook or test, after withServerAndBrowser's beforeAll.");
      return server;
    },
    get browser() {
      if (!browser) throw new Error("The e2e browser is not open: read it inside a hook or test, after withServerAndBrowser's beforeAll.");
      return browser;
    },
  };
}

/** GET with the page's own session cookie; a status other than 2xx throws with the URL. */
export async function apiGet<T>(page: Page, url: string): Promise<T> {
  return page.evaluate(async (u) => {
    const r = await fetch(u, { credentials: "same-origin" });
    if (!r.ok) throw new Error(`${u} answered ${r.status}`);
    return r.json();
  }, url) as Promise<T>;
}

/** The id of the demo batch with this code (seeds/demo.ts), through the API the client uses. */
export async function batchIdByCode(page: Page, code: string): Promise<string> {
  const { batches } = await apiGet<{ batches: BatchSummary[] }>(page, "/api/batches");
  const id = batches.find((b) => b.code === code)?.id;
  if (!id) throw new Error(`The demo seed has no batch ${code}; the browser tests open it (seeds/demo.ts).`);
  return id;
}

/** The ledger of the demo batch with this code. */
export async function batchByCode(page: Page, code: string): Promise<BatchDetail> {
  return apiGet<BatchDetail>(page, `/api/batches/${await batchIdByCode(page, code)}`);
}
