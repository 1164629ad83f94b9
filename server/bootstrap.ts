/**
 * Opens everything the app needs, in order: database (migrated), mail (capture server when no
 * SMTP_URL), auth, demo seed. Used by server/index.ts and by the tests, so both run the same wiring.
 */
import { createAuth } from "./auth.ts";
import { openDatabase } from "./db/client.ts";
import type { Env } from "./env.ts";
import { createLogger, type Logger } from "./logger.ts";
import { startCaptureServer, type CaptureServer } from "./mail/capture.ts";
import { createMailer } from "./mail/mailer.ts";
import type { AppDeps } from "./app.ts";
import { seedDemo } from "../seeds/demo.ts";

export type Runtime = AppDeps & { capture: CaptureServer | null; close(): Promise<void> };

export async function bootstrap(env: Env, logger: Logger = createLogger(env.LOG_LEVEL)): Promise<Runtime> {
  const { db, sqlite } = openDatabase(env.databaseFile);
  const capture = env.SMTP_URL ? null : await startCaptureServer(db);
  const smtpUrl = env.SMTP_URL ?? `smtp://127.0.0.1:${capture!.port}?ignoreTLS=true`;
  const mailer = createMailer(db, { smtpUrl, defaultFrom: env.MAIL_FROM });
  const auth = createAuth({ db, env, mailer });
  const deps: AppDeps = { env, db, sqlite, auth, mailer, logger };
  if (env.SEED_DEMO) await seedDemo(deps);
  return {
    ...deps,
    capture,
    async close() {
      mailer.close();
      await capture?.close();
      sqlite.close();
    },
  };
}
