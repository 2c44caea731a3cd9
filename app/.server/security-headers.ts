import { config } from "./config";

export interface SecurityHeaderOptions {
  /** The request came over TLS (directly, or through a trusted proxy's X-Forwarded-Proto). */
  secure: boolean;
  /** Pages get the full Content-Security-Policy with this response's nonce. */
  nonce?: string;
  html: boolean;
}

/**
 * The headers every response carries. server.js sets them on everything it
 * answers (static files, JSON, redirects, errors); entry.server adds the page
 * policy with its nonce. The page CSP allows scripts only from our origin plus
 * the framework's inline bootstrap carrying the nonce: no `unsafe-eval`. Inline
 * style attributes are allowed because KaTeX positions glyphs with them.
 */
export function securityHeaders(options: SecurityHeaderOptions): Record<string, string> {
  const headers: Record<string, string> = {
    "Content-Security-Policy": options.html ? pagePolicy(options.nonce ? [`'nonce-${options.nonce}'`] : []) : "default-src 'none'; frame-ancestors 'none'",
    "X-Content-Type-Options": "nosniff",
    "Referrer-Policy": "strict-origin-when-cross-origin",
    "X-Frame-Options": "DENY",
  };
  if (options.secure || config().APP_URL.startsWith("https://")) headers["Strict-Transport-Security"] = "max-age=31536000; includeSubDomains";
  return headers;
}

function pagePolicy(inlineScripts: string[]): string {
  const dev = process.env.NODE_ENV === "development";
  const scriptSrc = ["'self'", ...inlineScripts].join(" ");
  return [
    "default-src 'self'",
    `script-src ${scriptSrc}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self' data:",
    dev ? "connect-src 'self' ws: wss:" : "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

export function applySecurityHeaders(headers: Headers, options: SecurityHeaderOptions): void {
  for (const [name, value] of Object.entries(securityHeaders(options))) headers.set(name, value);
}

export function isSecureRequest(request: Request): boolean {
  return new URL(request.url).protocol === "https:";
}
