/** Starts Tinelog: configuration, wiring, HTTP listener, clean shutdown on SIGTERM/SIGINT. */
import { createApp } from "./app.ts";
import { bootstrap } from "./bootstrap.ts";
import { ConfigError, loadEnv } from "./env.ts";
import { createLogger } from "./logger.ts";
import { DEMO_PASSWORD, DEMO_USERS } from "../seeds/demo.ts";

async function main() {
  let env;
  try {
    env = loadEnv();
  } catch (error) {
    if (error instanceof ConfigError) {
      console.error(error.message);
      process.exit(1);
    }
    throw error;
  }
  const logger = createLogger(env.LOG_LEVEL);
  const runtime = await bootstrap(env, logger);
  const app = createApp(runtime);
  const server = app.listen(env.PORT, env.HOST, () => {
    const lines = [
      "",
      `  Tinelog is running at ${env.baseUrl}`,
      `  Database: ${env.databaseFile}`,
      runtime.capture ? `  Mail: captured in-process (SMTP 127.0.0.1:${runtime.capture.port}); read it on the Outbox screen` : "  Mail: sent through SMTP_URL",
    ];
    if (env.SEED_DEMO) {
      lines.push(`  Demo sign-ins (password ${DEMO_PASSWORD}):`);
      for (const u of DEMO_USERS) lines.push(`    ${u.email.padEnd(20)} ${u.label}`);
    }
    console.log(lines.join("\n") + "\n");
  });

  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, "shutting down");
    const force = setTimeout(() => process.exit(1), 10_000).unref();
    server.close(async () => {
      await runtime.close();
      clearTimeout(force);
      process.exit(0);
    });
    server.closeIdleConnections();
  };
  process.on("SIGTERM", () => stop("SIGTERM"));
  process.on("SIGINT", () => stop("SIGINT"));
}

main().catch((error) => {
  console.error(`Tinelog failed to start: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});
