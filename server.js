// Starts Sinewright's HTTP server: the Express app of server/app.ts, from Vite in development
// (`npm run dev`, NODE_ENV=development) or from the build in production; settings are checked
// and the database prepared before it listens, and SIGTERM stops it gracefully.

// React and the framework pick their production builds from NODE_ENV when first loaded, so it is
// settled before anything imports them (the development builds are several times slower).
process.env.NODE_ENV ??= "production";
const development = process.env.NODE_ENV === "development";

const vite = development ? await (await import("vite")).createServer({ server: { middlewareMode: true } }) : undefined;
const server = vite ? await vite.ssrLoadModule("./server/app.ts") : await import("./build/server/index.js");

// Settings first: a bad one stops here with a message naming it (values are never printed).
let settings;
try {
  settings = server.serverConfig();
} catch (error) {
  if (error?.name !== "ConfigError") throw error;
  process.stderr.write(`${error.message}\n`);
  process.exit(1);
}

const logger = server.logger();

try {
  await server.prepareServer();
} catch (error) {
  // Typically the database: unreachable, wrong password, or missing. pg's messages never contain the password.
  logger.fatal({ err: { message: error?.message, code: error?.code } }, "cannot start: preparing the database failed (check DATABASE_URL and that PostgreSQL is running)");
  process.exit(1);
}

const { HOST: host, PORT: port } = settings;
const app = server.createApp({ viteMiddleware: vite?.middlewares });
const listening = app.listen(port, host, () => {
  logger.info({ url: `http://${host === "0.0.0.0" ? "localhost" : host}:${port}` }, "Sinewright is serving");
});
listening.on("error", (error) => {
  logger.fatal({ err: { message: error.message, code: error.code } }, `cannot listen on ${host}:${port} (check HOST and PORT)`);
  process.exit(1);
});

// Stop accepting, let requests in flight finish (idle keep-alive connections are closed at once), then stop the workers and the pool.
const { createHttpTerminator } = await import("http-terminator");
const terminator = createHttpTerminator({ server: listening, gracefulTerminationTimeout: 20_000 });
let stopping = false;
async function shutdown(signal) {
  if (stopping) return;
  stopping = true;
  logger.info({ signal }, "stopping: finishing requests in flight");
  await terminator.terminate();
  await vite?.close();
  await server.stopServer();
  logger.info("stopped");
  process.exit(0);
}
process.once("SIGTERM", () => void shutdown("SIGTERM"));
process.once("SIGINT", () => void shutdown("SIGINT"));
