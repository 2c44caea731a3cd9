/**
 * The demo scenario's projects and calc sheets (content/demo-sheets.json and the
 * MDX files it lists), read and checked before anything is written: the manifest's
 * shape, that every project, author and file it names exists, and that every
 * revision passes the same source check and engine run a save does, with every
 * block computing and every measured block reading its attached capture. Reads
 * files only; seeding them is in seed.ts.
 */
import { readFile } from "node:fs/promises";
import path from "node:path";
import { z } from "zod";
import { documentDetailsForm, projectForm, sheetDetailsForm } from "~/lib/forms/sheets";
import { parseSheetNumber } from "~/lib/sheets/numbering";
import { prepareSheet } from "~/lib/sheets/pipeline";
import { analyseCapture } from "~/lib/waveform/analyse";
import { readCapture } from "~/lib/waveform/capture-csv";
import type { StoredCapture } from "~/lib/waveform/measurement";
import type { DemoTeam } from "./seed";

const revisionEntry = z.object({
  /** Relative to content/, e.g. "sheets/pump-dc-link-a.mdx". */
  file: z.string().regex(/^sheets\/[a-z0-9][a-z0-9-]*\.mdx$/, "a file under sheets/, e.g. sheets/pump-dc-link-a.mdx"),
  note: z.string().trim().min(1).max(500),
  /** What happened to the revision in the check, so the demo shows every state. */
  review: z
    .object({
      checker: z.email(),
      outcome: z.enum(["submitted", "returned", "verified"]),
      comments: z.array(z.object({ anchor: z.string(), body: z.string().min(1) })).default([]),
    })
    .optional(),
});

const sheetEntry = z.object({
  title: sheetDetailsForm.shape.title,
  /** A project code from `projects`, or null for the team library. */
  project: z.string().nullable(),
  tags: z.array(z.string().trim().toLowerCase().min(1).max(40)).max(12),
  /** E-mail of a demo member who may write sheets. */
  author: z.email(),
  /** Files attached before the first revision, relative to content/, e.g. "captures/bench.csv". */
  attachments: z.array(z.string().regex(/^captures\/[a-z0-9][a-z0-9-]*\.csv$/, "a CSV file under captures/")).default([]),
  revisions: z.array(revisionEntry).min(1),
});

const documentEntry = z.object({
  title: documentDetailsForm.shape.title,
  project: z.string(),
  author: z.email(),
  /** Relative to content/, e.g. "documents/pump-design-report.mdx". */
  file: z.string().regex(/^documents\/[a-z0-9][a-z0-9-]*\.mdx$/, "a file under documents/, e.g. documents/pump-design-report.mdx"),
  note: z.string().trim().min(1).max(500),
});

export const demoSheetsManifest = z
  .object({
    projects: z.array(projectForm),
    /** In numbering order: the first becomes CS-0001. */
    sheets: z.array(sheetEntry),
    /** Project documents, seeded after every sheet (PD-0001 …), citing the sheets by number. */
    documents: z.array(documentEntry).default([]),
  })
  .superRefine((manifest, ctx) => {
    const codes = new Set<string>();
    manifest.projects.forEach((p, i) => {
      if (codes.has(p.code)) ctx.addIssue({ code: "custom", path: ["projects", i, "code"], message: `project code ${p.code} is listed twice` });
      codes.add(p.code);
    });
    manifest.sheets.forEach((s, i) => {
      if (s.project !== null && !codes.has(s.project.toUpperCase())) {
        ctx.addIssue({ code: "custom", path: ["sheets", i, "project"], message: `"${s.title}" names project ${s.project}, which is not in projects` });
      }
    });
    manifest.documents.forEach((d, i) => {
      if (!codes.has(d.project.toUpperCase())) {
        ctx.addIssue({ code: "custom", path: ["documents", i, "project"], message: `"${d.title}" names project ${d.project}, which is not in projects` });
      }
    });
  });

export type DemoSheetsManifest = z.infer<typeof demoSheetsManifest>;

export interface DemoRevision {
  file: string;
  note: string;
  source: string;
  review?: z.infer<typeof revisionEntry>["review"];
}

export interface DemoSheet {
  /** Paths of files to attach, relative to content/. */
  attachments: string[];
  title: string;
  projectCode: string | null;
  tags: string[];
  author: string;
  revisions: DemoRevision[];
}

export interface DemoDocument {
  title: string;
  projectCode: string;
  author: string;
  file: string;
  note: string;
  source: string;
}

export interface DemoContent {
  projects: DemoSheetsManifest["projects"];
  sheets: DemoSheet[];
  documents: DemoDocument[];
}

/** Raised when the demo content would not seed cleanly; the message lists every problem with its file. */
export class DemoContentError extends Error {
  constructor(readonly problems: string[]) {
    super(`The demo sheets cannot be seeded:\n  ${problems.join("\n  ")}`);
    this.name = "DemoContentError";
  }
}

function zodProblems(error: z.ZodError, where: string): string[] {
  return error.issues.map((issue) => `${where}${issue.path.length > 0 ? ` at ${issue.path.join(".")}` : ""}: ${issue.message}`);
}

/** Every problem a source would cause on save: refused MDX (with line and column) and blocks that do not compute. */
export function sourceProblems(file: string, source: string, captures: Record<string, StoredCapture> = {}): string[] {
  const prepared = prepareSheet(source, "sheet", captures);
  if (!prepared.ok) return prepared.problems.map((p) => `${file}:${p.line}:${p.column}: ${p.message}`);
  const problems = prepared.evaluation.errors.map((e) => `${file}: ${e.field}: ${e.message}`);
  for (const block of prepared.blocks) {
    const outcome = prepared.evaluation.blocks[block.id];
    if (!outcome) problems.push(`${file}:${block.line}:${block.column}: block ${block.id} was not evaluated`);
    else if (!outcome.ok) for (const e of outcome.errors) problems.push(`${file}:${block.line}:${block.column}: block ${block.id}, ${e.field}: ${e.message}`);
  }
  for (const block of prepared.measurementBlocks) {
    const outcome = prepared.measurements[block.id];
    if (outcome && !outcome.ok) for (const e of outcome.errors) problems.push(`${file}:${block.line}:${block.column}: block ${block.id}, ${e.field}: ${e.message}`);
  }
  return problems;
}

/**
 * Reads content/demo-sheets.json and every file it lists, and checks them against
 * the demo team. Throws a DemoContentError naming each problem; returns the
 * sheets with their sources otherwise.
 */
export async function loadDemoSheets(demo: DemoTeam, contentDir = path.resolve("content")): Promise<DemoContent> {
  const manifestFile = "demo-sheets.json";
  let raw: unknown;
  try {
    raw = JSON.parse(await readFile(path.join(contentDir, manifestFile), "utf8"));
  } catch (error) {
    throw new DemoContentError([`${manifestFile}: ${error instanceof Error ? error.message : String(error)}`]);
  }
  const parsed = demoSheetsManifest.safeParse(raw);
  if (!parsed.success) throw new DemoContentError(zodProblems(parsed.error, manifestFile));
  const manifest = parsed.data;

  const problems: string[] = [];
  const writers = new Map(demo.members.filter((m) => m.role !== "viewer").map((m) => [m.email, m]));
  const sheets: DemoSheet[] = [];
  for (const entry of manifest.sheets) {
    if (!writers.has(entry.author)) problems.push(`${manifestFile}: "${entry.title}": author ${entry.author} is not a demo member who may write sheets`);
    // Captures are analysed here as an upload would, so measured blocks are checked before seeding.
    const captures: Record<string, StoredCapture> = {};
    for (const attachment of entry.attachments) {
      try {
        const analysis = analyseCapture(readCapture(await readFile(path.join(contentDir, attachment), "utf8")));
        const fileName = path.basename(attachment);
        captures[fileName] = { attachmentId: `demo-${fileName}`, fileName, sha256: "", analysis };
      } catch (error) {
        problems.push(`${manifestFile}: "${entry.title}": ${attachment}: ${error instanceof Error ? error.message : String(error)}`);
      }
    }
    const revisions: DemoRevision[] = [];
    for (const revision of entry.revisions) {
      let source: string;
      try {
        source = await readFile(path.join(contentDir, revision.file), "utf8");
      } catch {
        problems.push(`${manifestFile}: "${entry.title}": ${revision.file} does not exist`);
        continue;
      }
      problems.push(...sourceProblems(revision.file, source, captures));
      const checkerRole = demo.members.find((m) => m.email === revision.review?.checker)?.role;
      if (revision.review && (revision.review.checker === entry.author || (checkerRole !== "checker" && checkerRole !== "admin"))) {
        problems.push(`${manifestFile}: "${entry.title}": ${revision.review.checker} cannot check it (a checker or admin other than the author)`);
      }
      revisions.push({ file: revision.file, note: revision.note, source, review: revision.review });
    }
    sheets.push({ attachments: entry.attachments, title: entry.title, projectCode: entry.project?.toUpperCase() ?? null, tags: [...new Set(entry.tags)], author: entry.author, revisions });
  }
  const documents: DemoDocument[] = [];
  for (const entry of manifest.documents) {
    if (!writers.has(entry.author)) problems.push(`${manifestFile}: "${entry.title}": author ${entry.author} is not a demo member who may write documents`);
    let source: string;
    try {
      source = await readFile(path.join(contentDir, entry.file), "utf8");
    } catch {
      problems.push(`${manifestFile}: "${entry.title}": ${entry.file} does not exist`);
      continue;
    }
    const prepared = prepareSheet(source, "document");
    if (!prepared.ok) problems.push(...prepared.problems.map((p) => `${entry.file}:${p.line}:${p.column}: ${p.message}`));
    else {
      // Every citation must name a demo sheet and one of its revisions.
      for (const c of prepared.citations) {
        const sheet = sheets[(parseSheetNumber(c.sheet) ?? 0) - 1];
        const revisionCount = sheet?.revisions.length ?? 0;
        const index = c.rev.toUpperCase().charCodeAt(0) - 64;
        if (!sheet || c.rev.length !== 1 || index < 1 || index > revisionCount) problems.push(`${entry.file}:${c.line}:${c.column}: cites ${c.sheet} rev ${c.rev}, which the demo does not have`);
      }
    }
    documents.push({ title: entry.title, projectCode: entry.project.toUpperCase(), author: entry.author, file: entry.file, note: entry.note, source });
  }
  if (problems.length > 0) throw new DemoContentError(problems);
  return { projects: manifest.projects, sheets, documents };
}
