/**
 * The HTTP app, built with the rest of the app (vite.config.ts makes this the server build's entry,
 * as React Router's custom-server template does): ordinary Express middleware in front of React
 * Router, which answers every request that is not a static file. server.js only chooses between
 * development (Vite's middleware) and production (the built files) and listens.
 */
import { randomUUID } from "node:crypto";
import { readdirSync } from "node:fs";
import path from "node:path";
import { createRequestHandler } from "@react-router/express";
import compression from "compression";
import express, { type NextFunction, type Request, type RequestHandler, type Response } from "express";
import helmet, { strictTransportSecurity } from "helmet";
import onHeaders from "on-headers";
import { pinoHttp } from "pino-http";
import type { ServerBuild } from "react-router";
import { CLIENT_IP_HEADER } from "~/.server/auth";
import { bodyLimitFor } from "~/.server/body-limits";
import { config, trustedOrigins } from "~/.server/config";
import { requestContext } from "~/.server/context";
import { db } from "~/.server/db/client";
import { logger } from "~/.server/logger";
import { redactUrl, runWithRequestLog, type RequestLogContext } from "~/.server/request-log";
import { NON_PAGE_POLICY } from "~/.server/security-headers";

export { config as serverConfig } from "~/.server/config";
export { logger } from "~/.server/logger";
export { startBackgroundWork as prepareServer, stopBackgroundWork as stopServer } from "~/.server/lifecycle";

declare module "express-serve-static-core" {
  interface Request {
    logContext?: RequestLogContext;
  }
}

/**
 * The framework's server build, with the extra TRUSTED_ORIGINS as the hosts its own
 * action-origin check accepts (page forms posted from them work, as the API's do).
 */
const builds = new WeakMap<object, ServerBuild>();
async function serverBuild(): Promise<ServerBuild> {
  const build = (await import("virtual:react-router/server-build")) as ServerBuild;
  let withOrigins = builds.get(build);
  if (!withOrigins) {
    withOrigins = { ...build, allowedActionOrigins: trustedOrigins().map((origin) => new URL(origin).host) };
    builds.set(build, withOrigins);
  }
  return withOrigins;
}

export interface AppOptions {
  /** Development: Vite's middleware serves the client modules and hot updates instead of the built files. */
  viteMiddleware?: RequestHandler;
}

export function createApp({ viteMiddleware }: AppOptions = {}): express.Express {
  const settings = config();
  const app = express();
  app.disable("x-powered-by");
  // The only client address the app trusts: from the socket, or from proxies named in TRUST_PROXY.
  app.set("trust proxy", settings.TRUST_PROXY);
  app.use(compression());
  app.use(requestLog());
  app.use(securityHeaders(settings.APP_URL.startsWith("https://")));
  if (viteMiddleware) app.use(viteMiddleware);
  else serveBuiltFiles(app);
  app.use((req, _res, next) => {
    // better-auth reads the client address (for its sign-in limits) from this header; a client's own value is replaced.
    req.headers[CLIENT_IP_HEADER] = req.ip ?? "";
    req.logContext = { requestId: String(req.id) };
    runWithRequestLog(req.logContext, next);
  });
  app.use(limitBodies);
  app.all(
    "*splat",
    createRequestHandler({
      build: serverBuild,
      mode: settings.NODE_ENV,
      getLoadContext: (req) => requestContext({ database: db(), logger: req.log, clientAddress: req.ip ?? "" }),
    }),
  );
  // Whatever Express itself refuses (a malformed URL, a body it cannot read) still gets words and our headers, never a stack.
  app.use((error: { status?: number }, req: Request, res: Response, _next: NextFunction) => {
    if (res.headersSent) return void res.end();
    const status = Number.isInteger(error?.status) && error.status! >= 400 && error.status! < 600 ? error.status! : 500;
    if (status >= 500) req.log.error({ err: error }, "request failed");
    res.status(status).type("text/plain").send(status >= 500 ? "Something went wrong on our side. Try again in a moment." : "This request could not be read. Check the address and try again.");
  });
  return app;
}

/** One JSON line per request (pino-http) with its id (also the X-Request-Id header), the route the framework matched and who asked. */
function requestLog(): RequestHandler {
  const facts = (req: Request) => ({ route: req.logContext?.route ?? "unmatched", userId: req.logContext?.userId ?? null, via: req.logContext?.via });
  return pinoHttp({
    logger: logger(),
    genReqId: (_req, res) => {
      const id = randomUUID();
      res.setHeader("x-request-id", id);
      return id;
    },
    customLogLevel: (_req, res, error) => (error || res.statusCode >= 500 ? "error" : "info"),
    customSuccessObject: (req, _res, line) => ({ ...line, ...facts(req as Request) }),
    customErrorObject: (req, _res, _error, line) => ({ ...line, ...facts(req as Request) }),
    serializers: {
      req: (req) => ({ id: req.id, method: req.method, url: redactUrl(req.url ?? "/") }),
      res: (res) => ({ statusCode: res.statusCode }),
    },
    autoLogging: { ignore: (req) => req.url?.startsWith("/assets/") ?? false },
  }) as unknown as RequestHandler;
}

/**
 * helmet's headers on every response; HSTS only over TLS (directly, or a trusted proxy's
 * X-Forwarded-Proto). Pages carry their own Content-Security-Policy with a per-response nonce
 * (entry.server.tsx); everything else gets the closed policy as its headers go out — set
 * after the framework, because its adapter appends headers, so a policy set before would be
 * sent twice on pages.
 */
function securityHeaders(alwaysHttps: boolean): RequestHandler {
  const headers = helmet({
    contentSecurityPolicy: false,
    strictTransportSecurity: false,
    xFrameOptions: { action: "deny" },
    referrerPolicy: { policy: "strict-origin-when-cross-origin" },
  });
  const hsts = strictTransportSecurity({ maxAge: 31_536_000, includeSubDomains: true });
  return (req, res, next) => {
    onHeaders(res, () => {
      if (!res.hasHeader("content-security-policy")) res.setHeader("Content-Security-Policy", NON_PAGE_POLICY);
    });
    headers(req, res, () => (req.secure || alwaysHttps ? hsts(req, res, next) : next()));
  };
}

function serveBuiltFiles(app: express.Express): void {
  app.use("/assets", express.static("build/client/assets", { immutable: true, maxAge: "1y" }));
  // The other static files are known at start; asking the file system on every page request costs throughput.
  app.use(onlyFilesIn("build/client", express.static("build/client", { maxAge: "1h", index: false })));
  app.use(onlyFilesIn("public", express.static("public", { maxAge: "1h", index: false })));
}

function onlyFilesIn(folder: string, serve: RequestHandler): RequestHandler {
  const files = new Set(
    readdirSync(folder, { recursive: true, withFileTypes: true })
      .filter((entry) => entry.isFile())
      .map((entry) => "/" + path.relative(folder, path.join(entry.parentPath, entry.name)).split(path.sep).join("/")),
  );
  return (req, res, next) => (files.has(req.path) ? serve(req, res, next) : next());
}

/**
 * Caps every request body by route before anything reads it (app/.server/body-limits.ts): a
 * declared length over the cap is refused at once, unread; a body without one is counted as it
 * arrives and cut off at the cap. The connection is closed after the refusal, so the rest is never read.
 */
function limitBodies(req: Request, res: Response, next: NextFunction): void {
  if (req.method === "GET" || req.method === "HEAD") return next();
  const limit = bodyLimitFor(req.path);
  const declared = req.headers["content-length"];
  if (declared !== undefined) return Number(declared) > limit ? refuseBody(req, res, limit) : next();
  let received = 0;
  const count = (chunk: Buffer) => {
    received += chunk.length;
    if (received <= limit) return;
    req.off("data", count);
    refuseBody(req, res, limit);
    // The body fails for whoever reads it (never a cut-off body read as whole), once the refusal is out.
    res.once("finish", () => req.destroy(new Error("request body over the limit")));
  };
  req.on("data", count);
  // Paused until the framework reads it, so no chunk passes before its reader listens.
  req.pause();
  next();
}

function refuseBody(req: Request, res: Response, limit: number): void {
  if (res.headersSent) return;
  const size = limit >= 1024 * 1024 ? `${Math.round(limit / (1024 * 1024))} MB` : `${Math.round(limit / 1024)} KB`;
  const message = `This request is larger than the ${size} this address accepts. Send less, or split it into smaller requests.`;
  res.status(413).set("Connection", "close");
  if (req.path.startsWith("/api/")) res.json({ error: message });
  else res.type("text/plain").send(message);
}
