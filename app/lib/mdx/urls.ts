/** Which link targets an author may use: web and mail addresses, and places within the app. */

const ALLOWED_SCHEMES = new Set(["http", "https", "mailto"]);

/** The scheme a browser would read, ignoring what it ignores (leading blanks, tabs and newlines inside). */
function schemeOf(url: string): string | undefined {
  const squeezed = url.replace(/^[\u0000-\u0020]+/, "").replace(/[\t\n\r]/g, "");
  return /^([A-Za-z][A-Za-z0-9+.-]*):/.exec(squeezed)?.[1]?.toLowerCase();
}

/** Why a link target is refused, or undefined when it is fine. */
export function urlProblem(url: string): string | undefined {
  const scheme = schemeOf(url);
  if (scheme === undefined || ALLOWED_SCHEMES.has(scheme)) return undefined;
  return "Links may point only to web addresses (http, https), mail addresses (mailto) or pages of this app.";
}

/** Links that leave the app, which open without handing it the referrer or the window. */
export function isExternalUrl(url: string): boolean {
  const scheme = schemeOf(url);
  // Browsers read a backslash as "/" here, so "/\host" and "\\host" leave the app too.
  return scheme === "http" || scheme === "https" || /^[\u0000-\u0020]*[\\/][\\/]/.test(url);
}
