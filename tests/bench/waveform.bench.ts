/**
 * A large scope capture end to end. Prints figures; asserts nothing.
 * Run: npm run bench:waveform
 *
 * Synthesizes a 1,000,000-sample, two-channel CSV (quasi-square output voltage and a
 * load current, with noise) in a temporary folder, then streams the file through
 * `ingestUpload` — the code path of an upload: byte counting, SHA-256, sniffing, the
 * temporary copy for the object store, UTF-8 decoding, the streaming CSV reader and
 * the analysis of both channels. Prints the time and the peak memory.
 *
 * Targets: ≤ 1.5 s and ≤ 400 MB resident.
 */
import { createReadStream, createWriteStream } from "node:fs";
import { mkdtemp, rm, stat } from "node:fs/promises";
import os, { tmpdir } from "node:os";
import path from "node:path";
import { once } from "node:events";
import { ingestUpload } from "../../app/.server/attachments/ingest";
import { captureCsvChunks, quasiSquare } from "../support/capture-synth";

const SAMPLES = 1_000_000;
const TARGET_SECONDS = 1.5;
const TARGET_MB = 400;

const folder = await mkdtemp(path.join(tmpdir(), "sinewright-bench-"));
try {
  const capture = path.join(folder, "capture.csv");
  const writer = createWriteStream(capture);
  const alpha = (30 * Math.PI) / 180;
  for (const chunk of captureCsvChunks({
    sampleRate: 1_000_000,
    samples: SAMPLES,
    seed: 1,
    preamble: ["Synthesized benchmark capture", `Record length,${SAMPLES}`],
    channels: [
      { name: "Vout", unit: "V", valueAt: quasiSquare(400, alpha, 50, 0.3), noise: 2 },
      { name: "Iout", unit: "A", valueAt: (t) => 13 * Math.sin(2 * Math.PI * 50 * t - 0.2) + 0.8 * Math.sin(2 * Math.PI * 250 * t), noise: 0.05 },
    ],
  })) {
    if (!writer.write(chunk)) await once(writer, "drain");
  }
  writer.end();
  await once(writer, "finish");
  const bytes = (await stat(capture)).size;
  global.gc?.();
  const rssBefore = process.memoryUsage().rss;

  let peakRss = rssBefore;
  const sampler = setInterval(() => (peakRss = Math.max(peakRss, process.memoryUsage().rss)), 20);
  const started = performance.now();
  const cpuBefore = process.cpuUsage();
  const ingested = await ingestUpload(createReadStream(capture, { highWaterMark: 256 * 1024 }), { maxBytes: 200e6, tempPath: path.join(folder, "upload") });
  const seconds = (performance.now() - started) / 1000;
  const cpu = process.cpuUsage(cpuBefore);
  const cpuSeconds = (cpu.user + cpu.system) / 1e6;
  clearInterval(sampler);
  peakRss = Math.max(peakRss, process.memoryUsage().rss);
  const maxRssMb = process.resourceUsage().maxRSS / 1024;

  const analysis = ingested.analysis!;
  console.log(`capture: ${SAMPLES.toLocaleString("en")} samples × 2 channels, ${(bytes / 1e6).toFixed(1)} MB of CSV`);
  for (const c of analysis.channels) {
    console.log(
      `  ${c.channel.padEnd(5)} f1 ${c.fundamentalFrequency.toFixed(4)} Hz, ${c.cycles} cycles, V1 ${c.fundamentalRms.toFixed(3)} ${c.unit} RMS, THD ${c.thd.toFixed(3)} % (to 50: ${c.thd50.toFixed(3)} %)`,
    );
  }
  console.log(`time, parse + analyse (end to end): ${seconds.toFixed(3)} s wall, ${cpuSeconds.toFixed(3)} s CPU   (target ≤ ${TARGET_SECONDS} s: ${seconds <= TARGET_SECONDS ? "met" : "MISSED"})`);
  console.log(`machine load while measuring: ${os.loadavg()[0]!.toFixed(1)} (1-minute average) on ${os.availableParallelism()} cores; wall time stretches when other work shares the cores`);
  console.log(`peak memory: max RSS of the process ${maxRssMb.toFixed(0)} MB; sampled RSS during the run ${(peakRss / 1e6).toFixed(0)} MB (before: ${(rssBefore / 1e6).toFixed(0)} MB)   (target ≤ ${TARGET_MB} MB: ${maxRssMb <= TARGET_MB ? "met" : "MISSED"})`);
} finally {
  await rm(folder, { recursive: true, force: true });
}
