import fc from "fast-check";
import type { z } from "zod";
import { beforeAll, describe, expect, it } from "vitest";
import { ACCESS_MATRIX, entryUrl } from "../support/access-matrix";
import { createApiKey, Visitor } from "../support/http";
import { appRoutes } from "../support/route-config";
import { arraysPastLimits, valuesPastLimits } from "../support/schema-limits";
import { evaluateBody } from "~/lib/forms/api";
import { blockQuery, searchQuery } from "~/lib/forms/search";

/**
 * Random JSON bodies, query strings and path values against every API route in
 * app/routes.ts (better-auth's own /api/auth/* aside), with a personal API key and with
 * a session: never a 5xx, always JSON, and every refusal a sentence saying what is wrong.
 */
const apiRoutes = appRoutes.filter((r) => r.pattern?.startsWith("/api/") && !r.pattern.startsWith("/api/auth/"));
const RUNS = 50;

/** Query keys the API reads, so random values reach the validation, plus random ones. */
const knownKeys = ["q", "verified", "project", "calculator", "author", "from", "to", "field", "min", "max", "page", "sort", "limit"];
const queryString = fc
  .dictionary(fc.oneof(fc.constantFrom(...knownKeys), fc.string({ maxLength: 8 })), fc.oneof(fc.string({ maxLength: 40 }), fc.string({ unit: "grapheme", maxLength: 20 }), fc.double().map(String), fc.constantFrom("1 kHz", "-1e400 V", "=qs1.v1Rms", "NaN", "")), { maxKeys: 5 })
  .map((fields) => new URLSearchParams(fields).toString());
// "." and ".." are left out: the URL itself would then name another path.
const pathValue = fc
  .oneof(fc.string({ minLength: 1, maxLength: 30 }), fc.string({ unit: "grapheme", minLength: 1, maxLength: 10 }), fc.constantFrom("CS-0001", "CS-99999", "quasi-square", "A", "Z", "0", "%"))
  .filter((value) => value !== "." && value !== "..");
/** JSON in the shapes the API expects, with random leaves, and plain random JSON. */
const leaf = fc.oneof(fc.string({ maxLength: 30 }), fc.double(), fc.integer(), fc.boolean(), fc.constant(null), fc.constantFrom("48 V", "30 deg", "=qs1.v1Rms", "1e308 V"));
const jsonBody = fc.oneof(
  fc.jsonValue({ maxDepth: 4 }),
  fc.record({ inputs: fc.dictionary(fc.constantFrom("vdc", "alpha", "l", "c", "fsw", "vout", "m"), leaf) }, { requiredKeys: [] }),
  fc.record({ blocks: fc.array(fc.record({ id: fc.oneof(fc.string({ maxLength: 6 }), leaf), calculator: fc.oneof(fc.constantFrom("quasi-square", "lc-filter", "spwm", "nope"), leaf), inputs: fc.dictionary(fc.string({ maxLength: 6 }), leaf) }, { requiredKeys: [] }), { maxLength: 4 }) }, { requiredKeys: [] }),
);

/** The schemas each route reads, whose limits the fuzzing goes past (a value over a limit once answered 500). */
const ROUTE_SCHEMAS: Record<string, { query?: z.ZodObject; body?: z.ZodObject }> = {
  "routes/api.v1.search": { query: searchQuery },
  "routes/api.v1.blocks": { query: blockQuery },
  "routes/api.v1.evaluate": { body: evaluateBody },
};

/** A valid query (the access matrix's) with one to three fields replaced by values past their limits. */
function queryPastLimits(baseQuery: string, schema: z.ZodObject) {
  const past = valuesPastLimits(schema);
  return fc
    .uniqueArray(fc.constantFrom(...Object.keys(past)), { minLength: 1, maxLength: 3 })
    .chain((keys) => fc.tuple(...keys.map((key) => past[key]!.map((value) => [key, value] as const))))
    .map((pairs) => {
      const params = new URLSearchParams(baseQuery);
      for (const [key, value] of pairs) params.set(key, value);
      return { params: params.toString(), keys: pairs.map(([key]) => key) };
    });
}

function withPathValues(pattern: string, values: string[]): string {
  let i = 0;
  return pattern.replace(/:[A-Za-z]+|\*/g, () => encodeURIComponent(values[i++] ?? "x"));
}

async function expectClearAnswer(response: Response, what: string) {
  expect(response.status, what).toBeLessThan(500);
  expect(response.headers.get("content-type") ?? "", what).toContain("application/json");
  const body = await response.json();
  if (response.status >= 400) {
    expect(typeof body.error, `${what}: ${JSON.stringify(body)}`).toBe("string");
    expect(body.error.length, what).toBeGreaterThan(10);
  }
}

describe("API fuzzing", () => {
  const callers: { name: string; visitor: Visitor; headers: Record<string, string> }[] = [];
  beforeAll(async () => {
    const engineer = await new Visitor().signIn("engineer@example.com");
    const key = await createApiKey(engineer, "fuzzing");
    callers.push({ name: "session", visitor: engineer, headers: {} }, { name: "API key", visitor: new Visitor(), headers: { authorization: `Bearer ${key}` } });
  });

  it("covers every API route in the route config", () => {
    expect(apiRoutes.map((r) => r.id)).toEqual(expect.arrayContaining(["routes/api.v1.evaluate", "routes/api.v1.search", "api-not-found"]));
  });

  it("finds every route named in ROUTE_SCHEMAS, and a limit in each of their schemas", () => {
    for (const id of Object.keys(ROUTE_SCHEMAS)) expect(apiRoutes.map((r) => r.id)).toContain(id);
    for (const schemas of Object.values(ROUTE_SCHEMAS)) {
      const limited = { ...(schemas.query ? valuesPastLimits(schemas.query) : {}), ...(schemas.body ? arraysPastLimits(schemas.body) : {}) };
      expect(Object.keys(limited).length).toBeGreaterThan(0);
    }
  });

  for (const route of apiRoutes) {
    const url = entryUrl(ACCESS_MATRIX[route.id]!, { invitationId: "none", attachmentId: "none" });
    const path = url.split("?")[0]!;
    const schemas = ROUTE_SCHEMAS[route.id];

    if (schemas?.query) {
      const schema = schemas.query;
      it(`${route.id}: query values past each limit of its schema get 400 naming the field`, async () => {
        await fc.assert(
          fc.asyncProperty(fc.constantFrom(...callers), queryPastLimits(url.split("?")[1] ?? "", schema), async (caller, { params, keys }) => {
            const response = await caller.visitor.get(`${path}?${params}`, caller.headers);
            const what = `${caller.name} GET ${path}?${params}`;
            await expectClearAnswer(response.clone(), what);
            // Only limits that refuse (not those that fall back) must answer 400.
            const refused = keys.filter((key) => !schema.shape[key]!.safeParse(new URLSearchParams(params).get(key)!).success);
            if (refused.length > 0) {
              expect(response.status, what).toBe(400);
              const body = await response.json();
              expect(body.fieldErrors?.map((f: { field: string }) => f.field), what).toEqual(expect.arrayContaining([expect.stringMatching(new RegExp(`^(${refused.join("|")})$`))]));
            }
          }),
          { numRuns: RUNS },
        );
      });
    }

    if (schemas?.body) {
      const past = arraysPastLimits(schemas.body);
      it(`${route.id}: JSON lists past the schema's limits get 400`, async () => {
        for (const [key, values] of Object.entries(past)) {
          await fc.assert(
            fc.asyncProperty(fc.constantFrom(...callers), values, async (caller, list) => {
              const response = await caller.visitor.postJson(path, { [key]: list }, caller.headers);
              expect(response.status).toBe(400);
              await expectClearAnswer(response, `${caller.name} POST ${path} with ${list.length} ${key}`);
            }),
            { numRuns: 4 },
          );
        }
      });
    }

    it(`${route.id}: random JSON bodies`, async () => {
      await fc.assert(
        fc.asyncProperty(fc.constantFrom(...callers), jsonBody, async (caller, body) => {
          const response = await caller.visitor.postJson(path, body, caller.headers);
          await expectClearAnswer(response, `${caller.name} POST ${path} ${JSON.stringify(body)}`);
        }),
        { numRuns: RUNS },
      );
    });

    it(`${route.id}: random bodies that are not JSON at all`, async () => {
      await fc.assert(
        fc.asyncProperty(fc.constantFrom(...callers), fc.string({ maxLength: 60 }), fc.constantFrom("application/json", "text/plain", "application/x-www-form-urlencoded"), async (caller, text, type) => {
          const response = await caller.visitor.request(path, { method: "POST", body: text, headers: { ...caller.headers, "content-type": type } });
          await expectClearAnswer(response, `${caller.name} POST ${path} (${type}) ${JSON.stringify(text)}`);
        }),
        { numRuns: RUNS },
      );
    });

    it(`${route.id}: random query strings and path values`, async () => {
      const params = (route.pattern!.match(/:[A-Za-z]+|\*/g) ?? []).length;
      await fc.assert(
        fc.asyncProperty(fc.constantFrom(...callers), queryString, fc.array(pathValue, { minLength: params, maxLength: params }), async (caller, query, values) => {
          const target = `${params > 0 ? withPathValues(route.pattern!, values) : path}?${query}`;
          const response = await caller.visitor.get(target, caller.headers);
          await expectClearAnswer(response, `${caller.name} GET ${target}`);
        }),
        { numRuns: RUNS },
      );
    });
  }
});
