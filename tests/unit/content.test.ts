// The demo scenario can't rot: every MDX file under content/ compiles and computes,
// the manifest the seed reads holds together, and the sheets use every calculator.
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { demoSheetsManifest, loadDemoSheets } from "~/.server/demo-sheets";
import type { DemoTeam } from "~/.server/seed";
import { evaluateSheet } from "~/lib/calc/evaluate-sheet";
import { calculatorIds } from "~/lib/calc/registry";
import { checkSheetSource } from "~/lib/mdx";
import type { SourceBlock, SourceKind } from "~/lib/mdx/types";

const contentDir = path.resolve("content");

function mdxFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) return mdxFiles(full);
    return entry.name.endsWith(".mdx") ? [path.relative(contentDir, full).split(path.sep).join("/")] : [];
  });
}

/** Project documents (citing sheets) live under documents/; everything else is a calc sheet. */
function kindOf(file: string): SourceKind {
  return file.startsWith("documents/") ? "document" : "sheet";
}

const files = mdxFiles(contentDir).sort();
const readSource = (file: string) => readFileSync(path.join(contentDir, file), "utf8");
const demoTeam = JSON.parse(readFileSync(path.join(contentDir, "demo-team.json"), "utf8")) as DemoTeam;
const manifest = JSON.parse(readFileSync(path.join(contentDir, "demo-sheets.json"), "utf8")) as unknown;

function checkedBlocks(file: string): SourceBlock[] {
  const checked = checkSheetSource(readSource(file), kindOf(file));
  if (!checked.ok) throw new Error(`${file} is refused:\n${checked.problems.map((p) => `  ${p.line}:${p.column} ${p.message}`).join("\n")}`);
  return checked.blocks;
}

describe("demo content", () => {
  it("has sheets to check", () => {
    expect(files.filter((f) => f.startsWith("sheets/")).length).toBeGreaterThanOrEqual(10);
  });

  it.each(files)("%s compiles and every block computes", (file) => {
    const blocks = checkedBlocks(file);
    const evaluation = evaluateSheet(blocks.map((b) => ({ id: b.id, calculator: b.calculator, inputs: b.inputs })));
    expect(evaluation.errors).toEqual([]);
    const failed = blocks.flatMap((b) => {
      const outcome = evaluation.blocks[b.id];
      return outcome?.ok ? [] : [`${b.id} (line ${b.line}): ${JSON.stringify(outcome && !outcome.ok ? outcome.errors : "not evaluated")}`];
    });
    expect(failed).toEqual([]);
  });

  it("has a manifest that parses and names only existing files, projects and writers", async () => {
    const parsed = demoSheetsManifest.safeParse(manifest);
    expect(parsed.success, parsed.success ? "" : JSON.stringify(parsed.error.issues)).toBe(true);
    // The seed's own pre-check: reads every listed file and runs it as a save would.
    const content = await loadDemoSheets(demoTeam, contentDir);
    expect(content.sheets.length).toBe(parsed.data!.sheets.length);
    expect(content.sheets.some((s) => s.projectCode === null)).toBe(true);
  });

  it("lists every sheet file in the manifest", () => {
    const listed = new Set(demoSheetsManifest.parse(manifest).sheets.flatMap((s) => s.revisions.map((r) => r.file)));
    expect(files.filter((f) => kindOf(f) === "sheet" && !listed.has(f))).toEqual([]);
  });

  it("changes at least one block input in every later revision, so history and diff show something", () => {
    for (const sheet of demoSheetsManifest.parse(manifest).sheets) {
      for (let i = 1; i < sheet.revisions.length; i++) {
        const before = checkedBlocks(sheet.revisions[i - 1]!.file).map((b) => JSON.stringify([b.id, b.inputs]));
        const after = checkedBlocks(sheet.revisions[i]!.file).map((b) => JSON.stringify([b.id, b.inputs]));
        expect(after, `${sheet.revisions[i]!.file} against its previous revision`).not.toEqual(before);
      }
    }
  });

  it("uses every calculator in the registry", () => {
    const used = new Set(files.filter((f) => kindOf(f) === "sheet").flatMap((f) => checkedBlocks(f).map((b) => b.calculator)));
    expect(calculatorIds().filter((id) => !used.has(id))).toEqual([]);
  });
});
