/**
 * Synthesized scope captures for tests, the benchmark and the demo's bench capture:
 * CSV text written the way scopes export it (header lines, units in the names,
 * scientific notation), from waveforms defined in closed form, plus seeded Gaussian
 * noise so every run writes the same bytes. Invented data: never a real measurement.
 */

export interface SynthChannel {
  name: string;
  unit: string;
  /** Value at time t (s), before noise. */
  valueAt: (t: number) => number;
  /** Standard deviation of added Gaussian noise, in the channel's unit. */
  noise?: number;
}

export interface SynthCapture {
  sampleRate: number;
  samples: number;
  channels: SynthChannel[];
  /** Lines before the column names, e.g. a model line. */
  preamble?: string[];
  delimiter?: "," | ";" | "\t";
  /** Decimal comma (with ";" as delimiter), as European-locale exports write. */
  decimalComma?: boolean;
  seed?: number;
  /** Time of the first sample, s. */
  startTime?: number;
}

/** Mulberry32: a small seeded generator, so noise is the same on every run. */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviates by Box–Muller. */
export function gaussian(random: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
}

/** The capture as CSV text in pieces of about `chunkRows` rows, for streaming to a file or a request. */
export function* captureCsvChunks(spec: SynthCapture, chunkRows = 4096): Generator<string> {
  const delimiter = spec.delimiter ?? ",";
  const normal = gaussian(seededRandom(spec.seed ?? 1));
  const number = (value: number, digits: number) => {
    const text = value.toExponential(digits);
    return spec.decimalComma ? text.replace(".", ",") : text;
  };
  const header = [...(spec.preamble ?? []), ["Time (s)", ...spec.channels.map((c) => `${c.name} (${c.unit})`)].join(delimiter)];
  let chunk = `${header.join("\n")}\n`;
  const start = spec.startTime ?? 0;
  for (let i = 0; i < spec.samples; i++) {
    const t = start + i / spec.sampleRate;
    let row = number(t, 9);
    for (const channel of spec.channels) row += delimiter + number(channel.valueAt(t) + (channel.noise ? channel.noise * normal() : 0), 6);
    chunk += `${row}\n`;
    if ((i + 1) % chunkRows === 0) {
      yield chunk;
      chunk = "";
    }
  }
  if (chunk) yield chunk;
}

export function captureCsv(spec: SynthCapture): string {
  return [...captureCsvChunks(spec)].join("");
}

/**
 * Quasi-square wave of amplitude `vdc`, zero interval α (radians) at each edge of each
 * half cycle, fundamental f, rising fundamental zero crossing at t = −phase/(2πf):
 * +vdc for α < θ < π − α, −vdc for π + α < θ < 2π − α, 0 elsewhere.
 * (Rashid, Power Electronics, 3rd ed., §6.6, single-pulse modulation.)
 */
export function quasiSquare(vdc: number, alpha: number, frequency: number, phase = 0): (t: number) => number {
  return (t) => {
    const theta = (((2 * Math.PI * frequency * t + phase) % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI);
    if (theta > alpha && theta < Math.PI - alpha) return vdc;
    if (theta > Math.PI + alpha && theta < 2 * Math.PI - alpha) return -vdc;
    return 0;
  };
}

/**
 * Line-to-line voltage of a three-phase six-step (180° conduction) bridge: the difference
 * of two square-wave pole voltages 120° apart, each 0 or Vdc.
 * (Mohan, Undeland & Robbins, 3rd ed., §8-6.)
 */
export function sixStepLineVoltage(vdc: number, frequency: number, phase = 0): (t: number) => number {
  const pole = (theta: number) => ((((theta % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI)) < Math.PI ? vdc : 0);
  return (t) => {
    const theta = 2 * Math.PI * frequency * t + phase;
    return pole(theta) - pole(theta - (2 * Math.PI) / 3);
  };
}
