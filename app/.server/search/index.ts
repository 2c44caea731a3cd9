/**
 * Search, for routes: full-text `search()` over the team's sheets (and later documents)
 * and parameter search `findBlocks()` over their blocks' values.
 */
import { searchEngine } from "./engine";
import type { SearchFilters, SearchResult } from "./types";

export { findBlocks, BlockQueryError, type BlockHit, type BlockQuery, type BlockRange } from "./blocks";
export { FALLBACK_NOTICE } from "./engine";
export { indexSheet, removeFromSearch } from "./indexer";
export type { SearchFilters, SearchHit, SearchResult } from "./types";

/** Searches the team's documents: web-style query (words, "a phrase", OR, -word) and filters. */
export function search(teamId: string, query: string, filters: SearchFilters = {}): Promise<SearchResult> {
  return searchEngine().search(teamId, query, filters);
}
