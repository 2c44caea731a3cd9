import { attachmentLimitBytes } from "./attachments";

/** Sign-in, sign-up, password reset, invitations: a few short fields. */
const AUTH_BODY_BYTES = 16 * 1024;
/** The editors post a whole source (at most 200 KB of text, URL-encoded: up to 9 bytes a character). */
const EDITOR_BODY_BYTES = 2 * 1024 * 1024;
/** The evaluate API: a sheet's blocks as JSON. */
const EVALUATE_BODY_BYTES = 1024 * 1024;
/** Every other form and JSON body. */
const FORM_BODY_BYTES = 256 * 1024;

const AUTH_PATHS = /^\/(sign-in|sign-up|sign-out|forgot-password|reset-password|invitations\/[^/]+|api\/auth\/.*)$/;
const EDITOR_PATHS = /^\/(sheets\/[^/]+\/edit|documents\/[^/]+\/edit|sheets\/new|documents\/new)$/;
const EVALUATE_PATHS = /^\/api\/v1\/(evaluate|calculators\/[^/]+\/evaluate)$/;
const ATTACHMENT_UPLOAD = /^\/api\/v1\/sheets\/[^/]+\/attachments$/;

/**
 * The most bytes a request body to this path may have. The attachment limit applies only to
 * the attachment upload (twice over: after refusing a file the upload reads the rest of the body
 * and drops it, so the client gets the message rather than a reset connection).
 */
export function bodyLimitFor(pathname: string): number {
  if (ATTACHMENT_UPLOAD.test(pathname)) return 2 * attachmentLimitBytes();
  // A page's form posts to its `.data` URL when the page is already loaded.
  const page = pathname.replace(/\.data$/, "");
  if (AUTH_PATHS.test(page)) return AUTH_BODY_BYTES;
  if (EDITOR_PATHS.test(page)) return EDITOR_BODY_BYTES;
  if (EVALUATE_PATHS.test(page)) return EVALUATE_BODY_BYTES;
  return FORM_BODY_BYTES;
}
