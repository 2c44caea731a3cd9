// The redirect after sign-in must never leave the app: each shape below is a known way
// to make a browser read a path as another host (the OWASP "Unvalidated Redirects and
// Forwards" cheat sheet lists the slash, backslash and whitespace tricks).
import { describe, expect, it } from "vitest";
import { safeNext } from "~/lib/forms/account";

const APP_URL = "https://calc.example.com";

describe("safeNext", () => {
  it.each([
    ["/sheets/CS-0004", "/sheets/CS-0004"],
    ["/search?q=dead%20time&page=2", "/search?q=dead%20time&page=2"],
    ["/invitations/abc#join", "/invitations/abc#join"],
    ["/sheets/../team", "/team"],
  ])("keeps the same-origin path %s", (next, expected) => {
    expect(safeNext(next, APP_URL)).toBe(expected);
  });

  it.each([
    "/\t/evil.example",
    "/%09/evil.example",
    "/\n/evil.example",
    "/%0a/evil.example",
    "/%0D%0A/evil.example",
    "//evil.example",
    "///evil.example",
    "/\\evil.example",
    "\\/evil.example",
    "/%5Cevil.example",
    "/%2F%2Fevil.example",
    "/%2f/evil.example",
    "/ /evil.example",
    "/\u00a0/evil.example",
    "/\u0000/evil.example",
    "javascript:alert(1)",
    "https://evil.example/",
    "http:evil.example",
    "evil.example",
    "",
    "/%E0%A4%A",
  ])("refuses %j", (next) => {
    expect(safeNext(next, APP_URL)).toBe("/sheets");
  });

  it("answers the fallback given for a refused or missing target", () => {
    expect(safeNext(undefined, APP_URL, "/teams/new")).toBe("/teams/new");
    expect(safeNext(["/sheets"], APP_URL, "/teams/new")).toBe("/teams/new");
    expect(safeNext("//evil.example", APP_URL, "/teams/new")).toBe("/teams/new");
  });
});
