/**
 * The audit trail in words, for every page that shows it (the sheet's history, the team's
 * activity). Pure: each entry's action id and detail, as `recordAudit` stored them, become
 * the phrase after the actor's name ("Ada saved revision B (hash 1a2b3c4d5e6f)").
 */
type Detail = Record<string, unknown>;

const text = (value: unknown, fallback = ""): string => (value === undefined || value === null || value === "" ? fallback : String(value));
const revision = (detail: Detail): string => (detail.label ? ` revision ${text(detail.label)}` : "");
const bytes = (value: unknown): string => {
  const n = Number(value);
  if (!Number.isFinite(n) || n <= 0) return "";
  return n >= 1e6 ? `${(n / 1e6).toFixed(1)} MB` : `${Math.max(1, Math.round(n / 1e3))} kB`;
};

const WORDING: Record<string, (detail: Detail) => string> = {
  "team.created": () => "created the team",
  "team.seeded": () => "set up this demo team",
  "member.joined": (d) => `joined the team as ${text(d.role, "a member")}`,
  "member.invited": (d) => `sent an invitation (${text(d.role, "member")})`,
  "invitation.canceled": (d) => `withdrew an invitation to ${text(d.email, "someone")}`,
  "member.role-changed": (d) => `changed a role from ${text(d.from, "?")} to ${text(d.to, "?")}`,
  "member.removed": (d) => `removed a member (${text(d.role, "member")})`,
  "api-key.created": () => "created a personal API key",
  "api-key.revoked": () => "revoked a personal API key",
  "project.created": (d) => `created the project${d.code ? ` ${text(d.code)}` : ""}`,
  "project.updated": (d) => `changed the project${d.code ? ` ${text(d.code)}` : ""}`,
  "sheet.created": (d) => `created the sheet${d.number ? ` (${text(d.number)})` : ""}`,
  "sheet.details-changed": () => "changed the sheet's details",
  "sheet.reused": (d) => `reused${revision(d)} as ${text(d.into, "a new sheet")}`,
  "revision.saved": (d) => `saved${revision(d)}${d.contentHash ? ` (hash ${text(d.contentHash).slice(0, 12)})` : ""}`,
  "revision.submitted": (d) => `sent${revision(d)} for checking to ${text(d.checker, "a checker")}`,
  "revision.returned": (d) => `returned${revision(d)} with comments`,
  "revision.verified": (d) => `verified and stamped${revision(d)}`,
  "comment.added": (d) => `commented on${revision(d)}${d.anchor ? ` (${text(d.anchor)})` : ""}`,
  "comment.replied": (d) => `replied on${revision(d)}`,
  "comment.resolved": () => "resolved a comment thread",
  "check.values-recorded": (d) => `re-ran ${text(d.blockId, "a block")} on${revision(d)}: ${d.agrees ? "agrees" : "differs"}`,
  "attachment.uploaded": (d) => `attached ${text(d.fileName, "a file")}${bytes(d.size) ? ` (${bytes(d.size)})` : ""}`,
  "document.created": (d) => `created the document${d.number ? ` ${text(d.number)}` : ""}`,
  "document.saved": (d) => `saved version ${text(d.version, "?")} of ${text(d.number, "a document")}`,
  "document.citation-updated": (d) => `updated a citation of ${text(d.sheet, "a sheet")} from rev ${text(d.from, "?")} to rev ${text(d.to, "?")} (version ${text(d.version, "?")})`,
};

/** What the actor did, in words; an action this list does not know yet reads as its id. */
export function describeAuditEvent(action: string, detail: Detail | null | undefined): string {
  const words = WORDING[action];
  return words ? words(detail ?? {}) : action;
}

/** Every action id with words: a test holds the app's `recordAudit` calls to this list. */
export const DESCRIBED_AUDIT_ACTIONS = Object.keys(WORDING);
