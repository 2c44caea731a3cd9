import type { SnippetSegment } from "~/lib/search/document-text";
import type { searchDocument } from "../db/schema";

/** One row of `search_document`: what every engine indexes (the tsvector is PostgreSQL's own). */
export type SearchDocument = Omit<typeof searchDocument.$inferSelect, "search" | "searchHead">;

export type SearchKind = "sheet" | "document";

export interface SearchFilters {
  /** Only sheets whose latest revision is verified. */
  verifiedOnly?: boolean;
  projectId?: string;
  /** A calculator id, e.g. "lc-filter": sheets whose latest revision uses it. */
  calculator?: string;
  /** Sheets with a revision written by this member. */
  authorId?: string;
  /** Last changed at or after / before these instants. */
  updatedFrom?: Date;
  updatedBefore?: Date;
  kind?: SearchKind;
  /** Page size (1–100, default 20) and rows to skip. */
  limit?: number;
  offset?: number;
}

export interface SearchHit {
  id: string;
  kind: SearchKind;
  sheetNumber: number;
  title: string;
  projectCode: string | null;
  state: string;
  revisionLabel: string | null;
  /** Text around the matches; `hit: true` pieces are the matches to highlight. Plain text, never HTML. */
  snippet: SnippetSegment[];
  /** Higher is better; comparable only within one answer. */
  score: number;
}

export interface SearchResult {
  hits: SearchHit[];
  /** Matches in all. For very common words an engine's estimate (`totalIsEstimate`), e.g. "about 28,000". */
  total: number;
  totalIsEstimate: boolean;
  engine: "postgres" | "meilisearch";
  /** Said to the user when search runs on the fallback engine. */
  notice?: string;
}

export interface SearchEngine {
  readonly name: "postgres" | "meilisearch";
  search(teamId: string, query: string, filters?: SearchFilters): Promise<SearchResult>;
  index(doc: SearchDocument): Promise<void>;
  remove(id: string): Promise<void>;
}

/** Exact counts stop here; beyond, a total is "more than". */
export const TOTAL_CAP = 1000;

export function pageOf(filters: SearchFilters): { limit: number; offset: number } {
  const limit = Math.min(100, Math.max(1, Math.trunc(filters.limit ?? 20)));
  const offset = Math.max(0, Math.trunc(filters.offset ?? 0));
  return { limit, offset };
}
