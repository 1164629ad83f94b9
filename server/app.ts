/**
 * Builds the Express app without listening, so tests mount it directly. A thin shell: security
 * headers, logging, better-auth, session context, the feature routers, the built client, errors.
 */
import { existsSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { toNodeHandler } from "better-auth/node";
import express from "express";
import helmet from "helmet";
import { pinoHttp } from "pino-http";
import type { Auth } from "./auth.ts";
import type { Db, Sqlite } from "./db/client.ts";
import type { Env } from "./env.ts";
import type { Logger } from "./logger.ts";
import type { Mailer } from "./mail/mailer.ts";
import { contextMiddleware, createSessionCache, sessionToken } from "./middleware/context.ts";
import { apiNotFound, errorHandler } from "./middleware/errors.ts";
import { MULTIPART_OVERHEAD_BYTES, readAuthBody, refuseDeclaredOversize, type BodyLimits } from "./middleware/body-limit.ts";
import { sameOriginJson } from "./middleware/origin.ts";
import { cleanStrings } from "../shared/text.ts";
import { batchRoutes } from "./routes/batches.ts";
import { certificateRoutes } from "./routes/certificates.ts";
import { evaluationRoutes } from "./routes/evaluations.ts";
import { instrumentRoutes } from "./routes/instruments.ts";
import { mailRoutes } from "./routes/mail.ts";
import { modeRoutes } from "./routes/modes.ts";
import { searchRoutes } from "./routes/search.ts";
import { sessionRoutes } from "./routes/session.ts";
import { specRoutes } from "./routes/specs.ts";
import { strikeRoutes } from "./routes/strikes.ts";
import { workshopRoutes } from "./routes/workshop.ts";
import type { AnalysisQueue } from "./services/analysis-queue.ts";
import type { CertificateDeps } from "./services/certificates.ts";
import type { ReadCache } from "./services/read-cache.ts";
import type { Storage } from "./services/storage.ts";
import type { AnalysisPool } from "./workers/analysis-pool.ts";

export type AppDeps = {
  env: Env;
  db: Db;
  sqlite: Sqlite;
  auth: Auth;
  mailer: Mailer;
  logger: Logger;
  storage: Storage;
  queue: AnalysisQueue;
  /** The analysis workers, for work answered within a request (reference tones of a calibration, a master unit). */
  pool: AnalysisPool;
  certificates: CertificateDeps;
  readCache: ReadCache;
};

const clientDir = fileURLToPath(new URL("../dist/client", import.meta.url));

/** The feature routers, in one list: the authorization matrix test walks them. */
export function apiRouters(deps: AppDeps) {
  return [sessionRoutes(deps), workshopRoutes(deps), mailRoutes(deps), specRoutes(deps), modeRoutes(deps), batchRoutes(deps), strikeRoutes(deps), certificateRoutes(deps), searchRoutes(deps), instrumentRoutes(deps), evaluationRoutes(deps)];
}

export function createApp(deps: AppDeps) {
  const app = express();
  app.disable("x-powered-by");
  app.set("trust proxy", "loopback");
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          "img-src": ["'self'", "data:", "blob:"],
          "media-src": ["'self'", "blob:"],
          "worker-src": ["'self'", "blob:"],
          // The certificate preview is a PDF held in a blob: URL, shown in a frame.
          "frame-src": ["'self'", "blob:"],
          // Only ask browsers to upgrade sub-resources when we really are on https.
          "upgrade-insecure-requests": deps.env.baseUrl.startsWith("https://") ? [] : null,
        },
      },
      // Secure-transport header only when we are actually served over https.
      strictTransportSecurity: deps.env.baseUrl.startsWith("https://"),
    }),
  );
  app.use(pinoHttp({ logger: deps.logger, autoLogging: { ignore: (req) => !req.url?.startsWith("/api") } }));
  const limits: BodyLimits = { authBytes: 16 * 1024, jsonBytes: 1024 * 1024, multipartBytes: deps.env.UPLOAD_LIMIT_MB * 1024 * 1024 + MULTIPART_OVERHEAD_BYTES };
  app.use(refuseDeclaredOversize(limits));

  // better-auth sees a Web Request without the socket, so it rate-limits by X-Forwarded-For. Give it
  // the client address Express resolved (trusting forwarded headers only from loopback proxies), so a
  // client can neither spoof its way past the limit nor share one bucket with everyone.
  const sessions = createSessionCache();
  app.use("/api/auth", (req, _res, next) => {
    req.headers["x-forwarded-for"] = req.ip ?? req.socket.remoteAddress ?? "unknown";
    sessions.forget(sessionToken(req.headers.cookie)); // sign-out, switching workshop: re-read the session
    next();
  });
  // better-auth parses its own body (from req.body once read here under the limit), so it goes before express.json().
  app.all("/api/auth/{*any}", readAuthBody(limits), toNodeHandler(deps.auth));

  const api = express.Router();
  api.use(express.json({ limit: limits.jsonBytes }));
  // Every stored text field arrives through here or the upload route: control characters go at the door.
  api.use((req, _res, next) => {
    if (req.body && typeof req.body === "object") req.body = cleanStrings(req.body);
    next();
  });
  api.use(contextMiddleware(deps.auth, deps.db, sessions));
  api.use(sameOriginJson(deps.env.trustedOrigins));
  for (const router of apiRouters(deps)) api.use(router);
  api.use(apiNotFound);
  app.use("/api", api);

  if (existsSync(path.join(clientDir, "index.html"))) {
    app.use(express.static(clientDir, { index: false, maxAge: "1h" }));
    app.get("/{*splat}", (_req, res) => res.sendFile(path.join(clientDir, "index.html")));
  } else {
    app.get("/", (_req, res) => {
      res.type("text").send("Tinelog API is running. Build the client with `npm run build`, or use `npm run dev`.");
    });
  }
  app.use(errorHandler);
  return app;
}
