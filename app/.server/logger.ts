import pino from "pino";
import { config } from "./config";

let instance: pino.Logger | undefined;

/**
 * The one logger: JSON lines on stdout at LOG_LEVEL, used by server.js for request
 * lines and by the app for unexpected errors. Paths that could hold credentials are
 * censored even if a future call passes them.
 */
export function logger(): pino.Logger {
  instance ??= pino({
    level: config().LOG_LEVEL,
    redact: {
      paths: ["req.headers.cookie", "req.headers.authorization", 'res.headers["set-cookie"]', "*.password", "*.token", "*.secret", "*.params"],
      censor: "[redacted]",
    },
  });
  return instance;
}

/**
 * An error as a log line may show it: type, message, code and cause, but never the
 * bound parameters a failed query carries (a session token, a password hash).
 */
export function loggableError(error: unknown, depth = 0): Record<string, unknown> {
  if (!(error instanceof Error)) return { message: String(error) };
  const withoutParams = (text: string) => text.split(/\nparams:/)[0]!;
  const code = (error as { code?: unknown }).code;
  return {
    type: error.name,
    message: withoutParams(error.message),
    ...(typeof code === "string" ? { code } : {}),
    stack: error.stack ? withoutParams(error.stack).split("\n").slice(0, 8).join("\n") : undefined,
    ...(error.cause !== undefined && depth < 3 ? { cause: loggableError(error.cause, depth + 1) } : {}),
  };
}
