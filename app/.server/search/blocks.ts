/**
 * Parameter search: blocks of the team's latest revisions by calculator and numeric
 * ranges on inputs (SI, as parsed) or results (SI `value`), e.g. every lc-filter with
 * f0 between 1 kHz and 3 kHz. Straight SQL over revision_block.
 */
import { sql, type SQL } from "drizzle-orm";
import { getCalculator } from "~/lib/calc/registry";
import { db } from "../db/client";

export interface BlockRange {
  /** An input key (e.g. "fsw") or a scalar result key (e.g. "f0"). */
  field: string;
  /** Bounds in SI units, inclusive; either may be left out. */
  min?: number;
  max?: number;
  of: "inputs" | "results";
}

export interface BlockQuery {
  calculator: string;
  ranges: BlockRange[];
  verifiedOnly?: boolean;
  projectId?: string;
  limit?: number;
}

export interface BlockHit {
  sheetId: string;
  sheetNumber: number;
  title: string;
  projectCode: string | null;
  revisionLabel: string;
  state: string;
  blockId: string;
  calculator: string;
  /** Each ranged field's SI value in this block. */
  values: Record<string, number>;
}

/** A parameter query that names an unknown calculator or field; the route answers 400 with the message. */
export class BlockQueryError extends Error {}

function checkQuery(query: BlockQuery) {
  const calculator = getCalculator(query.calculator);
  if (!calculator) throw new BlockQueryError(`There is no calculator "${query.calculator}".`);
  for (const range of query.ranges) {
    const known =
      range.of === "inputs"
        ? calculator.inputs.some((i) => i.key === range.field && i.kind === "quantity")
        : calculator.outputs.some((o) => o.key === range.field && o.kind === "scalar");
    if (!known) throw new BlockQueryError(`${calculator.id} has no numeric ${range.of === "inputs" ? "input" : "result"} "${range.field}".`);
    if (range.min !== undefined && range.max !== undefined && range.min > range.max) throw new BlockQueryError(`The range for ${range.field} runs from ${range.min} down to ${range.max}.`);
  }
}

function valueOf(range: BlockRange): SQL {
  const path = range.of === "results" ? sql`b.results -> ${range.field} -> 'value'` : sql`b.parsed_inputs -> ${range.field}`;
  return sql`(case when jsonb_typeof(${path}) = 'number' then (${path})::text::float8 end)`;
}

export async function findBlocks(teamId: string, query: BlockQuery): Promise<BlockHit[]> {
  checkQuery(query);
  const conditions: SQL[] = [sql`b.team_id = ${teamId}`, sql`s.team_id = ${teamId}`, sql`b.calculator = ${query.calculator}`, sql`b.ok`];
  if (query.verifiedOnly) conditions.push(sql`r.state = 'verified'`);
  if (query.projectId) conditions.push(sql`s.project_id = ${query.projectId}`);
  for (const range of query.ranges) {
    if (range.min !== undefined) conditions.push(sql`${valueOf(range)} >= ${range.min}`);
    if (range.max !== undefined) conditions.push(sql`${valueOf(range)} <= ${range.max}`);
  }
  const values = query.ranges.length
    ? sql.join(query.ranges.map((r) => sql`${r.field}::text, ${valueOf(r)}`), sql`, `)
    : sql``;
  const limit = Math.min(500, Math.max(1, Math.trunc(query.limit ?? 100)));
  const rows = await db().execute<{
    sheet_id: string;
    number: number;
    title: string;
    project_code: string | null;
    label: string;
    state: string;
    block_id: string;
    calculator: string;
    values: Record<string, number> | null;
  }>(sql`
    select s.id as sheet_id, s.number, s.title, p.code as project_code, r.label, r.state, b.block_id, b.calculator,
      ${query.ranges.length ? sql`jsonb_build_object(${values})` : sql`'{}'::jsonb`} as values
    from revision_block b
    join calc_sheet s on s.latest_revision_id = b.revision_id
    join sheet_revision r on r.id = b.revision_id
    left join project p on p.id = s.project_id
    where ${sql.join(conditions, sql` and `)}
    order by s.number, b.position
    limit ${limit}`);
  return rows.rows.map((r) => ({
    sheetId: r.sheet_id,
    sheetNumber: r.number,
    title: r.title,
    projectCode: r.project_code,
    revisionLabel: r.label,
    state: r.state,
    blockId: r.block_id,
    calculator: r.calculator,
    values: r.values ?? {},
  }));
}
