// Measured against calculated: each row's verdict follows the author's tolerance, the
// block explains what is missing, and the revision hash binds the attachment's bytes.
import { describe, expect, it } from "vitest";
import { analyseCapture } from "~/lib/waveform/analyse";
import { readCapture } from "~/lib/waveform/capture-csv";
import type { StoredCapture } from "~/lib/waveform/measurement";
import { hashPrepared, prepareSheet } from "~/lib/sheets/pipeline";
import { captureCsv, quasiSquare } from "../../support/capture-synth";

const deg = Math.PI / 180;

/** A 48 V quasi-square at α = 30° measured 2 % low (a sagging link): invented bench data. 4,000 samples a cycle, so
 * where an edge falls between two samples moves the fundamental far less than the 2 % under test. */
function capture(scale: number, sha256 = "a".repeat(64)): Record<string, StoredCapture> {
  const csv = captureCsv({ sampleRate: 200_000, samples: 40_000, seed: 9, channels: [{ name: "Vout", unit: "V", valueAt: (t) => scale * quasiSquare(48, 30 * deg, 50, 0.5)(t), noise: 0.1 }] });
  return { "bench.csv": { attachmentId: "att-1", fileName: "bench.csv", sha256, analysis: analyseCapture(readCapture(csv)) } };
}

const sheet = (measured: string) => `# Bench check

<QuasiSquare id="qs1" vdc="48 V" alpha="30 deg" f="50 Hz" />

<LcFilter id="lc1" l="1 mH" c="10 uF" rLoad="10 ohm" fsw="20 kHz" f="50 Hz" vout="=qs1.v1Rms" />

${measured}
`;

function measure(measured: string, captures = capture(0.98)) {
  const prepared = prepareSheet(sheet(measured), "sheet", captures);
  if (!prepared.ok) throw new Error(JSON.stringify(prepared.problems));
  return { prepared, outcome: prepared.measurements.m1! };
}

describe("measured-waveform block: comparison", () => {
  it("passes the fundamental within 3 % and fails it within 1 % when the capture reads 2 % low", () => {
    const loose = measure(`<MeasuredWaveform id="m1" file="bench.csv" compare="qs1" fundamentalTol="3 %" />`).outcome;
    if (!loose.ok) throw new Error(JSON.stringify(loose.errors));
    const row = loose.comparison!.rows.find((r) => r.key === "fundamental")!;
    expect(row.difference).toBeCloseTo(-2, 1);
    expect(row.pass).toBe(true);
    const tight = measure(`<MeasuredWaveform id="m1" file="bench.csv" compare="qs1" fundamentalTol="1 %" />`).outcome;
    if (!tight.ok) throw new Error("expected an outcome");
    expect(tight.comparison!.rows.find((r) => r.key === "fundamental")!.pass).toBe(false);
    expect(tight.comparison!.pass).toBe(false);
  });

  it("compares THD and the chosen harmonics in percentage points of the fundamental (scale-free, so within tolerance)", () => {
    const { outcome } = measure(`<MeasuredWaveform id="m1" file="bench.csv" compare="qs1" harmonics="3, 5, 7" thd="40" thdTol="0.5 %" harmonicTol="0.3 %" />`);
    if (!outcome.ok) throw new Error(JSON.stringify(outcome.errors));
    expect(outcome.comparison!.rows.map((r) => r.key)).toEqual(["fundamental", "thd", "h3", "h5", "h7"]);
    const thd = outcome.comparison!.rows.find((r) => r.key === "thd")!;
    expect(thd.label).toBe("THD, orders 2–40");
    // Derived: at α = 30° every order 6k ± 1 is 1/n of the fundamental and the triplens are gone, so
    // THD to 40 = √(Σ 1/n², n = 5, 7, 11, …, 37) = 29.68 %.
    expect(thd.calculated).toBeCloseTo(29.68, 1);
    for (const row of outcome.comparison!.rows.slice(1)) expect(row.pass, row.key).toBe(true);
  });

  it("stands alone without compare, and says what is wrong otherwise", () => {
    const alone = measure(`<MeasuredWaveform id="m1" file="bench.csv" />`).outcome;
    expect(alone.ok && alone.comparison).toBe(null);
    const problems = (attributes: string) => {
      const outcome = measure(`<MeasuredWaveform id="m1" ${attributes} />`).outcome;
      return outcome.ok ? [] : outcome.errors.map((e) => `${e.field}: ${e.message}`);
    };
    expect(problems(`file="other.csv"`)).toEqual([expect.stringMatching(/^file: no capture "other.csv" is attached to this sheet; attached: bench.csv/)]);
    expect(problems(`file="bench.csv" channel="CH9"`)).toEqual([expect.stringMatching(/^channel: "bench.csv" has no analysed channel "CH9"; its channels: Vout/)]);
    expect(problems(`file="bench.csv" compare="lc1"`)).toEqual([expect.stringMatching(/^compare: block "lc1" \(lc-filter\) gives no harmonics and THD/)]);
    expect(problems(`file="bench.csv" compare="nope"`)).toEqual([expect.stringMatching(/^compare: there is no calculator block "nope"/)]);
    expect(problems(`file="bench.csv" thdTol="-1"`)).toEqual([expect.stringMatching(/^thdTol: a tolerance in percent/)]);
    expect(problems(`file="bench.csv" harmonics="3, 51"`)).toEqual([expect.stringMatching(/^harmonics: "51" is not a harmonic order from 2 to 50/)]);
  });

  it("is refused in the source with an unknown attribute or an id another block uses", () => {
    const unknown = prepareSheet(sheet(`<MeasuredWaveform id="m1" file="bench.csv" colour="red" />`), "sheet", capture(1));
    expect(unknown.ok ? [] : unknown.problems.map((p) => p.message)).toEqual([expect.stringMatching(/MeasuredWaveform has no attribute "colour"/)]);
    const taken = prepareSheet(sheet(`<MeasuredWaveform id="qs1" file="bench.csv" />`), "sheet", capture(1));
    expect(taken.ok ? [] : taken.problems.map((p) => p.message)).toEqual([expect.stringMatching(/The id "qs1" is already used by the block on line 3/)]);
  });
});

describe("measured-waveform block: the revision hash", () => {
  it("changes when the attachment's bytes (its SHA-256) change, and leaves sheets without measurements as they were", async () => {
    const source = `<MeasuredWaveform id="m1" file="bench.csv" compare="qs1" />`;
    const one = measure(source, capture(0.98, "a".repeat(64))).prepared;
    const other = measure(source, capture(0.98, "b".repeat(64))).prepared;
    expect(await hashPrepared(sheet(source), one)).not.toBe(await hashPrepared(sheet(source), other));
    const plain = prepareSheet(sheet(""), "sheet");
    if (!plain.ok) throw new Error("plain sheet refused");
    expect(plain.measurements).toEqual({});
  });
});
