import { spawn, type ChildProcess } from "node:child_process";
import net from "node:net";
import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");

/** A random secret of the length the server asks for; tests look for it in the output. */
export function testSecret(): string {
  return `test-secret-${crypto.randomUUID()}-${crypto.randomUUID()}`.slice(0, 48);
}

export function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const probe = net.createServer().listen(0, "127.0.0.1", () => {
      const { port } = probe.address() as net.AddressInfo;
      probe.close(() => resolve(port));
    });
  });
}

export interface SpawnedServer {
  url: string;
  child: ChildProcess;
  /** Everything it printed so far, stdout and stderr together. */
  output(): string;
  /** Its JSON log lines (pino) so far. */
  logLines(): Record<string, unknown>[];
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  stop(): Promise<void>;
}

/**
 * Starts the built server (`node server.js`, as in production) as a separate process
 * with exactly the environment given (plus PATH and HOME), output captured. With
 * `waitUntilReady`, resolves once /healthz answers 200.
 */
export async function spawnServer(env: Record<string, string | undefined>, { waitUntilReady = true } = {}): Promise<SpawnedServer> {
  const port = env.PORT ?? String(await freePort());
  const url = `http://127.0.0.1:${port}`;
  const child = spawn(process.execPath, ["server.js"], {
    cwd: root,
    env: { PATH: process.env.PATH, HOME: process.env.HOME, APP_URL: url, HOST: "127.0.0.1", ...env, PORT: port },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let printed = "";
  child.stdout!.on("data", (chunk) => (printed += chunk));
  child.stderr!.on("data", (chunk) => (printed += chunk));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.once("exit", (code, signal) => resolve({ code, signal })));
  const server: SpawnedServer = {
    url,
    child,
    output: () => printed,
    logLines: () =>
      printed
        .split("\n")
        .filter((line) => line.startsWith("{"))
        .map((line) => JSON.parse(line) as Record<string, unknown>),
    exited,
    async stop() {
      if (child.exitCode === null && child.signalCode === null) child.kill("SIGTERM");
      await exited;
    },
  };
  if (waitUntilReady) {
    const deadline = Date.now() + 30_000;
    for (;;) {
      if (child.exitCode !== null) throw new Error(`the server exited with ${child.exitCode} before it was ready:\n${printed}`);
      const ok = await fetch(`${url}/healthz`).then((r) => r.ok, () => false);
      if (ok) break;
      if (Date.now() > deadline) {
        await server.stop();
        throw new Error(`the server did not answer /healthz within 30 s:\n${printed}`);
      }
      await new Promise((r) => setTimeout(r, 150));
    }
  }
  return server;
}

/** The cookie header a JSON sign-up through better-auth leaves, for requests as that new user. */
export async function signUpThroughApi(url: string, email: string, password: string): Promise<string> {
  const response = await fetch(`${url}/api/auth/sign-up/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: url },
    body: JSON.stringify({ email, password, name: "Test Person" }),
  });
  if (!response.ok) throw new Error(`sign-up answered ${response.status}: ${await response.text()}`);
  // Sign-up signs nobody in (it answers the same for a taken address); the password does.
  const signIn = await fetch(`${url}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: url },
    body: JSON.stringify({ email, password }),
  });
  if (!signIn.ok) throw new Error(`sign-in answered ${signIn.status}: ${await signIn.text()}`);
  return signIn.headers
    .getSetCookie()
    .map((line) => line.split(";")[0])
    .join("; ");
}

/** A new account that starts its own team (as its admin), through the server's pages; returns its cookie header. */
export async function signUpWithTeamThroughApi(url: string, label: string): Promise<string> {
  const cookie = await signUpThroughApi(url, `${label}-${Date.now().toString(36)}@example.org`, "pw-correct-horse-battery");
  const response = await fetch(`${url}/teams/new`, { method: "POST", headers: { cookie, origin: url }, body: new URLSearchParams({ name: `Team ${label}` }), redirect: "manual" });
  if (response.status !== 302) throw new Error(`creating a team answered ${response.status}`);
  return cookie;
}
