import { describe, expect, it } from "vitest";
import { createApiKey, signUpWithTeam, Visitor } from "../support/http";
import { expectClose } from "../support/tolerance";
import { HARDWARE_CAUTION } from "../../app/lib/cautions";

const evaluatePath = (id: string) => `/api/v1/calculators/${id}/evaluate`;

describe("engine API", () => {
  it("answers anonymous callers 401 with JSON, on every endpoint", async () => {
    const anonymous = new Visitor();
    for (const [method, path] of [
      ["GET", "/api/v1/calculators"],
      ["POST", evaluatePath("quasi-square")],
      ["POST", "/api/v1/evaluate"],
    ] as const) {
      const response = method === "GET" ? await anonymous.get(path) : await anonymous.postJson(path, { inputs: {} });
      expect(response.status, path).toBe(401);
      expect((await response.json()).error).toMatch(/Sign in/);
    }
  });

  it("lists every calculator with its public id, units, ranges and defaults", async () => {
    const viewer = await new Visitor().signIn("viewer@example.com");
    const response = await viewer.get("/api/v1/calculators");
    expect(response.status).toBe(200);
    const body = await response.json();
    expect(body.engineVersion).toMatch(/^\d+\.\d+\.\d+$/);
    expect(body.calculators.map((c: { id: string }) => c.id).sort()).toEqual(
      ["dc-link", "formula", "half-bridge", "harmonic-limits", "lc-filter", "quasi-square", "six-step", "spwm", "stepped-wave", "switch-stress", "three-phase-pwm", "harmonic-elimination", "inductor-ripple", "losses-thermal", "lcl-filter", "dead-time"].sort(),
    );
    const quasiSquare = body.calculators.find((c: { id: string }) => c.id === "quasi-square");
    const alpha = quasiSquare.inputs.find((i: { key: string }) => i.key === "alpha");
    expect(alpha).toMatchObject({ kind: "quantity", dimension: "angle", min: 0, max: 90 });
    expect(quasiSquare.outputs.map((o: { key: string }) => o.key)).toEqual(
      expect.arrayContaining(["vrms", "v1Peak", "v1Rms", "thd", "thd40", "thd50", "harmonics", "alphaMinThd", "thdMin"]),
    );
  });

  it("evaluates a square wave to the textbook fundamental: V1,rms = (2√2/π)·Vdc", async () => {
    // Mohan, Undeland & Robbins, Power Electronics, 3rd ed., ch. 8: square wave fundamental RMS 0.900316·Vdc (published).
    const engineer = await new Visitor().signIn("engineer@example.com");
    const response = await engineer.postJson(evaluatePath("quasi-square"), { inputs: { vdc: "0.12 kV", alpha: "0°" } });
    expect(response.status).toBe(200);
    const body = await response.json();
    expect(body.calculator).toBe("quasi-square");
    expectClose(body.results.v1Rms.value, 0.900316 * 120, { rel: 1e-6 }, "v1Rms");
    expect(body.results.v1Rms.unit).toBe("V");
    expectClose(body.results.thd.value, 48.3426, { abs: 1e-3 }, "thd (derived: √(π²/8 − 1))");
  });

  it("answers bad input with 400 and field errors that say what to fix", async () => {
    const engineer = await new Visitor().signIn("engineer@example.com");
    const wrongDimension = await engineer.postJson(evaluatePath("quasi-square"), { inputs: { vdc: "48 V", alpha: "5 V" } });
    expect(wrongDimension.status).toBe(400);
    expect(await wrongDimension.json()).toEqual({ error: "Some inputs need fixing.", fieldErrors: [{ field: "alpha", message: "alpha must be an angle; got 5 V" }] });

    const outOfRange = await engineer.postJson(evaluatePath("lc-filter"), { inputs: { l: "1 mH", c: "-10 uF", fsw: "20 kHz" } });
    expect(outOfRange.status).toBe(400);
    const body = await outOfRange.json();
    expect(body.fieldErrors[0].field).toBe("c");
    expect(body.fieldErrors[0].message).toMatch(/^c must be/);

    const unknown = await engineer.postJson(evaluatePath("flux-capacitor"), { inputs: {} });
    expect(unknown.status).toBe(404);

    const notJson = await engineer.request(evaluatePath("quasi-square"), { method: "POST", body: "vdc=48", headers: { "content-type": "text/plain" } });
    expect(notJson.status).toBe(415);
    const brokenJson = await engineer.request(evaluatePath("quasi-square"), { method: "POST", body: "{inputs:", headers: { "content-type": "application/json" } });
    expect(brokenJson.status).toBe(400);
    expect((await brokenJson.json()).error).toBe("The body is not valid JSON.");
    const wrongShape = await engineer.postJson(evaluatePath("quasi-square"), { inputs: ["48 V"] });
    expect(wrongShape.status).toBe(400);
    expect((await wrongShape.json()).fieldErrors[0].field).toBe("inputs");
    const wrongMethod = await engineer.get(evaluatePath("quasi-square"));
    expect(wrongMethod.status).toBe(405);
  });

  it("evaluates a sheet in dependency order and names a cycle instead of failing the sheet", async () => {
    const engineer = await new Visitor().signIn("engineer@example.com");
    const response = await engineer.postJson("/api/v1/evaluate", {
      blocks: [
        { id: "f1", calculator: "lc-filter", inputs: { l: "1 mH", c: "10 uF", rLoad: "10 ohm", fsw: "20 kHz", vout: "=qs1.v1Rms" } },
        { id: "qs1", calculator: "quasi-square", inputs: { vdc: "48 V", alpha: "30 deg" } },
        { id: "a", calculator: "formula", inputs: { expr: "b.value * 2" } },
        { id: "b", calculator: "formula", inputs: { expr: "a.value + 1 V" } },
      ],
    });
    expect(response.status).toBe(200);
    const body = await response.json();
    expect(body.order.indexOf("qs1")).toBeLessThan(body.order.indexOf("f1"));
    expect(body.blocks.f1.ok).toBe(true);
    // Erickson & Maksimović, Fundamentals of Power Electronics, 2nd ed., ch. 8 (chapter from memory): f0 = 1/(2π√(LC)) = 1591.55 Hz.
    expectClose(body.blocks.f1.results.f0.value, 1591.549, { rel: 1e-5 }, "f0");
    // Capacitor current at 50 Hz: Ic = V·2πfC with V the quasi-square fundamental (derived).
    expectClose(body.blocks.f1.results.icRms.value, body.blocks.qs1.results.v1Rms.value * 2 * Math.PI * 50 * 10e-6, { rel: 1e-9 }, "icRms");
    expect(body.blocks.a.ok).toBe(false);
    expect(body.blocks.a.errors[0].message).toMatch(/cycle/);
    expect(body.blocks.b.ok).toBe(false);
  });

  it("accepts a personal API key as a Bearer token until it is revoked", async () => {
    const owner = await signUpWithTeam("keys");
    const key = await createApiKey(owner.visitor, "bench script");
    const withKey = await fetch(new URL("/api/v1/calculators", process.env.SINEWRIGHT_TEST_URL), { headers: { authorization: `Bearer ${key}` } });
    expect(withKey.status).toBe(200);
    const evaluate = await fetch(new URL(evaluatePath("dc-link"), process.env.SINEWRIGHT_TEST_URL), {
      method: "POST",
      headers: { authorization: `Bearer ${key}`, "content-type": "application/json" },
      body: JSON.stringify({ inputs: { p: "3 kW", vdc: "400 V", f: "50 Hz", rippleVpp: "10 V" } }),
    });
    expect(evaluate.status).toBe(200);
    // Derived from the single-phase power ripple at 2f: C = P/(2π·f·Vdc·ΔVpp) = 3000/(2π·50·400·10) F.
    expectClose((await evaluate.json()).results.c.value, 3000 / (2 * Math.PI * 50 * 400 * 10), { rel: 1e-9 }, "c");

    const settings = await (await owner.visitor.get("/settings")).text();
    expect(settings).not.toContain(key);
    const keyId = settings.match(/name="keyId" value="([^"]+)"/)![1]!;
    const revoke = await owner.visitor.postForm("/settings", { intent: "revoke-key", keyId });
    expect(revoke.status).toBe(200);
    const after = await fetch(new URL("/api/v1/calculators", process.env.SINEWRIGHT_TEST_URL), { headers: { authorization: `Bearer ${key}` } });
    expect(after.status).toBe(401);
    const forged = await fetch(new URL("/api/v1/calculators", process.env.SINEWRIGHT_TEST_URL), { headers: { authorization: "Bearer swk_not-a-real-key" } });
    expect(forged.status).toBe(401);
  });

  it("answers unknown API paths with JSON 404", async () => {
    const response = await new Visitor().get("/api/v1/nothing-here");
    expect(response.status).toBe(404);
    expect((await response.json()).error).toMatch(/No such API endpoint/);
  });
});

describe("stable revision links", () => {
  it("returns a revision's inputs, results, state, hash and stamp as JSON, and 404 with a reason otherwise", async () => {
    const viewer = await new Visitor().signIn("viewer@example.com");
    const response = await viewer.get("/api/v1/sheets/CS-0002/revisions/B");
    expect(response.status).toBe(200);
    const body = await response.json();
    expect(body).toMatchObject({ sheet: "CS-0002", revision: "B", state: "verified", latest: true, integrity: { hashMatches: true, stampValid: true } });
    expect(body.contentHash).toMatch(/^[0-9a-f]{64}$/);
    expect(body.stamp.contentHash).toBe(body.contentHash);
    expect(body.blocks.find((b: { id: string }) => b.id === "dc1").inputs.rippleVpp).toBe("12 V");
    const older = await (await viewer.get("/api/v1/sheets/CS-0002/revisions/A")).json();
    expect(older).toMatchObject({ revision: "A", state: "returned", latest: false, stamp: null });
    expect((await viewer.get("/api/v1/sheets/CS-0002/revisions/Z")).status).toBe(404);
    expect((await viewer.get("/api/v1/sheets/CS-9999/revisions/A")).status).toBe(404);
    expect((await new Visitor().get("/api/v1/sheets/CS-0002/revisions/B")).status).toBe(401);
    const outsider = await signUpWithTeam("revision-outsider");
    expect((await outsider.visitor.get("/api/v1/sheets/CS-0002/revisions/B")).status).toBe(404);
  });

  it("sends the safety caution with every answer that carries results, and not with errors", async () => {
    const viewer = await new Visitor().signIn("viewer@example.com");
    const answers = {
      calculator: await viewer.postJson(evaluatePath("quasi-square"), { inputs: { vdc: "48 V", alpha: "30 deg" } }),
      sheet: await viewer.postJson("/api/v1/evaluate", { blocks: [{ id: "qs1", calculator: "quasi-square", inputs: { vdc: "48 V" } }] }),
      revision: await viewer.get("/api/v1/sheets/CS-0002/revisions/B"),
      blocks: await viewer.get("/api/v1/blocks?calculator=lc-filter&field=f0&min=1%20kHz&max=3%20kHz"),
      attachments: await viewer.get("/api/v1/sheets/CS-0002/attachments"),
    };
    for (const [name, response] of Object.entries(answers)) {
      expect(response.status, name).toBe(200);
      expect((await response.json()).caution, name).toBe(HARDWARE_CAUTION);
    }
    expect(HARDWARE_CAUTION).toMatch(/can kill/);
    const refused = await (await viewer.postJson(evaluatePath("quasi-square"), { inputs: { alpha: "5 V" } })).json();
    expect(refused.caution).toBeUndefined();
  });
});

describe("engine API: the same input messages as the sheet (issue #16)", () => {
  it("refuses a bare number for a dimensioned input, JSON number or string, with the readings spelled out", async () => {
    const engineer = await new Visitor().signIn("engineer@example.com");
    const response = await engineer.postJson(evaluatePath("lc-filter"), { inputs: { l: "1 mH", c: "4.7e-6", fsw: 20000 } });
    expect(response.status).toBe(400);
    const { fieldErrors } = await response.json();
    expect(fieldErrors).toEqual(
      expect.arrayContaining([
        { field: "c", message: expect.stringMatching(/^c: 4.7e-6 has no unit: did you mean 4.7 µF/) },
        { field: "fsw", message: expect.stringMatching(/^fsw: 20000 has no unit: did you mean 20 kHz/) },
      ]),
    );
  });

  it("refuses a truncated spectrum on /api/v1/evaluate with what to raise, and lists defaults used", async () => {
    const engineer = await new Visitor().signIn("engineer@example.com");
    const response = await engineer.postJson("/api/v1/evaluate", {
      blocks: [
        { id: "qs1", calculator: "quasi-square", inputs: { vdc: "48 V", hmax: "3" } },
        { id: "lim", calculator: "harmonic-limits", inputs: { standard: "ieee519-voltage", busVoltage: "230 V", spectrum: "=qs1.harmonics" } },
      ],
    });
    const body = await response.json();
    const lim = body.blocks.lim;
    expect(lim.ok).toBe(false);
    expect(lim.errors[0].message).toMatch(/reaches order 4, but IEEE Std 519-2014 limits orders up to 50.*Raise the source block's hmax to 50/);
    const qs1 = body.blocks.qs1;
    expect(qs1.defaultsUsed).toContainEqual({ key: "alpha", value: expect.any(String) });
  });
});
