/**
 * Typesetting authors' formulas on the server, with a deadline no formula can outrun.
 *
 * The check (`app/lib/mdx/math.ts`) refuses what is known to be slow, but KaTeX runs
 * synchronously and one stuck call would hold every request of this process. So the
 * server never typesets untrusted TeX on its own thread: one worker thread per process
 * does it, with a time limit per sheet and a heap limit; a worker that passes either
 * is terminated (and a fresh one started for the next sheet) and the sheet is refused
 * with a message.
 */
import { createRequire } from "node:module";
import { Worker } from "node:worker_threads";
import { KATEX_OPTIONS, formulaError } from "~/lib/mdx/math";
import { mathIn } from "~/lib/mdx/render";
import { prepareSheet, type PrepareOutcome } from "~/lib/sheets/pipeline";
import type { SourceKind } from "~/lib/mdx/types";
import type { StoredCapture } from "~/lib/waveform/measurement";

/** A sheet's formulas (at most 20,000 characters of TeX) typeset in under 2 s on one core; this leaves room for a busy machine. */
const MATH_DEADLINE_MS = 5_000;
const WORKER_HEAP_MB = 64;

// The worker cannot import the app's modules (they are bundled into the server build), so
// it is this short script: KaTeX with the options it is sent, one answer per formula.
const WORKER_SOURCE = `
const { parentPort, workerData } = require("node:worker_threads");
const katex = require(workerData.katexPath);
parentPort.on("message", ({ job, formulas }) => {
  for (const { tex, displayMode } of formulas) {
    let html = null, error = null;
    try {
      html = katex.renderToString(tex, { ...workerData.options, displayMode, throwOnError: false });
    } catch (cause) {
      error = String(cause);
    }
    parentPort.postMessage({ job, html, error });
  }
});
`;

interface Job {
  id: number;
  deadlineMs: number;
  formulas: { tex: string; displayMode: boolean }[];
  results: { html: string | null; error: string | null }[];
  settle(outcome: { ok: true; html: string[] } | { ok: false; failedAt: number; reason: "time" | "memory" }): void;
}

let worker: Worker | undefined;
let running: Job | undefined;
let timer: NodeJS.Timeout | undefined;
const waiting: Job[] = [];
let nextJobId = 1;

function startWorker(): Worker {
  const started = new Worker(WORKER_SOURCE, {
    eval: true,
    workerData: { katexPath: createRequire(import.meta.url).resolve("katex"), options: KATEX_OPTIONS },
    resourceLimits: { maxOldGenerationSizeMb: WORKER_HEAP_MB, maxYoungGenerationSizeMb: 16, stackSizeMb: 4 },
  });
  started.on("message", (message: { job: number; html: string | null; error: string | null }) => {
    const job = running;
    if (!job || message.job !== job.id) return;
    job.results.push({ html: message.html, error: message.error });
    if (job.results.length === job.formulas.length) finish(job, { ok: true, html: job.results.map((r, i) => r.html ?? formulaError(job.formulas[i]!.tex, r.error)) });
  });
  // Only the current worker's end concerns the running job; a terminated one's comes later.
  const ended = () => {
    if (worker !== started) return;
    abandon("memory");
  };
  started.on("error", ended);
  started.on("exit", ended);
  // An idle worker does not keep the process alive (scripts, tests, graceful shutdown); set after
  // the listeners, which would otherwise hold it.
  started.unref();
  return started;
}

function finish(job: Job, outcome: Parameters<Job["settle"]>[0]) {
  clearTimeout(timer);
  running = undefined;
  job.settle(outcome);
  runNext();
}

/** The running job failed (deadline, heap limit or crash): drop the worker; the next job gets a new one. */
function abandon(reason: "time" | "memory") {
  const job = running;
  if (!job) return;
  const stuck = worker;
  worker = undefined;
  void stuck?.terminate();
  finish(job, { ok: false, failedAt: job.results.length, reason });
}

function runNext() {
  if (running || waiting.length === 0) return;
  const job = waiting.shift()!;
  running = job;
  worker ??= startWorker();
  timer = setTimeout(() => abandon("time"), job.deadlineMs);
  worker.postMessage({ job: job.id, formulas: job.formulas });
}

/** Typesets formulas in the worker: their HTML in order, or which one ran out of time or memory. */
export function typesetInWorker(formulas: { tex: string; displayMode: boolean }[], deadlineMs = MATH_DEADLINE_MS): Promise<Parameters<Job["settle"]>[0]> {
  if (formulas.length === 0) return Promise.resolve({ ok: true, html: [] });
  return new Promise((settle) => {
    waiting.push({ id: nextJobId++, deadlineMs, formulas, results: [], settle });
    runNext();
  });
}

/**
 * `prepareSheet` for the server: the same check, blocks and results, with the formulas
 * typeset in the worker. A sheet whose formulas cannot be typeset in time is refused
 * at the formula that took too long.
 */
export async function prepareUntrustedSheet(source: string, kind: SourceKind = "sheet", captures: Readonly<Record<string, StoredCapture>> = {}): Promise<PrepareOutcome> {
  const prepared = prepareSheet(source, kind, captures, null);
  if (!prepared.ok) return prepared;
  const formulas = mathIn(prepared.tree);
  const outcome = await typesetInWorker(formulas.map(({ tex, displayMode }) => ({ tex, displayMode })));
  if (!outcome.ok) {
    const tex = formulas[outcome.failedAt]!.tex;
    const at = Math.max(0, source.indexOf(tex));
    const before = source.slice(0, at);
    const limit = outcome.reason === "time" ? `${MATH_DEADLINE_MS / 1000} seconds` : `${WORKER_HEAP_MB} MB of memory`;
    return {
      ok: false,
      problems: [{ message: `This formula could not be typeset within ${limit}. Shorten it or split it into several formulas.`, line: before.split("\n").length, column: at - before.lastIndexOf("\n") }],
    };
  }
  formulas.forEach((formula, index) => formula.typeset(outcome.html[index]!));
  return prepared;
}
