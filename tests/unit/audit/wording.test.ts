import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import {
  DESCRIBED_AUDIT_ACTIONS,
  describeAuditEvent,
} from "~/lib/audit/wording";

/** Every action id the app records: the string literals next to `action:` in calls of recordAudit. */
function recordedActions(): string[] {
  const found = new Set<string>();
  const walk = (folder: string) => {
    for (const entry of readdirSync(folder, { withFileTypes: true })) {
      const full = path.join(folder, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (/\.tsx?$/.test(entry.name)) {
        const source = readFileSync(full, "utf8");
        if (!source.includes("recordAudit")) continue;
        for (const match of source.matchAll(
          /action:\s*(?:[^,"]*\?\s*)?"([a-z-]+\.[a-z-]+)"(?:\s*:\s*"([a-z-]+\.[a-z-]+)")?/g,
        )) {
          found.add(match[1]!);
          if (match[2]) found.add(match[2]);
        }
      }
    }
  };
  walk(path.resolve(__dirname, "../../../app"));
  return [...found].sort();
}

describe("the audit trail in words", () => {
  it("has words for every action the app records, so no page shows a raw id", () => {
    const recorded = recordedActions();
    expect(recorded.length).toBeGreaterThan(20);
    expect(
      recorded.filter((action) => !DESCRIBED_AUDIT_ACTIONS.includes(action)),
    ).toEqual([]);
  });

  it("says what happened with the details a reader needs", () => {
    expect(
      describeAuditEvent("revision.saved", {
        label: "B",
        contentHash: "1a2b3c4d5e6f7a8b",
      }),
    ).toBe("saved revision B (hash 1a2b3c4d5e6f)");
    expect(
      describeAuditEvent("sheet.reused", { label: "B", into: "CS-0012" }),
    ).toBe("reused revision B as CS-0012");
    expect(
      describeAuditEvent("document.citation-updated", {
        sheet: "CS-0003",
        from: "B",
        to: "C",
        version: 4,
      }),
    ).toBe("updated a citation of CS-0003 from rev B to rev C (version 4)");
    expect(
      describeAuditEvent("attachment.uploaded", {
        fileName: "scope.csv",
        size: 2_400_000,
      }),
    ).toBe("attached scope.csv (2.4 MB)");
    expect(
      describeAuditEvent("member.role-changed", {
        from: "engineer",
        to: "checker",
      }),
    ).toBe("changed a role from engineer to checker");
  });

  it("reads an action it does not know as its id rather than failing", () => {
    expect(describeAuditEvent("something.new", {})).toBe("something.new");
    expect(describeAuditEvent("revision.returned", null)).toBe(
      "returned with comments",
    );
  });
});
