import { describe, expect, it } from "vitest";
import { citationStatus, type CitableRevision, type StampHealth } from "~/lib/documents/citations";
import { checkSheetSource, setCitationRevision } from "~/lib/mdx";

const rev = (label: string, state: string): CitableRevision => ({ id: `r-${label}`, label, sequence: label.charCodeAt(0) - 64, state });
const sheet = (...revisions: CitableRevision[]) => ({ number: "CS-0003", title: "Output filter", revisions });
const healthy: StampHealth = { intact: true, stampEngineVersion: "1.0.0", engineVersion: "1.0.0", driftCount: 0 };

describe("a citation's state", () => {
  it("stands when it cites the newest verified revision, even with newer unverified ones", () => {
    const status = citationStatus(sheet(rev("A", "verified"), rev("B", "submitted")), "A", healthy);
    expect(status).toMatchObject({ state: "verified", stale: false, words: "verified", updateTo: null });
  });

  it("is superseded by a newer verified revision, and offers it as the update — whatever the cited revision's own state", () => {
    for (const state of ["verified", "returned", "submitted", "draft"]) {
      const status = citationStatus(sheet(rev("A", state), rev("B", "verified"), rev("C", "verified"), rev("D", "draft")), "a", healthy);
      expect(status).toMatchObject({ state: "superseded", stale: true, words: "superseded by revision C (verified)", updateTo: { label: "C" } });
    }
  });

  it("names the cited revision's review state when nothing newer is verified", () => {
    expect(citationStatus(sheet(rev("A", "submitted")), "A")).toMatchObject({ state: "waiting", stale: true, updateTo: null });
    expect(citationStatus(sheet(rev("A", "returned")), "A")).toMatchObject({ state: "returned", stale: true });
    expect(citationStatus(sheet(rev("A", "draft")), "A")).toMatchObject({ state: "draft", stale: true });
    // An older verified revision is no update for a newer draft that was cited.
    expect(citationStatus(sheet(rev("A", "verified"), rev("B", "draft")), "B")).toMatchObject({ state: "draft", updateTo: { label: "A" } });
  });

  it("needs a re-check when the engine changed since the stamp or the stored content no longer matches it", () => {
    const facts = sheet(rev("A", "verified"));
    expect(citationStatus(facts, "A", { ...healthy, engineVersion: "1.1.0" })).toMatchObject({
      state: "recheck",
      words: "needs a re-check after the engine changed (1.0.0 → 1.1.0; results unchanged)",
    });
    expect(citationStatus(facts, "A", { ...healthy, engineVersion: "1.1.0", driftCount: 2 }).words).toContain("2 results differ");
    expect(citationStatus(facts, "A", { ...healthy, intact: false })).toMatchObject({ state: "recheck", words: "needs a re-check: the stored content no longer matches its stamp" });
  });

  it("is missing when the sheet or the revision does not exist, offering the newest verified revision if there is one", () => {
    expect(citationStatus(undefined, "A")).toMatchObject({ state: "missing", words: "no such sheet in this team", updateTo: null });
    expect(citationStatus(sheet(rev("A", "verified")), "F")).toMatchObject({ state: "missing", words: "CS-0003 has no revision F", updateTo: { label: "A" } });
  });
});

describe("moving a citation to another revision", () => {
  const source = `Link in <Cite sheet="CS-0003" rev="A" />, again <Cite rev='a' sheet="cs-3" />, filter in <Cite sheet="CS-0004" rev="A" />.\n`;
  const checked = checkSheetSource(source, "document");
  if (!checked.ok) throw new Error(JSON.stringify(checked.problems));

  it("rewrites only the rev values of that sheet's citations, however its number, quoting or case is written", () => {
    expect(setCitationRevision(source, checked.citations, "CS-0003", "A", "C")).toBe(
      `Link in <Cite sheet="CS-0003" rev="C" />, again <Cite rev='C' sheet="cs-3" />, filter in <Cite sheet="CS-0004" rev="A" />.\n`,
    );
  });

  it("refuses a label that is not a revision, and a citation the source no longer holds", () => {
    expect(() => setCitationRevision(source, checked.citations, "CS-0003", "A", 'C" onclick="x')).toThrow(/not a revision label/);
    expect(() => setCitationRevision(source, checked.citations, "CS-0009", "A", "B")).toThrow(/no longer cites CS-0009 revision A/);
  });
});
