import type { z } from "zod";
import { HARDWARE_CAUTION } from "~/lib/cautions";

/** An API answer that carries results also carries the safety caution, as the pages do. */
export function withCaution<T extends object>(body: T): T & { caution: string } {
  return { ...body, caution: HARDWARE_CAUTION };
}

export function resultsJson(body: object, init?: ResponseInit): Response {
  return Response.json(withCaution(body), init);
}

/** The one shape of an API error: a sentence, and per-field messages where there are fields. */
export function apiError(status: number, error: string, fieldErrors?: { field: string; message: string }[]): Response {
  return Response.json(fieldErrors ? { error, fieldErrors } : { error }, { status });
}

/** Reads and validates a JSON body; throws a 400 that says what to fix. Never lets junk reach the engine. */
export async function readJson<T extends z.ZodType>(request: Request, schema: T): Promise<z.infer<T>> {
  const type = request.headers.get("content-type") ?? "";
  if (!type.includes("application/json")) throw apiError(415, "Send the body as JSON with `Content-Type: application/json`.");
  // Its size was capped before anything read it (body-limits.ts).
  const text = await request.text();
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch {
    throw apiError(400, "The body is not valid JSON.");
  }
  const parsed = schema.safeParse(body);
  if (!parsed.success) throw apiError(400, "The request body does not have the expected shape.", issueList(parsed.error, "body"));
  return parsed.data;
}

/** Reads the query string with a schema; an over-long or malformed parameter is a 400 that names it, never a 500. */
export function readQuery<T extends z.ZodType>(request: Request, schema: T, message?: string): z.infer<T> {
  const parsed = schema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw apiError(400, message ?? parsed.error.issues[0]?.message ?? "A query parameter is not valid.", issueList(parsed.error, "query"));
  return parsed.data;
}

function issueList(error: z.ZodError, whole: string): { field: string; message: string }[] {
  return error.issues.map((issue) => ({ field: issue.path.join(".") || whole, message: issue.message }));
}

export function methodNotAllowed(allowed: string): Response {
  return Response.json({ error: `Use ${allowed} on this endpoint.` }, { status: 405, headers: { Allow: allowed } });
}
