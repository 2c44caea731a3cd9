// The capture reader against the shapes scopes export (header lines, units in names,
// comma/semicolon/tab, decimal comma, scientific notation) and against bad files,
// each refused with the line to fix. Expected values are the rows written in the test.
import { describe, expect, it } from "vitest";
import { CaptureError, CaptureReader, readCapture } from "~/lib/waveform/capture-csv";
import { captureCsv } from "../../support/capture-synth";

function refusal(text: string): CaptureError {
  try {
    readCapture(text);
  } catch (error) {
    expect(error).toBeInstanceOf(CaptureError);
    return error as CaptureError;
  }
  throw new Error("the capture was accepted");
}

describe("capture reader: what scopes write", () => {
  it("skips header lines, reads names and units from the last header row, and converts ms and mV", () => {
    const capture = readCapture(
      "\uFEFFModel,Bench scope\r\nSample interval,1.0E-03\r\nTime [ms],CH1 (mV),CH2 (A)\r\n0.0,100,1.5\r\n1.0,-2.5E+2,-1.5e0\r\n2.0,1e2,0\r\n",
    );
    expect(capture.sampleCount).toBe(3);
    expect(capture.firstDataLine).toBe(4);
    expect(capture.firstTime).toBe(0);
    expect(capture.lastTime).toBeCloseTo(0.002, 12);
    expect(capture.channels.map((c) => [c.name, c.unit])).toEqual([
      ["CH1", "V"],
      ["CH2", "A"],
    ]);
    expect([...capture.channels[0]!.values]).toEqual([0.1, -0.25, 0.1]);
    expect([...capture.channels[1]!.values]).toEqual([1.5, -1.5, 0]);
  });

  it("reads a units row under the names, semicolons with a decimal comma, and tabs", () => {
    const units = readCapture("Time,Vout\ns,Volt\n0,1\n0.5,2\n1,3\n");
    expect(units.channels[0]).toMatchObject({ name: "Vout", unit: "V" });
    const semicolons = readCapture("Zeit;U1 (V)\n0,000;1,25\n0,001;-2,5\n");
    expect([...semicolons.channels[0]!.values]).toEqual([1.25, -2.5]);
    expect(semicolons.lastTime).toBeCloseTo(0.001, 12);
    const tabs = readCapture("t\tv\n0\t5\n1\t6\n");
    expect([...tabs.channels[0]!.values]).toEqual([5, 6]);
  });

  it("gives the same capture whatever pieces the text arrives in", () => {
    const text = captureCsv({ sampleRate: 1000, samples: 300, channels: [{ name: "V", unit: "V", valueAt: (t) => Math.sin(t * 300) }, { name: "I", unit: "A", valueAt: (t) => t }] });
    const whole = readCapture(text);
    const reader = new CaptureReader();
    for (let at = 0; at < text.length; at += 37) reader.write(text.slice(at, at + 37));
    const pieces = reader.finish();
    expect(pieces.sampleCount).toBe(300);
    expect([...pieces.channels[0]!.values]).toEqual([...whole.channels[0]!.values]);
    expect([...pieces.channels[1]!.values]).toEqual([...whole.channels[1]!.values]);
  });

  it("accepts a last line without a line end and empty lines after the data", () => {
    expect(readCapture("t,v\n0,1\n1,2").sampleCount).toBe(2);
    expect(readCapture("t,v\n0,1\n1,2\n\n\n").sampleCount).toBe(2);
  });
});

describe("capture reader: bad files, each with the line to fix", () => {
  it("an empty file", () => {
    expect(refusal("").message).toMatch(/The file is empty/);
  });

  it("only header lines", () => {
    expect(refusal("Model,X\nTime,V\n").message).toMatch(/No rows of numbers were found in 2 lines/);
  });

  it("a non-numeric value in the data names its line and column", () => {
    const error = refusal("Time,Vout\n0,1\n0.001,2\n0.002,n/a\n0.003,4\n");
    expect(error.line).toBe(4);
    expect(error.message).toMatch(/Line 4, column 2 \("Vout"\): "n\/a" is not a number/);
  });

  it("a single column", () => {
    const error = refusal("Time\n0\n0.001\n0.002\n");
    expect(error.line).toBe(2);
    expect(error.message).toMatch(/single column.*needs a time column and at least one channel/);
  });

  it("time that does not increase", () => {
    const error = refusal("t,v\n0,1\n0.001,2\n0.001,3\n");
    expect(error.line).toBe(4);
    expect(error.message).toMatch(/Line 4: time 0.001 is not after the previous sample's 0.001/);
    expect(refusal("t,v\n0,1\n0.002,2\n0.001,3\n").message).toMatch(/Line 4/);
  });

  it("a row with a different number of values", () => {
    expect(refusal("t,a,b\n0,1,2\n1,2\n").message).toMatch(/Line 3 has 2 values where the data has 3/);
  });

  it("an empty line inside the data", () => {
    expect(refusal("t,v\n0,1\n\n2,3\n").message).toMatch(/Line 3 is empty, but data continues on line 4/);
  });
});
