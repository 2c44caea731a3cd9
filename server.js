// Production HTTP server: React Router's Express adapter with the pieces a
// multi-server deployment needs — validated settings, structured logs with a
// request id, user and route, the client IP the rate limiter trusts, security
// headers on every response, static assets, and a graceful shutdown.

// React and the framework pick their production builds from NODE_ENV when first loaded, so it is
// settled before anything imports them (the development builds are several times slower).
process.env.NODE_ENV ??= "production";
const { createRequestHandler } = await import("@react-router/express");
const { default: compression } = await import("compression");
const { default: express } = await import("express");
const { default: onHeaders } = await import("on-headers");
const { randomUUID } = await import("node:crypto");
const { readdirSync } = await import("node:fs");
const { default: path } = await import("node:path");
const { pinoHttp } = await import("pino-http");

const build = await import(path.resolve("build/server/index.js"));
const entry = build.entry.module;

// Settings first: a bad one stops here with a message naming it (values are never printed).
let settings;
try {
  settings = entry.serverConfig();
} catch (error) {
  if (error?.name !== "ConfigError") throw error;
  process.stderr.write(`${error.message}\n`);
  process.exit(1);
}

const logger = entry.logger();

try {
  await entry.prepareServer();
} catch (error) {
  // Typically the database: unreachable, wrong password, or missing. pg's messages never contain the password.
  logger.fatal({ err: { message: error?.message, code: error?.code } }, "cannot start: preparing the database failed (check DATABASE_URL and that PostgreSQL is running)");
  process.exit(1);
}

const app = express();
app.disable("x-powered-by");
app.set("trust proxy", settings.TRUST_PROXY);
app.use(compression());
app.use(
  pinoHttp({
    logger,
    genReqId: (req, res) => {
      const id = randomUUID();
      res.setHeader("x-request-id", id);
      return id;
    },
    customLogLevel: (_req, res, error) => (error || res.statusCode >= 500 ? "error" : "info"),
    // Who asked and which route answered, filled in while the request ran (see app/.server/request-log.ts).
    customSuccessObject: (req, res, line) => ({ ...line, ...requestFacts(req) }),
    customErrorObject: (req, res, error, line) => ({ ...line, ...requestFacts(req) }),
    serializers: {
      req: (req) => ({ id: req.id, method: req.method, url: entry.redactUrl(req.url ?? "/") }),
      res: (res) => ({ statusCode: res.statusCode }),
    },
    autoLogging: { ignore: (req) => req.url?.startsWith("/assets/") ?? false },
  }),
);

function onlyFilesIn(folder, serve) {
  const files = new Set(
    readdirSync(folder, { recursive: true, withFileTypes: true })
      .filter((entry) => entry.isFile())
      .map((entry) => "/" + path.relative(folder, path.join(entry.parentPath, entry.name)).split(path.sep).join("/")),
  );
  return (req, res, next) => (files.has(req.path) ? serve(req, res, next) : next());
}

function requestFacts(req) {
  const context = req.logContext ?? {};
  return { route: context.route ?? "unmatched", userId: context.userId ?? null, via: context.via };
}

// The only client address the app trusts: from the socket, or from proxies named in TRUST_PROXY.
// Security headers go on every response (static files, JSON, redirects, errors): whichever the
// app did not set itself (pages carry their own CSP with a nonce) are added as the headers are sent.
// req.secure is true over TLS, or behind a trusted proxy that says X-Forwarded-Proto: https.
app.use((req, res, next) => {
  req.headers["x-sinewright-client-ip"] = req.ip ?? "";
  onHeaders(res, () => {
    for (const [name, value] of Object.entries(entry.securityHeaders({ html: false, secure: req.secure }))) {
      if (!res.hasHeader(name)) res.setHeader(name, value);
    }
  });
  next();
});
app.use("/assets", express.static("build/client/assets", { immutable: true, maxAge: "1y" }));
// The other static files are known at start; asking the file system on every page request costs throughput.
app.use(onlyFilesIn("build/client", express.static("build/client", { maxAge: "1h", index: false })));
app.use(onlyFilesIn("public", express.static("public", { maxAge: "1h", index: false })));
app.use((req, _res, next) => {
  req.logContext = { requestId: req.id };
  entry.runWithRequestLog(req.logContext, next);
});
app.all("*splat", createRequestHandler({ build, mode: settings.NODE_ENV }));
// Whatever Express itself refuses (a malformed URL, a body it cannot read) still gets words and our headers, never a stack.
app.use((error, req, res, _next) => {
  const status = Number.isInteger(error?.status) && error.status >= 400 && error.status < 600 ? error.status : 500;
  if (status >= 500) req.log.error({ err: error }, "request failed");
  res.status(status).type("text/plain").send(status >= 500 ? "Something went wrong on our side. Try again in a moment." : "This request could not be read. Check the address and try again.");
});

const { HOST: host, PORT: port } = settings;
const server = app.listen(port, host, () => {
  logger.info({ url: `http://${host === "0.0.0.0" ? "localhost" : host}:${port}` }, "Sinewright is serving");
});
server.on("error", (error) => {
  logger.fatal({ err: { message: error.message, code: error.code } }, `cannot listen on ${host}:${port} (check HOST and PORT)`);
  process.exit(1);
});

let stopping = false;
function shutdown(signal) {
  if (stopping) return;
  stopping = true;
  logger.info({ signal }, "stopping: finishing requests in flight");
  // Stop accepting, let in-flight requests finish, then close the pool and workers.
  server.close(async () => {
    await entry.stopServer();
    logger.info("stopped");
    process.exit(0);
  });
  server.closeIdleConnections();
  setTimeout(() => {
    logger.warn("requests still running after 20 s: exiting anyway");
    process.exit(1);
  }, 20_000).unref();
}
process.once("SIGTERM", () => shutdown("SIGTERM"));
process.once("SIGINT", () => shutdown("SIGINT"));
