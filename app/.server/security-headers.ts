import { config } from "./config";

/**
 * Headers on every response. The CSP allows scripts only from our origin plus the
 * framework's inline bootstrap carrying this response's nonce: no `unsafe-eval`.
 * Inline style attributes are allowed because KaTeX positions glyphs with them.
 */
export function applySecurityHeaders(headers: Headers, options: { nonce?: string; html: boolean }): void {
  const dev = process.env.NODE_ENV === "development";
  if (options.html) {
    const scriptSrc = options.nonce ? `'self' 'nonce-${options.nonce}'` : "'self'";
    const csp = [
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
    headers.set("Content-Security-Policy", csp);
  }
  headers.set("X-Content-Type-Options", "nosniff");
  headers.set("Referrer-Policy", "strict-origin-when-cross-origin");
  headers.set("X-Frame-Options", "DENY");
  if (config().APP_URL.startsWith("https://")) headers.set("Strict-Transport-Security", "max-age=31536000; includeSubDomains");
}
