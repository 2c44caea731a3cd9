/**
 * The Content-Security-Policy of pages: scripts only from our origin plus the framework's
 * inline bootstrap carrying this response's nonce, no `unsafe-eval`. Inline style attributes
 * are allowed because KaTeX positions glyphs with them. entry.server.tsx sets it on every page;
 * the other headers (and the closed policy below for everything else) come from server/app.ts.
 */
export function pagePolicy(nonce: string): string {
  const dev = process.env.NODE_ENV === "development";
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}'`,
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

/** Everything that is not a page (JSON, files, redirects, errors) may load nothing and be framed by nobody. */
export const NON_PAGE_POLICY = "default-src 'none'; frame-ancestors 'none'";
