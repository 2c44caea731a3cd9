/**
 * Search benchmark: 50,000 synthetic calc sheets in a scratch database, 200 queries
 * mixing common and rare words through the app's PostgreSQL search (ranking, snippets,
 * capped total) and, side by side, the plain GIN + ts_rank query. Prints p50 and p95 of
 * both, and how many of the plain query's top 10 the app's top 10 contains.
 * Target: the app's p95 ≤ 30 ms. Prints figures; asserts nothing.
 *
 * Run: npm run bench:search (starts the private PostgreSQL if needed; the scratch
 * database sw_bench_search_* is created and dropped). SHEETS=… changes the size.
 *
 * The text is invented: a Zipf-like vocabulary of 8,000 made-up words, plus the
 * trade's words each in about half the sheets, plus calculator blocks with values.
 */
import { drizzle } from "drizzle-orm/node-postgres";
import pg from "pg";
import { getCalculator } from "../../app/lib/calc/registry";
import { blockValuesText, SEARCH_TEXT_VERSION, type IndexedBlock } from "../../app/lib/search/document-text";
import * as schema from "../../app/.server/db/schema";
import { migrateDatabase } from "../../app/.server/db/migrate";
import { hasRankOrderIndex, PostgresSearchEngine } from "../../app/.server/search/postgres";
// @ts-expect-error -- a plain ES module script without types
import { privateDatabaseUrl, start as startPostgres } from "../../scripts/postgres.mjs";

const SHEETS = Number(process.env.SHEETS ?? 50_000);
const VOCABULARY = 8_000;
const QUERIES = 200;

// Deterministic pseudo-random numbers (mulberry32), so runs compare.
let seed = 0x5eed;
function random(): number {
  seed = (seed + 0x6d2b79f5) | 0;
  let t = seed;
  t = Math.imul(t ^ (t >>> 15), t | 1);
  t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
  return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
}
const pick = <T>(items: readonly T[]): T => items[Math.floor(random() * items.length)]!;

// Invented words from syllables; rank 1 is the most frequent (Zipf, s = 1).
const ONSETS = ["b", "br", "c", "d", "dr", "f", "g", "gl", "k", "l", "m", "n", "p", "pl", "qu", "r", "s", "st", "t", "tr", "v", "w", "z"];
const NUCLEI = ["a", "e", "i", "o", "u", "ai", "ea", "ou", "y"];
const CODAS = ["", "n", "r", "s", "l", "m", "th", "x", "nd", "rk"];
const words: string[] = [];
const seen = new Set<string>();
while (words.length < VOCABULARY) {
  const syllables = 2 + Math.floor(random() * 2);
  let word = "";
  for (let i = 0; i < syllables; i++) word += pick(ONSETS) + pick(NUCLEI) + (i === syllables - 1 ? pick(CODAS) : "");
  if (!seen.has(word)) seen.add(word), words.push(word);
}
const cumulative: number[] = [];
let sum = 0;
for (let r = 1; r <= VOCABULARY; r++) cumulative.push((sum += 1 / r));
function zipfWord(): string {
  const x = random() * sum;
  let lo = 0;
  let hi = cumulative.length - 1;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (cumulative[mid]! < x) lo = mid + 1;
    else hi = mid;
  }
  return words[lo]!;
}

/** The trade's words: each lands in about half the sheets. */
const TRADE = ["inverter", "filter", "harmonic", "capacitor", "inductor", "switching", "ripple", "thermal", "modulation", "bridge", "transformer", "efficiency", "rectifier", "snubber", "heatsink", "mosfet"];

const BLOCK_TEMPLATES: (() => { calculator: string; parsedInputs: Record<string, number>; results: Record<string, { value: number; unit: string; display: string }> })[] = [
  () => {
    const l = pick([0.47e-3, 1e-3, 2.2e-3, 3.3e-3]);
    const c = pick([4.7e-6, 10e-6, 22e-6, 47e-6]);
    const f0 = 1 / (2 * Math.PI * Math.sqrt(l * c));
    return { calculator: "lc-filter", parsedInputs: { l, c, fsw: pick([10e3, 16e3, 20e3, 40e3]), rLoad: pick([8, 10, 52.9]) }, results: { f0: { value: f0, unit: "Hz", display: "" } } };
  },
  () => ({ calculator: "quasi-square", parsedInputs: { vdc: pick([12, 24, 48, 400]), alpha: pick([15, 18, 30, 36]) }, results: { thd: { value: 29 + random() * 5, unit: "%", display: "" } } }),
  () => ({ calculator: "dc-link", parsedInputs: { p: pick([500, 1000, 3000]), vdc: pick([48, 200, 400]), rippleVpp: pick([2, 5, 8]), f: 50 }, results: {} }),
];

function syntheticSheet(n: number) {
  const title = Array.from({ length: 3 + Math.floor(random() * 4) }, () => (random() < 0.3 ? pick(TRADE) : zipfWord())).join(" ");
  const prose: string[] = [];
  const length = 120 + Math.floor(random() * 200);
  for (let i = 0; i < length; i++) prose.push(zipfWord());
  for (const word of TRADE) if (random() < 0.5) prose.splice(Math.floor(random() * prose.length), 0, word);
  const blocks: IndexedBlock[] = Array.from({ length: 1 + Math.floor(random() * 3) }, (_, i) => {
    const block = pick(BLOCK_TEMPLATES)();
    const inputs = Object.fromEntries(Object.entries(block.parsedInputs).map(([k, v]) => [k, String(v)]));
    for (const result of Object.values(block.results)) result.display = `${result.value.toPrecision(3)} ${result.unit}`;
    return { blockId: `b${i + 1}`, calculator: block.calculator, inputs, parsedInputs: block.parsedInputs, results: block.results };
  });
  const calculators = [...new Set(blocks.map((b) => b.calculator))].sort();
  return {
    id: `bench-${n}`,
    number: n,
    title,
    tags: [pick(TRADE), zipfWord()],
    calculators,
    state: random() < 0.4 ? "verified" : "draft",
    keywords: [pick(TRADE), zipfWord(), `PRJ-${n % 40}`, ...calculators].join("\n"),
    body: prose.join(" "),
    blockValues: blockValuesText(blocks, getCalculator),
  };
}

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))]!;
}

async function seedSheets(pool: pg.Pool, teamId: string) {
  await pool.query(`insert into organization (id, name, slug, created_at) values ($1, 'Bench team', 'bench-team', now())`, [teamId]);

  console.log(`[bench] seeding ${SHEETS.toLocaleString("en")} synthetic sheets…`);
  const seedStart = performance.now();
  const BATCH = 500;
  for (let from = 1; from <= SHEETS; from += BATCH) {
    const rows = Array.from({ length: Math.min(BATCH, SHEETS - from + 1) }, (_, i) => syntheticSheet(from + i));
    const values: unknown[] = [];
    const tuples = rows.map((r, i) => {
      values.push(r.id, teamId, r.number, r.title, r.tags, r.calculators, r.state, r.keywords, r.body, r.blockValues);
      const p = i * 10;
      return `($${p + 1}, 'sheet', $${p + 2}, $${p + 3}, $${p + 4}, $${p + 5}, $${p + 6}, $${p + 7}, 'A', $${p + 8}, $${p + 9}, $${p + 10}, now(), ${SEARCH_TEXT_VERSION})`;
    });
    await pool.query(
      `insert into search_document (id, kind, team_id, number, title, tags, calculators, state, revision_label, keywords, body, block_values, updated_at, text_version) values ${tuples.join(", ")}`,
      values,
    );
  }
  console.log(`[bench] seeded in ${((performance.now() - seedStart) / 1000).toFixed(1)} s`);

}

async function main() {
  if (!process.env.BENCH_DATABASE_URL) startPostgres();
  const baseUrl: string = process.env.BENCH_DATABASE_URL ?? privateDatabaseUrl("postgres");
  // BENCH_KEEP=name keeps (and on later runs reuses) a seeded scratch database, for tuning.
  const keep = process.env.BENCH_KEEP ? `sw_bench_search_${process.env.BENCH_KEEP}` : undefined;
  const scratch = keep ?? `sw_bench_search_${Date.now().toString(36)}`;
  const admin = new pg.Client({ connectionString: baseUrl });
  await admin.connect();
  const exists = (await admin.query("select 1 from pg_database where datname = $1", [scratch])).rowCount === 1;
  if (!exists) await admin.query(`create database "${scratch}"`);
  const url = new URL(baseUrl);
  url.pathname = `/${scratch}`;
  const pool = new pg.Pool({ connectionString: url.toString(), max: 4 });
  pool.on("error", () => {});
  try {
    await migrateDatabase(url.toString());
    const database = drizzle(pool, { schema });
    const teamId = "bench-team";
    if (!exists) await seedSheets(pool, teamId);
    await pool.query("vacuum analyze search_document");
    console.log(`[bench] rank-order (RUM) index: ${(await hasRankOrderIndex(database)) ? "yes" : "no"}`);
    // 200 queries: common trade words, frequent and rare invented words, mixtures, values.
    const queries: string[] = [];
    const kinds = [
      () => pick(TRADE),
      () => `${pick(TRADE)} ${pick(TRADE)}`,
      () => `${pick(TRADE)} ${pick(TRADE)} ${pick(TRADE)}`,
      () => words[Math.floor(random() * 30)]!,
      () => `${words[Math.floor(random() * 50)]!} ${pick(TRADE)}`,
      () => words[2000 + Math.floor(random() * 6000)]!,
      () => `${pick(TRADE)} ${words[500 + Math.floor(random() * 3000)]!}`,
      () => pick(["fsw 20 kHz", "20kHz", "quasi-square 48 V", "lc-filter 10 uF", "vdc 400 V", "dc-link ripple"]),
    ];
    for (let i = 0; i < QUERIES; i++) queries.push(kinds[i % kinds.length]!());

    const engine = new PostgresSearchEngine(database);
    const plain = async (query: string) =>
      (
        await pool.query<{ id: string; rank: number }>(
          `select id, ts_rank(search, q) as rank from search_document, websearch_to_tsquery('sinewright', $2) q
           where team_id = $1 and search @@ q order by ts_rank(search, q) desc, id limit 10`,
          [teamId, query],
        )
      ).rows;

    // Warm the caches for both, as a running server's would be.
    for (const q of queries.slice(0, 20)) {
      await engine.search(teamId, q, { limit: 10 });
      await plain(q);
    }
    const appTimes: number[] = [];
    const plainTimes: number[] = [];
    const slowest: { query: string; ms: number }[] = [];
    let overlapSum = 0;
    let tiedSum = 0;
    let compared = 0;
    let worst = { query: "", overlap: 10 };
    for (const q of queries) {
      let t = performance.now();
      const result = await engine.search(teamId, q, { limit: 10 });
      appTimes.push(performance.now() - t);
      slowest.push({ query: q, ms: appTimes.at(-1)! });
      t = performance.now();
      const reference = await plain(q);
      plainTimes.push(performance.now() - t);
      if (reference.length === 0) continue;
      compared++;
      const mine = new Set(result.hits.map((h) => h.id));
      const overlap = reference.filter((r) => mine.has(r.id)).length;
      overlapSum += overlap / reference.length;
      // Many sheets tie on rank; any of the tied ones is an equally right answer.
      const tenth = reference.at(-1)!.rank;
      const rightly = result.hits.filter((h) => h.score >= tenth * (1 - 1e-6)).length;
      tiedSum += Math.min(rightly, reference.length) / reference.length;
      if (overlap < worst.overlap) worst = { query: q, overlap };
    }
    appTimes.sort((a, b) => a - b);
    plainTimes.sort((a, b) => a - b);
    const ms = (x: number) => `${x.toFixed(1)} ms`;
    console.log(`\nSearch over ${SHEETS.toLocaleString("en")} sheets, ${QUERIES} queries (page of 10)`);
    console.log(`  app search (rank order, snippets, capped total)  p50 ${ms(percentile(appTimes, 0.5))}  p95 ${ms(percentile(appTimes, 0.95))}   target p95 ≤ 30 ms`);
    console.log(`  plain GIN + ts_rank                              p50 ${ms(percentile(plainTimes, 0.5))}  p95 ${ms(percentile(plainTimes, 0.95))}`);
    console.log(`  top-10 overlap with the plain query: ${((100 * overlapSum) / Math.max(1, compared)).toFixed(1)} % of its ids on average (worst ${worst.overlap}/10, "${worst.query}");`);
    slowest.sort((a, b) => b.ms - a.ms);
    console.log(`  slowest app queries: ${slowest.slice(0, 6).map((s) => `"${s.query}" ${ms(s.ms)}`).join(", ")}`);
    console.log(`    counting rank ties as equal: ${((100 * tiedSum) / Math.max(1, compared)).toFixed(1)} % of the app's top 10 score at least the plain 10th`);
  } finally {
    await pool.end();
    if (!keep) await admin.query(`drop database if exists "${scratch}" with (force)`);
    await admin.end();
  }
}

await main();
