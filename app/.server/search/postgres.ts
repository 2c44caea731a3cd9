/**
 * Search on PostgreSQL alone: websearch_to_tsquery (quotes, OR, -word), weighted
 * ranking and ts_headline snippets. Where the RUM extension is installed, its index
 * hands back rows already in rank order, so a query of common words ranks only the
 * page it returns; elsewhere the GIN index finds the matches and ts_rank orders them.
 */
import { and, eq, lt, sql, type SQL } from "drizzle-orm";
import { calculators } from "~/lib/calc/registry";
import { readQuantity } from "~/lib/calc/units";
import { HIT_START, HIT_STOP, markedToSegments, matchedBlockLine, scopeValueWords, SEARCH_TEXT_VERSION } from "~/lib/search/document-text";
import { db, type Database } from "../db/client";
import { searchDocument } from "../db/schema";
import { upsertSearchDocument } from "./indexer";
import { pageOf, TOTAL_CAP, type SearchDocument, type SearchEngine, type SearchFilters, type SearchResult } from "./types";

const HEADLINE_OPTIONS = `StartSel=${HIT_START}, StopSel=${HIT_STOP}, MaxWords=24, MinWords=10, MaxFragments=2, FragmentDelimiter=" … "`;
/** The prose around the matches, or else the block line the query found, as its values were typed. */
function snippetText(row: Pick<Row, "headline" | "block_values">, query: string): string {
  if (row.headline?.includes(HIT_START) || !row.block_values) return row.headline ?? "";
  return matchedBlockLine(row.block_values, query) ?? row.headline ?? "";
}

/** `'dc-link' <-> 'dc' <-> 'link'` in a tsquery's text form. */
const COMPOUND_PHRASE = `('[^' ]+-[^' ]+')( <-> '[^' ]+')+`;

/** Teams whose search rows were all current when last asked; rows are only ever written current. */
const currentTextTeams = new Set<string>();

let valueScopes: Set<string> | undefined;
/** Whether a word names a calculator, or an input or result of one: a scope for a value ("vdc", "lc-filter"). */
function isValueScope(word: string): boolean {
  valueScopes ??= new Set(calculators.flatMap((c) => [c.id, ...c.inputs.map((i) => i.key), ...c.outputs.map((o) => o.key)]).map((w) => w.toLowerCase()));
  return valueScopes.has(word.toLowerCase());
}

/** Rows read in the index's rank order and re-ranked with ts_rank beyond the page asked for. */
const RANK_WINDOW = 100;

let rankIndex: Promise<boolean> | undefined;

/** Whether this database has the rank-order (RUM) index; asked once per process. */
export function hasRankOrderIndex(database: Database = db()): Promise<boolean> {
  rankIndex ??= database
    .execute<{ present: boolean }>(sql`select exists (select 1 from pg_indexes where indexname = 'search_document_rank_idx') as present`)
    .then((r) => Boolean(r.rows[0]?.present))
    .catch((error) => {
      rankIndex = undefined;
      throw error;
    });
  return rankIndex;
}

function filterConditions(teamId: string, filters: SearchFilters): SQL[] {
  const conditions: SQL[] = [sql`d.team_id = ${teamId}`];
  if (filters.kind) conditions.push(sql`d.kind = ${filters.kind}`);
  if (filters.verifiedOnly) conditions.push(sql`d.state = 'verified'`);
  if (filters.projectId) conditions.push(sql`d.project_id = ${filters.projectId}`);
  if (filters.calculator) conditions.push(sql`d.calculators @> array[${filters.calculator}]::text[]`);
  if (filters.authorId) conditions.push(sql`d.author_ids @> array[${filters.authorId}]::text[]`);
  if (filters.updatedFrom) conditions.push(sql`d.updated_at >= ${filters.updatedFrom.toISOString()}`);
  if (filters.updatedBefore) conditions.push(sql`d.updated_at < ${filters.updatedBefore.toISOString()}`);
  return conditions;
}

interface Row extends Record<string, unknown> {
  id: string;
  kind: "sheet" | "document";
  number: number;
  title: string;
  project_code: string | null;
  state: string;
  revision_label: string | null;
  score: number;
  headline: string;
  /** Block values, for the snippet when the prose holds no match. */
  block_values?: string;
  candidates?: number;
}

export class PostgresSearchEngine implements SearchEngine {
  readonly name = "postgres" as const;

  /** `rankOrderIndex: false` ranks as on a server without RUM, whatever this one has. */
  constructor(
    private readonly database: Database = db(),
    private readonly options: { rankOrderIndex?: boolean } = {},
  ) {}

  private useRankOrderIndex(): Promise<boolean> {
    return this.options.rankOrderIndex === false ? Promise.resolve(false) : hasRankOrderIndex(this.database);
  }

  async search(teamId: string, query: string, filters: SearchFilters = {}): Promise<SearchResult> {
    const text = query.trim();
    // "vdc 400 V" means the sheets whose vdc is 400 V: matched through the one scoped word the
    // index holds for it. Should that find nothing (a value spelled in a way the words do not
    // cover), the words as typed answer.
    const scoped = (await this.hasCurrentText(teamId)) ? scopeValueWords(text, isValueScope, readQuantity) : text;
    const result = await this.searchMatching(teamId, text, scoped, filters);
    return result.hits.length === 0 && scoped !== text ? this.searchMatching(teamId, text, text, filters) : result;
  }

  /** Whether every search row of the team holds the current text (named values); once true, stays true. */
  private async hasCurrentText(teamId: string): Promise<boolean> {
    if (currentTextTeams.has(teamId)) return true;
    const [outdated] = await this.database
      .select({ id: searchDocument.id })
      .from(searchDocument)
      .where(and(eq(searchDocument.teamId, teamId), lt(searchDocument.textVersion, SEARCH_TEXT_VERSION)))
      .limit(1);
    if (!outdated) currentTextTeams.add(teamId);
    return !outdated;
  }

  private async searchMatching(teamId: string, text: string, matching: string, filters: SearchFilters): Promise<SearchResult> {
    const { limit, offset } = pageOf(filters);
    const where = sql.join(filterConditions(teamId, filters), sql` and `);
    // A hyphenated word ("dc-link", "quasi-square") parses as the whole word followed by its
    // parts as a phrase; the whole word is indexed wherever the parts are, so it alone finds
    // the same sheets without the costly position checks of a phrase. Quoted phrases are
    // left alone: their words chain on with the same operator.
    // Matching and the index's order use that form; the scores shown, as typed.
    const ranking = sql`websearch_to_tsquery('sinewright', ${text})`;
    const matched = sql`websearch_to_tsquery('sinewright', ${matching})`;
    const tsquery = text.includes('"') ? sql`(select ${matched})` : sql`(select regexp_replace(${matched}::text, ${COMPOUND_PHRASE}, ${"\\1"}, 'g')::tsquery)`;
    const columns = sql`d.id, d.kind, d.number, d.title, d.project_code, d.state, d.revision_label`;
    let rows: Row[];
    let counted: { total: number; totalIsEstimate: boolean };
    if (!text) {
      // No words: the newest first, opening lines as the snippet.
      const page = sql`select ${columns}, 0::float8 as score, left(d.body, 200) as headline from search_document d where ${where} order by d.updated_at desc, d.id limit ${limit} offset ${offset}`;
      rows = (await this.database.execute<Row>(page)).rows;
      counted = await this.countMatches(text, rows, sql`select 1 from search_document d where ${where}`, 0);
    } else {
      const matches = sql`select 1 from search_document d, ${tsquery} as q(query) where ${where} and d.search @@ q.query`;
      // Snippets only for the page: ts_headline re-parses the text, so it runs on the few rows shown.
      const rankedPage = (candidates: SQL) => sql`
        select p.*, ts_headline('sinewright', p.body, ${ranking}, ${HEADLINE_OPTIONS}) as headline
        from (
          select c.id, c.kind, c.number, c.title, c.project_code, c.state, c.revision_label, c.body, c.block_values,
            ts_rank(c.search, ${ranking})::float8 as score, count(*) over ()::int as candidates
          from (${candidates}) c
          order by score desc, c.id
          limit ${limit} offset ${offset}
        ) p
        order by p.score desc, p.id`;
      const window = offset + limit + RANK_WINDOW;
      if (await this.useRankOrderIndex()) {
        // With the rank-order index, read the first RANK_WINDOW rows in its order (it scores inside
        // the index, never visiting the table), then order those by ts_rank, so scores are the same
        // as without the index. Its own score equals ts_rank for one word and differs a little for
        // several, hence the window.
        // First the head tier: sheets holding every word in their title or keywords, where a word
        // weighs most. A query of common words matches most sheets and ranking them all costs tens
        // of milliseconds; its best-ranked sheets are these, and the head index lists far fewer.
        // When the tier cannot fill the page (rare words, values, a page far down), every match.
        // (Nothing asks for a page past the first today; paging through both would need the tiers
        // joined end to end — the head first, then the rest — so no sheet shows twice.)
        const head = await this.database.execute<Row>(
          rankedPage(sql`select d.* from search_document d, ${tsquery} as q(query)
                 where ${where} and d.search_head @@ q.query and d.search @@ q.query
                 order by d.search_head <=> q.query
                 limit ${window}`),
        );
        const headFills = (head.rows[0]?.candidates ?? 0) >= offset + limit;
        rows = headFills
          ? head.rows
          : (
              await this.database.execute<Row>(
                rankedPage(sql`select d.* from search_document d, ${tsquery} as q(query)
                       where ${where} and d.search @@ q.query
                       order by d.search <=> q.query
                       limit ${window}`),
              )
            ).rows;
        counted = await this.countMatches(text, rows, matches, headFills ? Number.POSITIVE_INFINITY : window);
      } else {
        // Without the index: ts_rank over every match.
        rows = (await this.database.execute<Row>(rankedPage(sql`select d.* from search_document d, ${tsquery} as q(query) where ${where} and d.search @@ q.query`))).rows;
        counted = await this.countMatches(text, rows, matches, Number.NaN);
      }
    }
    return {
      hits: rows.map((r) => ({
        id: r.id,
        kind: r.kind,
        sheetNumber: r.number,
        title: r.title,
        projectCode: r.project_code,
        state: r.state,
        revisionLabel: r.revision_label,
        snippet: markedToSegments(snippetText(r, text), HIT_START, HIT_STOP),
        score: Number(r.score) || 0,
      })),
      ...counted,
      engine: "postgres",
    };
  }

  /**
   * How many match. Counting every match of a common word costs as much as ranking them all,
   * so: exact when the ranked rows were all the matches (fewer than the window read; without the
   * rank-order index `window` is NaN and every match was ranked), else PostgreSQL's own estimate
   * (as Meilisearch gives one); with no words, an exact count up to TOTAL_CAP.
   */
  private async countMatches(text: string, page: Row[], matches: SQL, window: number): Promise<{ total: number; totalIsEstimate: boolean }> {
    const candidates = page[0]?.candidates;
    if (text && candidates !== undefined) {
      if (Number.isNaN(window) || candidates < window) return { total: candidates, totalIsEstimate: false };
      const plan = await this.database.execute<{ "QUERY PLAN": [{ Plan: { "Plan Rows": number } }] }>(sql`explain (format json) ${matches}`);
      const estimate = Math.round(plan.rows[0]?.["QUERY PLAN"][0]?.Plan["Plan Rows"] ?? 0);
      return { total: Math.max(estimate, candidates), totalIsEstimate: true };
    }
    const counted = await this.database.execute<{ n: number }>(sql`select count(*)::int as n from (${matches} limit ${TOTAL_CAP + 1}) m`);
    const n = counted.rows[0]?.n ?? 0;
    return { total: Math.min(n, TOTAL_CAP), totalIsEstimate: n > TOTAL_CAP };
  }

  async index(doc: SearchDocument): Promise<void> {
    await upsertSearchDocument(this.database, doc);
  }

  async remove(id: string): Promise<void> {
    await this.database.delete(searchDocument).where(eq(searchDocument.id, id));
  }
}
