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
import { createInProcessQueue } from "./services/analysis-queue.ts";
import { createRedisQueue } from "./services/redis-queue.ts";
import { createReadCache } from "./services/read-cache.ts";
import { createStorage } from "./services/storage.ts";
import { sweepCertificateParts } from "./services/certificate-store.ts";
import { createAnalysisPool } from "./workers/analysis-pool.ts";
import { availableParallelism } from "node:os";
import path from "node:path";
import { ANALYSER_VERSION } from "./analysis/index.ts";
import { loadOrCreateSigningKey } from "./certificates/signing.ts";
import { seedDemo } from "../seeds/demo.ts";

export type Runtime = AppDeps & { capture: CaptureServer | null; close(): Promise<void> };

export async function bootstrap(env: Env, logger: Logger = createLogger(env.LOG_LEVEL)): Promise<Runtime> {
  const { db, sqlite } = openDatabase(env.databaseFile);
  const capture = env.SMTP_URL ? null : await startCaptureServer(db);
  const smtpUrl = env.SMTP_URL ?? `smtp://127.0.0.1:${capture!.port}?ignoreTLS=true`;
  const mailer = createMailer(db, { smtpUrl, defaultFrom: env.MAIL_FROM });
  const auth = createAuth({ db, env, mailer, logger });
  const storage = createStorage(env.DATA_DIR, { quotaBytes: env.WORKSHOP_QUOTA_MB * 1024 * 1024, minFreeBytes: env.MIN_FREE_DISK_MB * 1024 * 1024 });
  storage.sweepIncoming();
  sweepCertificateParts(env.DATA_DIR);
  const reconciled = storage.reconcile(db);
  if (reconciled.orphanFiles || reconciled.missingFiles) logger.warn(reconciled, "reconciled stored recordings with their rows after an unclean stop");
  // One analysis thread per spare core: the event loop keeps a core for HTTP.
  const threads = env.ANALYSIS_THREADS ?? Math.max(1, availableParallelism() - 1);
  const pool = createAnalysisPool({ maxThreads: threads, maxQueue: threads * 4 });
  const queue = env.REDIS_URL
    ? createRedisQueue({ db, sqlite, storage, logger, pool, redisUrl: env.REDIS_URL, concurrency: threads * 2 })
    : createInProcessQueue({ db, sqlite, storage, logger, pool, concurrency: threads * 2 });
  // The signing key lives beside the database, never inside it: a copy of the database alone cannot forge.
  const key = loadOrCreateSigningKey(path.join(env.DATA_DIR, "keys"));
  const certificates = { db, mailer, key, dataDir: env.DATA_DIR, baseUrl: env.baseUrl, analyserVersion: ANALYSER_VERSION };
  const deps: AppDeps = { env, db, sqlite, auth, mailer, logger, storage, queue, pool, certificates, readCache: createReadCache(sqlite) };
  if (env.SEED_DEMO) await seedDemo(deps);
  return {
    ...deps,
    capture,
    async close() {
      await queue.close();
      mailer.close();
      await capture?.close();
      sqlite.close();
    },
  };
}
