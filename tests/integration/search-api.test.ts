import { describe, expect, it } from "vitest";
import { signUpWithTeam, Visitor } from "../support/http";

describe("search API and page", () => {
  it("answers anonymous callers 401 and finds demo sheets by value and calculator for members", async () => {
    expect((await new Visitor().get("/api/v1/search?q=filter")).status).toBe(401);
    const viewer = await new Visitor().signIn("viewer@example.com");
    const byValue = await (await viewer.get(`/api/v1/search?q=${encodeURIComponent("fsw 40 kHz")}`)).json();
    expect(byValue.total).toBeGreaterThan(0);
    // A value named by its input means that input's value: the bridge sheet switches at 20 kHz, the filter at 40 kHz.
    const at20 = await (await viewer.get(`/api/v1/search?q=${encodeURIComponent("fsw 20 kHz")}`)).json();
    expect(at20.hits.map((h: { title: string }) => h.title)).toContain("Bridge switches: IGBT and SiC MOSFET losses");
    expect(at20.hits.map((h: { title: string }) => h.title)).not.toContain("Output LC filter and bench harmonics");
    expect(byValue.hits.map((h: { title: string }) => h.title)).toContain("Output LC filter and bench harmonics");
    const hit = byValue.hits.find((h: { title: string }) => h.title === "Output LC filter and bench harmonics");
    expect(hit.snippet.some((part: { hit: boolean }) => part.hit)).toBe(true);
    expect(hit.state).toBe("verified");

    const verified = await (await viewer.get(`/api/v1/search?q=${encodeURIComponent("quasi-square")}&verified=1`)).json();
    expect(verified.hits.every((h: { state: string }) => h.state === "verified")).toBe(true);

    // A viewer gets results but the page offers no edit actions.
    const page = await (await viewer.get(`/search?q=${encodeURIComponent("dc link")}`)).text();
    expect(page).toContain("DC-link capacitor bank and discharge");
    expect(page).not.toContain("Edit — new revision");
  });

  it("never returns another team's sheets", async () => {
    const outsider = await signUpWithTeam("search-outsider");
    const result = await (await outsider.visitor.get(`/api/v1/search?q=${encodeURIComponent("inverter")}`)).json();
    expect(result.hits).toEqual([]);
    const blocks = await (await outsider.visitor.get(`/api/v1/blocks?calculator=lc-filter&field=f0&min=${encodeURIComponent("1 kHz")}&max=${encodeURIComponent("3 kHz")}`)).json();
    expect(blocks.blocks).toEqual([]);
  });

  it("finds lc-filter blocks with f0 between 1 kHz and 3 kHz, and explains a bad bound", async () => {
    const engineer = await new Visitor().signIn("engineer@example.com");
    const response = await engineer.get(`/api/v1/blocks?calculator=lc-filter&field=f0&of=results&min=${encodeURIComponent("1 kHz")}&max=${encodeURIComponent("3 kHz")}`);
    expect(response.status).toBe(200);
    const { blocks } = await response.json();
    // The demo's two filter sheets: 1.45 kHz (PUMP-3K) and 1.98 kHz (GPU-400); both in range.
    const f0s = blocks.map((b: { values: { f0: number } }) => b.values.f0);
    expect(f0s.length).toBeGreaterThanOrEqual(2);
    expect(f0s.every((f: number) => f >= 1000 && f <= 3000)).toBe(true);
    const narrow = await (await engineer.get(`/api/v1/blocks?calculator=lc-filter&field=f0&min=${encodeURIComponent("1.9 kHz")}&max=${encodeURIComponent("2.1 kHz")}`)).json();
    expect(narrow.blocks.map((b: { title: string }) => b.title)).toEqual(["400 Hz output LC filter"]);
    const bad = await engineer.get(`/api/v1/blocks?calculator=lc-filter&field=f0&min=${encodeURIComponent("5 V")}`);
    expect(bad.status).toBe(400);
    expect((await bad.json()).error).toMatch(/frequency/);
  });

  it("answers a search past 200 characters with a clear message on the page and the API, never a 500", async () => {
    const viewer = await new Visitor().signIn("viewer@example.com");
    const long = "inverter ".repeat(23).slice(0, 201);
    const api = await viewer.get(`/api/v1/search?q=${encodeURIComponent(long)}`);
    expect(api.status).toBe(400);
    expect(await api.json()).toMatchObject({ error: "Keep the search to 200 characters or fewer.", fieldErrors: [{ field: "q" }] });
    const page = await viewer.get(`/search?q=${encodeURIComponent(long)}`);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("Keep the search to 200 characters or fewer.");
    expect(html).toContain('aria-invalid="true"');
    const blocks = await viewer.get(`/api/v1/blocks?calculator=lc-filter&field=${"f".repeat(41)}`);
    expect(blocks.status).toBe(400);
    expect((await blocks.json()).fieldErrors).toContainEqual({ field: "field", message: "No input or result has a name that long." });
  });
});
