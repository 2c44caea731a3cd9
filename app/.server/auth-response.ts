/** Copies better-auth's Set-Cookie headers onto the response a route returns. */
export function cookiesFrom(response: Response): Headers {
  const headers = new Headers();
  for (const cookie of response.headers.getSetCookie()) headers.append("Set-Cookie", cookie);
  return headers;
}

import type { HeadersFunction } from "react-router";

/** A page answers its form's 429 with the Retry-After its action set (routes: `export const headers = actionRetryAfter`). */
export const actionRetryAfter: HeadersFunction = ({ actionHeaders }) => {
  const retryAfter = actionHeaders.get("Retry-After");
  return retryAfter ? { "Retry-After": retryAfter } : new Headers();
};

/** The wait better-auth asks for on a 429, for the page's own Retry-After. */
export function retryAfterHeaders(response: Response): HeadersInit {
  return { "Retry-After": response.headers.get("retry-after") ?? "60" };
}

/** better-auth answers errors as JSON { message, code }; turn them into words for a form. */
export async function authErrorMessage(response: Response, fallback: string): Promise<string> {
  if (response.status === 429) return "Too many attempts. Wait a minute, then try again.";
  try {
    const body = (await response.json()) as { message?: string; code?: string };
    return body.message ?? fallback;
  } catch {
    return fallback;
  }
}
