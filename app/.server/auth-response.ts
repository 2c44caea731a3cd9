/** Copies better-auth's Set-Cookie headers onto the response a route returns. */
export function cookiesFrom(response: Response): Headers {
  const headers = new Headers();
  for (const cookie of response.headers.getSetCookie()) headers.append("Set-Cookie", cookie);
  return headers;
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
