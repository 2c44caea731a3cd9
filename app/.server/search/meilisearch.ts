/**
 * Search on Meilisearch through its SDK, for teams too large for PostgreSQL search.
 * The index holds every team's documents; every query filters by teamId, and hits of
 * another team are dropped again here in case a filter were ever wrong.
 */
import { Meilisearch, type Index, type Task } from "meilisearch";
import { HIT_START, HIT_STOP, markedToSegments, shownBlockValues, type SnippetSegment } from "~/lib/search/document-text";
import { pageOf, TOTAL_CAP, type SearchDocument, type SearchEngine, type SearchFilters, type SearchResult } from "./types";

/** A search document as Meilisearch stores it: dates as epoch seconds so they can be filtered. */
export type MeiliDocument = Omit<SearchDocument, "updatedAt"> & { updatedAt: number };

export const MEILI_SETTINGS = {
  searchableAttributes: ["title", "keywords", "body", "blockValues"],
  filterableAttributes: ["teamId", "kind", "state", "projectId", "calculators", "authorIds", "updatedAt"],
  sortableAttributes: ["updatedAt"],
};

export function toMeiliDocument(doc: SearchDocument): MeiliDocument {
  return { ...doc, updatedAt: Math.floor(doc.updatedAt.getTime() / 1000) };
}

/** Quotes a value for a Meilisearch filter expression. */
function quoted(value: string): string {
  return `"${value.replace(/\\/g, "\\\\").replace(/"/g, '\\"')}"`;
}

export function meiliFilter(teamId: string, filters: SearchFilters): string[] {
  const parts = [`teamId = ${quoted(teamId)}`];
  if (filters.kind) parts.push(`kind = ${quoted(filters.kind)}`);
  if (filters.verifiedOnly) parts.push(`state = "verified"`);
  if (filters.projectId) parts.push(`projectId = ${quoted(filters.projectId)}`);
  if (filters.calculator) parts.push(`calculators = ${quoted(filters.calculator)}`);
  if (filters.authorId) parts.push(`authorIds = ${quoted(filters.authorId)}`);
  if (filters.updatedFrom) parts.push(`updatedAt >= ${Math.floor(filters.updatedFrom.getTime() / 1000)}`);
  if (filters.updatedBefore) parts.push(`updatedAt < ${Math.ceil(filters.updatedBefore.getTime() / 1000)}`);
  return parts;
}

async function succeeded(task: Promise<Task>): Promise<void> {
  const done = await task;
  if (done.status !== "succeeded") throw new Error(`Meilisearch task ${done.uid} ${done.status}: ${done.error?.message ?? "no reason given"}`);
}

export class MeilisearchEngine implements SearchEngine {
  readonly name = "meilisearch" as const;
  private readonly client: Meilisearch;
  private readonly documents: Index<MeiliDocument>;
  private prepared: Promise<void> | undefined;

  constructor(options: { host: string; apiKey?: string; indexName: string; timeoutMs?: number }) {
    this.client = new Meilisearch({ host: options.host, apiKey: options.apiKey, timeout: options.timeoutMs ?? 2_000 });
    this.documents = this.client.index<MeiliDocument>(options.indexName);
  }

  /** Creates the index with its settings; idempotent, done once per process before the first write. */
  prepare(): Promise<void> {
    this.prepared ??= (async () => {
      await succeeded(this.documents.updateSettings(MEILI_SETTINGS).waitTask());
    })().catch((error) => {
      this.prepared = undefined;
      throw error;
    });
    return this.prepared;
  }

  async search(teamId: string, query: string, filters: SearchFilters = {}): Promise<SearchResult> {
    const { limit, offset } = pageOf(filters);
    const response = await this.documents.search(query.trim(), {
      filter: meiliFilter(teamId, filters),
      limit,
      offset,
      matchingStrategy: "all",
      attributesToRetrieve: ["id", "kind", "teamId", "number", "title", "projectCode", "state", "revisionLabel"],
      attributesToHighlight: ["body", "blockValues"],
      // Block values are never cropped: the hit's line is cut to its shown half below.
      attributesToCrop: ["body"],
      cropLength: 24,
      highlightPreTag: HIT_START,
      highlightPostTag: HIT_STOP,
      showRankingScore: true,
      ...(query.trim() ? {} : { sort: ["updatedAt:desc"] }),
    });
    const hits = response.hits
      .filter((hit) => hit.teamId === teamId)
      .map((hit) => {
        const formatted = (hit._formatted ?? {}) as Partial<Record<"body" | "blockValues", string>>;
        const values = formatted.blockValues?.includes(HIT_START) ? shownBlockValues(formatted.blockValues, HIT_START) : undefined;
        const marked = formatted.body?.includes(HIT_START) ? formatted.body : (values ?? formatted.body ?? "");
        const snippet: SnippetSegment[] = markedToSegments(marked, HIT_START, HIT_STOP);
        return {
          id: hit.id,
          kind: hit.kind as "sheet" | "document",
          sheetNumber: hit.number,
          title: hit.title,
          projectCode: hit.projectCode ?? null,
          state: hit.state,
          revisionLabel: hit.revisionLabel ?? null,
          snippet,
          score: hit._rankingScore ?? 0,
        };
      });
    const total = response.estimatedTotalHits ?? hits.length;
    return { hits, total: Math.min(total, TOTAL_CAP), totalIsEstimate: total > TOTAL_CAP, engine: "meilisearch" };
  }

  async index(doc: SearchDocument): Promise<void> {
    await this.indexMany([doc]);
  }

  async indexMany(docs: SearchDocument[]): Promise<void> {
    if (docs.length === 0) return;
    await this.prepare();
    await succeeded(this.documents.addDocuments(docs.map(toMeiliDocument), { primaryKey: "id" }).waitTask({ timeout: 30_000 }));
  }

  async remove(id: string): Promise<void> {
    await this.prepare();
    await succeeded(this.documents.deleteDocument(id).waitTask());
  }

  async removeAll(): Promise<void> {
    await this.prepare();
    await succeeded(this.documents.deleteAllDocuments().waitTask({ timeout: 30_000 }));
  }
}
