// Production HTTP server: React Router's Express adapter with the pieces a
// multi-server deployment needs — structured logs with a request id, the client
// IP the rate limiter trusts, static assets, and a graceful shutdown.
import { createRequestHandler } from "@react-router/express";
import compression from "compression";
import express from "express";
import { randomUUID } from "node:crypto";
import path from "node:path";
import pino from "pino";
import { pinoHttp } from "pino-http";

const logger = pino({
  level: process.env.LOG_LEVEL ?? "info",
  redact: { paths: ["req.headers.cookie", "req.headers.authorization", 'res.headers["set-cookie"]'], remove: true },
});

const build = await import(path.resolve("build/server/index.js"));
const entry = build.entry.module;
await entry.prepareServer();

const app = express();
app.disable("x-powered-by");
app.set("trust proxy", process.env.TRUST_PROXY ?? "loopback");
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
    serializers: {
      req: (req) => ({ id: req.id, method: req.method, url: req.url?.split("?")[0] }),
      res: (res) => ({ statusCode: res.statusCode }),
    },
    autoLogging: { ignore: (req) => req.url?.startsWith("/assets/") ?? false },
  }),
);
// The only client address the app trusts: from the socket, or from proxies named in TRUST_PROXY.
app.use((req, _res, next) => {
  req.headers["x-sinewright-client-ip"] = req.ip ?? "";
  next();
});
app.use("/assets", express.static("build/client/assets", { immutable: true, maxAge: "1y" }));
app.use(express.static("build/client", { maxAge: "1h", index: false }));
app.use(express.static("public", { maxAge: "1h", index: false }));
app.all("*splat", createRequestHandler({ build, mode: process.env.NODE_ENV }));

const port = Number(process.env.PORT ?? 3000);
const host = process.env.HOST ?? "127.0.0.1";
const server = app.listen(port, host, () => {
  logger.info({ url: `http://${host === "0.0.0.0" ? "localhost" : host}:${port}` }, "Sinewright is serving");
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
