/**
 * Which engine answers. Without MEILI_HOST, PostgreSQL. With it, Meilisearch — and
 * when Meilisearch cannot be reached, PostgreSQL again with a notice: its rows are
 * written in the same transaction as every change, so nothing is missing from it.
 */
import { config } from "../config";
import { loggableError, logger } from "../logger";
import { MeilisearchEngine } from "./meilisearch";
import { PostgresSearchEngine } from "./postgres";
import type { SearchDocument, SearchEngine, SearchFilters, SearchResult } from "./types";

export const FALLBACK_NOTICE = "Search is running on the fallback engine; results may rank differently";

export class FallbackSearchEngine implements SearchEngine {
  readonly name: "meilisearch" = "meilisearch";

  constructor(
    readonly primary: SearchEngine,
    readonly fallback: SearchEngine,
    private readonly onFallback: (error: unknown) => void = () => {},
  ) {}

  async search(teamId: string, query: string, filters?: SearchFilters): Promise<SearchResult> {
    try {
      return await this.primary.search(teamId, query, filters);
    } catch (error) {
      this.onFallback(error);
      return { ...(await this.fallback.search(teamId, query, filters)), notice: FALLBACK_NOTICE };
    }
  }

  /** Writes go to the primary only: PostgreSQL's rows are written with the change itself. */
  index(doc: SearchDocument): Promise<void> {
    return this.primary.index(doc);
  }

  remove(id: string): Promise<void> {
    return this.primary.remove(id);
  }
}

let meili: { key: string; engine: MeilisearchEngine } | undefined;

/**
 * The Meilisearch engine when configured. One per process, so its index settings are sent
 * once rather than before every copy (a settings change can make Meilisearch re-index);
 * it holds an HTTP client and nothing the other servers would need to share.
 */
export function meilisearchEngine(): MeilisearchEngine | undefined {
  const { MEILI_HOST, MEILI_KEY, MEILI_INDEX } = config();
  if (!MEILI_HOST) return undefined;
  const key = `${MEILI_HOST}|${MEILI_INDEX}`;
  if (meili?.key !== key) meili = { key, engine: new MeilisearchEngine({ host: MEILI_HOST, apiKey: MEILI_KEY, indexName: MEILI_INDEX }) };
  return meili.engine;
}

/** The engine searches go through: PostgreSQL, or Meilisearch with PostgreSQL as its fallback. */
export function searchEngine(): SearchEngine {
  const primary = meilisearchEngine();
  const postgres = new PostgresSearchEngine();
  return primary ? new FallbackSearchEngine(primary, postgres, (error) => logger().warn({ err: loggableError(error) }, "[search] Meilisearch unreachable, answering from PostgreSQL")) : postgres;
}
