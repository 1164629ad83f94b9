/**
 * Browser-test harness: builds the client when it is out of date, starts the real server as a
 * child process on a free port with a fresh data folder (demo seeded), and launches Debian's
 * Chromium through playwright-core with a fresh profile. Nothing of the project is mocked.
 */
import { execFileSync, spawn, type ChildProcess } from "node:child_process";
import { accessSync, constants, existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { freePort } from "./server-process";
import { DEMO_PASSWORD, DEMO_USERS, DEMO_WORKSHOP, OTHER_WORKSHOP } from "../../seeds/demo.ts";

export const repoRoot = fileURLToPath(new URL("../..", import.meta.url));
export const screenshotDir = path.join(repoRoot, ".tmp");

const demoEmail = (role: string, workshop: "demo" | "other") => {
  const found = DEMO_USERS.find((u) => u.role === role && u.workshop === workshop);
  if (!found) throw new Error(`seeds/demo.ts has no ${role} in the ${workshop} workshop; the browser tests sign in as one.`);
  return found.email;
};

/** The demo accounts, read from the seed itself (seeds/demo.ts) so the two cannot drift. */
export const demo = {
  password: DEMO_PASSWORD,
  owner: demoEmail("owner", "demo"),
  qa: demoEmail("qa", "demo"),
  maker: demoEmail("maker", "demo"),
  other: demoEmail("owner", "other"),
  workshopName: DEMO_WORKSHOP.name,
  otherWorkshopName: OTHER_WORKSHOP.name,
} as const;

// ---------------------------------------------------------------------------------------------
// Client build

/** Newest modification time (ms) of anything the client bundle is built from. */
function newestSourceMtime(): number {
  let newest = 0;
  const visit = (entry: string) => {
    if (!existsSync(entry)) return;
    const stat = statSync(entry);
    if (stat.isDirectory()) {
      for (const name of readdirSync(entry)) if (name !== "node_modules" && !name.startsWith(".")) visit(path.join(entry, name));
    } else if (stat.mtimeMs > newest) newest = stat.mtimeMs;
  };
  for (const entry of ["src", "shared", "index.html", "vite.config.ts"]) visit(path.join(repoRoot, entry));
  return newest;
}

function clientIsFresh(): boolean {
  const built = path.join(repoRoot, "dist/client/index.html");
  return existsSync(built) && statSync(built).mtimeMs >= newestSourceMtime();
}

/**
 * Runs `vite build` once when dist/client is missing or older than its sources. Several test
 * files may ask at once (vitest runs files in parallel): a lock directory makes them take turns,
 * and whoever comes second finds the build fresh.
 */
export async function ensureClientBuilt(): Promise<void> {
  if (clientIsFresh()) return;
  mkdirSync(screenshotDir, { recursive: true });
  const lock = path.join(screenshotDir, "client-build.lock");
  const started = Date.now();
  for (;;) {
    try {
      mkdirSync(lock);
      break;
    } catch {
      // A lock older than five minutes belongs to a run that died.
      if (existsSync(lock) && Date.now() - statSync(lock).mtimeMs > 300_000) rmSync(lock, { recursive: true, force: true });
      if (Date.now() - started > 300_000) throw new Error(`Waited 5 minutes for another client build (lock ${lock}); remove the lock if no build is running.`);
      await new Promise((resolve) => setTimeout(resolve, 250));
    }
  }
  try {
    if (!clientIsFresh()) {
      execFileSync(path.join(repoRoot, "node_modules/.bin/vite"), ["build", "--logLevel", "warn"], { cwd: repoRoot, stdio: "inherit" });
    }
  } finally {
    rmSync(lock, { recursive: true, force: true });
  }
}

// ---------------------------------------------------------------------------------------------
// Server

export type RunningServer = { baseUrl: string; dataDir: string; output: () => string; stop: () => Promise<void> };

/**
 * Starts `tsx server/index.ts` (node_modules/.bin/tsx, not npx, so one PID stops the whole tree;
 * npx starts a second process that a kill leaves running) and waits until GET /api/health answers `{ ok: true }`.
 */
export async function startServer({ timeoutMs = 90_000 }: { timeoutMs?: number } = {}): Promise<RunningServer> {
  await ensureClientBuilt();
  // TINELOG_E2E_SERVER_ROOT runs the server of another checkout (e.g. an exported commit with
  // node_modules and dist linked in) while this tree's server is half-edited; unset, it is this tree.
  const serverRoot = process.env.TINELOG_E2E_SERVER_ROOT ? path.resolve(process.env.TINELOG_E2E_SERVER_ROOT) : repoRoot;
  const port = await freePort();
  const dataDir = mkdtempSync(path.join(tmpdir(), "tinelog-e2e-"));
  const baseUrl = `http://127.0.0.1:${port}`;
  let output = "";
  const child: ChildProcess = spawn(path.join(serverRoot, "node_modules/.bin/tsx"), ["server/index.ts"], {
    cwd: serverRoot,
    env: {
      ...process.env,
      PORT: String(port),
      HOST: "127.0.0.1",
      BASE_URL: baseUrl,
      DATA_DIR: dataDir,
      SEED_DEMO: "1",
      NODE_ENV: "test",
      LOG_LEVEL: "warn",
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  child.stdout?.on("data", (chunk) => (output += chunk));
  child.stderr?.on("data", (chunk) => (output += chunk));
  let exited: number | null | undefined;
  const exitPromise = new Promise<void>((resolve) =>
    child.once("exit", (code) => {
      exited = code;
      resolve();
    }),
  );

  const stop = async () => {
    if (exited === undefined) {
      child.kill("SIGTERM");
      const timer = setTimeout(() => child.kill("SIGKILL"), 10_000);
      await exitPromise;
      clearTimeout(timer);
    }
    rmSync(dataDir, { recursive: true, force: true });
  };

  const deadline = Date.now() + timeoutMs;
  for (;;) {
    if (exited !== undefined) {
      await stop();
      throw new Error(`The server exited with code ${exited} before answering /api/health. Its output:\n${output}`);
    }
    try {
      const response = await fetch(`${baseUrl}/api/health`);
      if (response.ok && (await response.json()).ok === true) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      await stop();
      throw new Error(`The server did not answer ${baseUrl}/api/health within ${timeoutMs / 1000} s. Its output:\n${output}`);
    }
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
  return { baseUrl, dataDir, output: () => output, stop };
}

// ---------------------------------------------------------------------------------------------
// Browser

/** Flags for Debian's Chromium on a server: headless, no sandbox (root in CI), and no background traffic. */
export const chromiumArgs = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--no-first-run",
];

export function findChromium(): string {
  const candidates = ["/usr/bin/chromium", ...(process.env.PATH ?? "").split(path.delimiter).filter(Boolean).flatMap((dir) => [path.join(dir, "chromium"), path.join(dir, "chromium-browser")])];
  for (const candidate of candidates) {
    try {
      accessSync(candidate, constants.X_OK);
      return candidate;
    } catch {
      // try the next
    }
  }
  throw new Error("Chromium is missing: run `node scripts/ensure-chromium.mjs` (installs Debian's chromium as root) or `apt-get install -y chromium`.");
}

export type LaunchedBrowser = { context: BrowserContext; page: Page; close: () => Promise<void> };

/** A tablet-sized window by default (the product's main device on the bench). */
export async function launchBrowser({ viewport = { width: 1180, height: 820 } }: { viewport?: { width: number; height: number } } = {}): Promise<LaunchedBrowser> {
  const userDataDir = mkdtempSync(path.join(tmpdir(), "tinelog-chromium-"));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: findChromium(),
    headless: true,
    args: chromiumArgs,
    viewport,
    locale: "en-GB",
    timezoneId: "UTC",
  });
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    close: async () => {
      await context.close();
      rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}

/** Saves a full-page screenshot into .tmp/ (git-ignored) and returns its path, for a person to look at. */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(screenshotDir, { recursive: true });
  const file = path.join(screenshotDir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

/** Fills and sends the sign-in form already on the page (e.g. after a redirect to it). */
export async function fillSignInForm(page: Page, email: string, password: string = demo.password): Promise<void> {
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

/** Opens the real sign-in form and sends it, the way a person does; waits for nothing after. */
export async function signInThroughForm(page: Page, baseUrl: string, email: string, password: string = demo.password): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await fillSignInForm(page, email, password);
}

/** Signs in through the form and waits for the dashboard it leads to. */
export async function signIn(page: Page, baseUrl: string, email: string, password: string = demo.password): Promise<void> {
  await signInThroughForm(page, baseUrl, email, password);
  await page.getByRole("heading", { name: "Dashboard", level: 1 }).waitFor();
}
