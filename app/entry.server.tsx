import { PassThrough } from "node:stream";
import { randomBytes } from "node:crypto";
import { createReadableStreamFromReadable } from "@react-router/node";
import { isbot } from "isbot";
import { renderToPipeableStream } from "react-dom/server";
import { ServerRouter, type EntryContext, type HandleErrorFunction } from "react-router";
import { loggableError, logger } from "./.server/logger";
import { currentRequestLog, redactUrl } from "./.server/request-log";
import { applySecurityHeaders, isSecureRequest, securityHeaders } from "./.server/security-headers";
import { startBackgroundWork, stopBackgroundWork } from "./.server/lifecycle";

export const streamTimeout = 5_000;

/** Called by server.js before it listens: migrations and the outbox worker. */
export { startBackgroundWork as prepareServer, stopBackgroundWork as stopServer };
/** For server.js: the validated settings, what its request log lines say, and every response's security headers. */
export { config as serverConfig, ConfigError } from "./.server/config";
export { logger } from "./.server/logger";
export { redactUrl, runWithRequestLog } from "./.server/request-log";
export { securityHeaders };

export default function handleRequest(request: Request, responseStatusCode: number, responseHeaders: Headers, routerContext: EntryContext) {
  // One nonce per response: the framework's own inline scripts carry it; nothing else may run inline.
  const nonce = randomBytes(16).toString("base64");
  applySecurityHeaders(responseHeaders, { nonce, html: true, secure: isSecureRequest(request) });
  return new Promise((resolve, reject) => {
    let shellRendered = false;
    const userAgent = request.headers.get("user-agent");
    const readyOption = (userAgent && isbot(userAgent)) || routerContext.isSpaMode ? "onAllReady" : "onShellReady";
    const { pipe, abort } = renderToPipeableStream(<ServerRouter context={routerContext} url={request.url} nonce={nonce} />, {
      nonce,
      [readyOption]() {
        shellRendered = true;
        const body = new PassThrough();
        const stream = createReadableStreamFromReadable(body);
        responseHeaders.set("Content-Type", "text/html; charset=utf-8");
        resolve(new Response(stream, { headers: responseHeaders, status: responseStatusCode }));
        pipe(body);
      },
      onShellError(error: unknown) {
        reject(error);
      },
      onError(error: unknown) {
        responseStatusCode = 500;
        // A client that went away mid-page (closed tab, a benchmark's last connections) is not a server error.
        if (shellRendered && !request.signal.aborted) logger().error({ err: loggableError(error), url: redactUrl(request.url) }, "rendering failed after the page started");
      },
    });
    setTimeout(abort, streamTimeout + 1000);
  });
}

export function handleDataRequest(response: Response, { request }: { request: Request }) {
  applySecurityHeaders(response.headers, { html: false, secure: isSecureRequest(request) });
  return response;
}

/** Unexpected errors in loaders and actions: one JSON log line, without query parameters or secrets. Aborted requests are not errors. */
export const handleError: HandleErrorFunction = (error, { request }) => {
  if (request.signal.aborted) return;
  logger().error({ err: loggableError(error), url: redactUrl(request.url), reqId: currentRequestLog()?.requestId }, "unexpected error while answering a request");
};
