import { PassThrough } from "node:stream";
import { randomBytes } from "node:crypto";
import { createReadableStreamFromReadable } from "@react-router/node";
import { isbot } from "isbot";
import { renderToPipeableStream } from "react-dom/server";
import { ServerRouter, type EntryContext, type HandleErrorFunction } from "react-router";
import { loggableError, logger } from "./.server/logger";
import { currentRequestLog, redactUrl } from "./.server/request-log";
import { pagePolicy } from "./.server/security-headers";

export const streamTimeout = 5_000;

/**
 * Pages and data answers are made for the person asking: no shared cache may keep them, and a
 * browser keeps none either (back and forward still work). A route that sets its own says so.
 */
function keepPrivate(headers: Headers): void {
  if (!headers.has("Cache-Control")) headers.set("Cache-Control", "private, no-store");
}

export default function handleRequest(request: Request, responseStatusCode: number, responseHeaders: Headers, routerContext: EntryContext) {
  // One nonce per response: the framework's own inline scripts carry it; nothing else may run inline.
  const nonce = randomBytes(16).toString("base64");
  responseHeaders.set("Content-Security-Policy", pagePolicy(nonce));
  keepPrivate(responseHeaders);
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

export function handleDataRequest(response: Response) {
  keepPrivate(response.headers);
  return response;
}

/** Unexpected errors in loaders and actions: one JSON log line, without query parameters or secrets. Aborted requests are not errors. */
export const handleError: HandleErrorFunction = (error, { request }) => {
  if (request.signal.aborted) return;
  logger().error({ err: loggableError(error), url: redactUrl(request.url), reqId: currentRequestLog()?.requestId }, "unexpected error while answering a request");
};
