// Writes the demo's bench capture, content/captures/ups48-bench-48v6.csv: an invented
// scope export of the UPS-48 modified-sine output at a 48.6 V battery (transformer
// ratio 5.8, α set for 230 V RMS), with the sag of the battery during each pulse,
// a small DC offset, probe noise, and the current into an R-L load. Deterministic:
// the same bytes on every run. `npx tsx scripts/make-demo-capture.ts`.
import { writeFileSync } from "node:fs";
import path from "node:path";
import { captureCsv, quasiSquare } from "../tests/support/capture-synth";

const frequency = 50;
const peak = 48.6 * 5.8;
const alpha = (Math.PI / 2) * (1 - (230 / peak) ** 2);
const ideal = quasiSquare(peak, alpha, frequency, 0.9);
/** The battery sags by up to 2.5 % through each pulse and recovers in the zero interval. */
const output = (t: number) => {
  const v = ideal(t);
  if (v === 0) return 0.35;
  const theta = (((2 * Math.PI * frequency * t + 0.9) % Math.PI) + Math.PI) % Math.PI;
  return v * (1 - 0.025 * ((theta - alpha) / (Math.PI - 2 * alpha))) + 0.35;
};

// Load: 44 Ω with 60 mH in series (about 1.2 kW at 230 V); exact step response per sample.
const resistance = 44;
const inductance = 0.06;
const sampleRate = 25_000;
function loadCurrent(): (t: number) => number {
  let time = -0.2;
  let current = 0;
  const step = 1 / sampleRate;
  return (t) => {
    while (time < t - step / 2) {
      const v = output(time);
      current = v / resistance + (current - v / resistance) * Math.exp((-resistance * step) / inductance);
      time += step;
    }
    return current;
  };
}

const csv = captureCsv({
  sampleRate,
  samples: 2500,
  seed: 48,
  preamble: ["Larkfield Power Systems bench capture (invented demo data)", "Record length,2500", "Sample interval,4.0E-05"],
  channels: [
    { name: "Vout", unit: "V", valueAt: output, noise: 1.2 },
    { name: "Iout", unit: "A", valueAt: loadCurrent(), noise: 0.02 },
  ],
});
const target = path.resolve("content/captures/ups48-bench-48v6.csv");
writeFileSync(target, csv);
console.log(`wrote ${target} (${csv.length.toLocaleString("en")} bytes)`);
