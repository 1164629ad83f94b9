/**
 * Runs the real server as a child process (`node --import tsx server/index.ts`: one process, so a
 * signal reaches the server itself) on a given data folder, for tests and benchmarks that must kill
 * or restart it. Waits until GET /api/health answers.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { createServer } from "node:net";
import { fileURLToPath } from "node:url";

const root = fileURLToPath(new URL("../..", import.meta.url));

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once("error", reject);
    probe.listen(0, "127.0.0.1", () => {
      const a = probe.address();
      const port = typeof a === "object" && a ? a.port : 0;
      probe.close(() => resolve(port));
    });
  });
}

export type ServerProcess = {
  baseUrl: string;
  child: ChildProcess;
  output: () => string;
  /** Sends a signal and waits for the exit. */
  kill(signal?: NodeJS.Signals): Promise<number | null>;
};

export async function spawnServer(opts: { dataDir: string; port?: number; env?: Record<string, string>; timeoutMs?: number }): Promise<ServerProcess> {
  const port = opts.port ?? (await freePort());
  const baseUrl = `http://127.0.0.1:${port}`;
  let output = "";
  // One process, node with tsx's loader: a SIGKILL must kill the server itself (the tsx wrapper forwards
  // SIGTERM to its child but cannot forward SIGKILL, which would leave the real server running).
  const child = spawn(process.execPath, ["--import", "tsx", "server/index.ts"], {
    cwd: root,
    // BASE_URL is set explicitly: vitest leaks BASE_URL="/" into process.env.
    env: { ...process.env, PORT: String(port), HOST: "127.0.0.1", BASE_URL: baseUrl, DATA_DIR: opts.dataDir, NODE_ENV: "test", LOG_LEVEL: "warn", ...opts.env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  child.stdout?.on("data", (c) => (output += c));
  child.stderr?.on("data", (c) => (output += c));
  let exitCode: number | null | undefined;
  const exited = new Promise<number | null>((resolve) => child.once("exit", (code) => { exitCode = code; resolve(code); }));
  const kill = async (signal: NodeJS.Signals = "SIGTERM") => {
    if (exitCode === undefined) child.kill(signal);
    return exited;
  };
  const deadline = Date.now() + (opts.timeoutMs ?? 60_000);
  for (;;) {
    if (exitCode !== undefined) throw new Error(`server exited with ${exitCode} before it answered:\n${output}`);
    try {
      const r = await fetch(`${baseUrl}/api/health`);
      if (r.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      await kill("SIGKILL");
      throw new Error(`server did not answer ${baseUrl}/api/health in time:\n${output}`);
    }
    await new Promise((r) => setTimeout(r, 150));
  }
  return { baseUrl, child, output: () => output, kill };
}

/** Signs in over HTTP and returns the cookie header to send. */
export async function signInCookie(baseUrl: string, email: string, password: string): Promise<string> {
  const r = await fetch(`${baseUrl}/api/auth/sign-in/email`, { method: "POST", headers: { "Content-Type": "application/json", Origin: baseUrl }, body: JSON.stringify({ email, password }) });
  if (!r.ok) throw new Error(`sign-in as ${email} failed: ${r.status} ${await r.text()}`);
  return r.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
}
