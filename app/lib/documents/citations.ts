/**
 * What a citation in a project document is worth today. A document cites an exact
 * revision of a calc sheet; the revision's own state, newer verified revisions and
 * the engine decide whether the citation still stands. Pure: the server gathers the
 * facts, this decides.
 */

export const CITATION_STATES = ["verified", "superseded", "recheck", "waiting", "returned", "draft", "missing"] as const;
export type CitationState = (typeof CITATION_STATES)[number];

/** A revision as citation rules see it. */
export interface CitableRevision {
  id: string;
  label: string;
  sequence: number;
  state: string;
}

/** What the integrity check found for a verified revision. */
export interface StampHealth {
  /** Stored content still hashes to the stamped hash. */
  intact: boolean;
  /** Engine version the stamp was given under, and the one running now. */
  stampEngineVersion: string;
  engineVersion: string;
  /** Results the current engine computes differently from the stored ones. */
  driftCount: number;
}

export interface CitedSheet {
  number: string;
  title: string;
  revisions: CitableRevision[];
}

export interface CitationStatus {
  state: CitationState;
  /** Anything but "verified" needs someone's attention. */
  stale: boolean;
  /** One line for the reader, e.g. "superseded by revision C (verified)". */
  words: string;
  /** The revision actually cited, when it exists. */
  cited: CitableRevision | null;
  /** The newest verified revision of the sheet, when there is one. */
  latestVerified: CitableRevision | null;
  /** Where a one-click update would move the citation: the newest verified revision, when it is not the cited one. */
  updateTo: CitableRevision | null;
}

/**
 * Decides a citation's state. Order matters: a newer verified revision is the most
 * useful thing to say (it comes with an update), then the cited revision's own state.
 */
export function citationStatus(sheet: CitedSheet | undefined, rev: string, health?: StampHealth): CitationStatus {
  const none = { cited: null, latestVerified: null, updateTo: null };
  if (!sheet) return { ...none, state: "missing", stale: true, words: "no such sheet in this team" };
  const latestVerified = sheet.revisions.filter((r) => r.state === "verified").reduce<CitableRevision | null>((best, r) => (!best || r.sequence > best.sequence ? r : best), null);
  const cited = sheet.revisions.find((r) => r.label === rev.trim().toUpperCase()) ?? null;
  if (!cited) {
    return { ...none, latestVerified, updateTo: latestVerified, state: "missing", stale: true, words: `${sheet.number} has no revision ${rev}` };
  }
  const updateTo = latestVerified && latestVerified.id !== cited.id ? latestVerified : null;
  const base = { cited, latestVerified, updateTo };
  if (latestVerified && latestVerified.sequence > cited.sequence) {
    return { ...base, state: "superseded", stale: true, words: `superseded by revision ${latestVerified.label} (verified)` };
  }
  switch (cited.state) {
    case "verified": {
      if (health && !health.intact) return { ...base, state: "recheck", stale: true, words: "needs a re-check: the stored content no longer matches its stamp" };
      if (health && (health.driftCount > 0 || health.stampEngineVersion !== health.engineVersion)) {
        const what = health.driftCount > 0 ? `${health.driftCount} result${health.driftCount === 1 ? "" : "s"} differ` : "results unchanged";
        return { ...base, state: "recheck", stale: true, words: `needs a re-check after the engine changed (${health.stampEngineVersion} → ${health.engineVersion}; ${what})` };
      }
      return { ...base, state: "verified", stale: false, words: "verified" };
    }
    case "submitted":
      return { ...base, state: "waiting", stale: true, words: "waiting for check" };
    case "returned":
      return { ...base, state: "returned", stale: true, words: "returned by the checker" };
    default:
      return { ...base, state: "draft", stale: true, words: "draft, not yet sent for check" };
  }
}

/** The key a rendered citation is looked up by: "CS-0003@B". */
export function citationKey(sheet: string, rev: string): string {
  return `${sheet.trim().toUpperCase()}@${rev.trim().toUpperCase()}`;
}

/** A citation as a page shows it: state, the cited sheet's title, link and stamp. */
export interface CitationView {
  key: string;
  sheet: string;
  rev: string;
  state: CitationState;
  stale: boolean;
  words: string;
  title: string | null;
  href: string | null;
  stampedAt: string | null;
  checkerName: string | null;
  contentHash: string | null;
  updateTo: { label: string } | null;
}

/** What a page needs beside the status: which citation, the cited sheet's title, its link and stamp. */
export type CitationFacts = Pick<CitationView, "key" | "sheet" | "rev" | "title" | "href" | "stampedAt" | "checkerName" | "contentHash">;

/** A citation as pages show it: its status and facts, with only the label of the update's revision. */
export function toCitationView(status: CitationStatus, facts: CitationFacts): CitationView {
  return {
    key: facts.key,
    sheet: facts.sheet,
    rev: facts.rev,
    state: status.state,
    stale: status.stale,
    words: status.words,
    title: facts.title,
    href: facts.href,
    stampedAt: facts.stampedAt,
    checkerName: facts.checkerName,
    contentHash: facts.contentHash,
    updateTo: status.updateTo ? { label: status.updateTo.label } : null,
  };
}
