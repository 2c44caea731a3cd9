import { describe, expect, it } from "vitest";
import { expectClose } from "../../../support/tolerance";
import { sampledSpectrum } from "../fft-reference";
import { refuse, run, scalarOf, valueOf } from "./run-helpers";

// Square wave of amplitude Va: fundamental peak 4·Va/π, fundamental RMS 2√2/π·Va = 0.900316·Va,
// total RMS Va. Mohan, Undeland & Robbins, Power Electronics, 3rd ed., ch. 8; Rashid, Power
// Electronics, 3rd ed., ch. 6 — published.
const FUNDAMENTAL_RMS_RATIO = 0.900316;

describe("half-bridge, split capacitor", () => {
  const { results } = run("half-bridge", { vdc: "48 V", mode: "split-capacitor" });

  it("puts ±Vdc/2 on the load: RMS Vdc/2, fundamental 0.900316·Vdc/2", () => {
    expectClose(valueOf(results, "vrms"), 24, { rel: 1e-12 });
    expectClose(valueOf(results, "v1Rms"), FUNDAMENTAL_RMS_RATIO * 24, { rel: 1e-6 });
    expectClose(valueOf(results, "v1Peak"), (4 * 24) / Math.PI, { rel: 1e-12 });
  });

  // Derived: the off switch of a leg sits across the link while its partner conducts.
  it("has each switch block the whole DC link", () => {
    expectClose(valueOf(results, "vBlock"), 48, { rel: 1e-12 });
  });

  it("agrees with an FFT of the synthesized ±Vdc/2 square wave (fft.js, independent)", () => {
    const spectrum = sampledSpectrum((theta) => (theta < Math.PI ? 24 : -24));
    // Point sampling of two jumps per cycle: error O(jump/N) ≈ 1e-3 V at N = 2^16.
    expectClose(valueOf(results, "v1Peak"), spectrum.peaks[1]!, { abs: 2e-3 });
    expectClose(valueOf(results, "vrms"), spectrum.rms, { abs: 1e-9 });
  });

  it("displays in engineering notation", () => {
    expect(scalarOf(results, "vrms").display).toBe("24.0 V");
  });
});

describe("half-bridge, centre-tapped transformer", () => {
  it("puts ±n·Vdc on the secondary and 2·Vdc across the off switch", () => {
    const { results } = run("half-bridge", { vdc: "24 V", mode: "centre-tapped", turnsRatio: "10" });
    expectClose(valueOf(results, "vrms"), 240, { rel: 1e-12 });
    expectClose(valueOf(results, "v1Rms"), FUNDAMENTAL_RMS_RATIO * 240, { rel: 1e-6 });
    // Push-pull blocking voltage 2·Vdc: the two primary halves in series — derived.
    expectClose(valueOf(results, "vBlock"), 48, { rel: 1e-12 });
  });

  // Behaviour, not a reference value: with no ratio the secondary sees ±Vdc, a 24 V square wave of RMS 24 V.
  it("treats an absent turns ratio as 1", () => {
    const { results } = run("half-bridge", { vdc: "24 V", mode: "centre-tapped" });
    expectClose(valueOf(results, "vrms"), 24, { rel: 1e-12 });
  });

  // Derived: V1,rms = n·0.900316·Vdc (Mohan, Undeland & Robbins, 3rd ed., ch. 8 — published), so n = V_target/(0.900316·Vdc).
  it("sizes a turns ratio that delivers the target fundamental RMS", () => {
    const sized = run("half-bridge", { vdc: "24 V", mode: "centre-tapped", targetVrms: "230 V" });
    const ratio = valueOf(sized.results, "turnsRatioForTarget");
    expectClose(ratio, 230 / (FUNDAMENTAL_RMS_RATIO * 24), { rel: 1e-6 });
    const built = run("half-bridge", { vdc: "24 V", mode: "centre-tapped", turnsRatio: ratio });
    expectClose(valueOf(built.results, "v1Rms"), 230, { rel: 1e-12 });
  });

  // Derived as above with the load's square wave of ±Vdc/2.
  it("for a split capacitor, sizes an output transformer and says so", () => {
    const { results, warnings } = run("half-bridge", { vdc: "400 V", targetVrms: "230 V" });
    expectClose(valueOf(results, "turnsRatioForTarget"), 230 / (FUNDAMENTAL_RMS_RATIO * 200), { rel: 1e-6 });
    expect(warnings.join(" ")).toMatch(/needs an output transformer/);
  });

  it("warns that a turns ratio is ignored for the split capacitor", () => {
    expect(run("half-bridge", { vdc: "48 V", turnsRatio: "2" }).warnings.join(" ")).toMatch(/ignored for the split capacitor/);
  });

  it("refuses a zero DC link", () => {
    expect(refuse("half-bridge", { vdc: "0 V" })[0]!.message).toMatch(/vdc must be above 0 V/);
  });
});
