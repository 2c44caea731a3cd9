import { afterAll, beforeAll, describe, expect, it } from "vitest";
// @ts-expect-error -- a plain ES module script without types
import { createFakeMeilisearch } from "../../scripts/fake-meilisearch.mjs";

// This file's server modules use Meilisearch: the local stand-in, run here so the fallback
// case can stop it and start it again (its documents survive, as Meilisearch's do on disk).
const MEILI_KEY = "search-contract-key";
const fake = createFakeMeilisearch({ apiKey: MEILI_KEY });
const meiliPort: number = await fake.listen(0);
process.env.MEILI_HOST = `http://127.0.0.1:${meiliPort}`;
process.env.MEILI_KEY = MEILI_KEY;
process.env.MEILI_INDEX = `contract_${Math.random().toString(36).slice(2, 8)}`;
afterAll(() => fake.close());

const { db } = await import("../../app/.server/db/client");
const { member, organization, outbox, project, searchDocument } = await import("../../app/.server/db/schema");
const { SEARCH_TEXT_VERSION } = await import("../../app/lib/search/document-text");
const { auth } = await import("../../app/.server/auth");
const { createSheet, saveRevision, updateSheetDetails } = await import("../../app/.server/sheets");
const { stampRevision, submitForCheck } = await import("../../app/.server/review");
const { drainOutbox } = await import("../../app/.server/mail/outbox");
const { search, findBlocks, BlockQueryError, FALLBACK_NOTICE } = await import("../../app/.server/search");
const { PostgresSearchEngine } = await import("../../app/.server/search/postgres");
const { meilisearchEngine } = await import("../../app/.server/search/engine");
const { rebuildOutdatedSearchText, reindexSearch } = await import("../../app/.server/search/reindex");
const { and, eq, isNull, sql } = await import("drizzle-orm");
type Member = import("../../app/.server/access").Member;
type SearchEngine = import("../../app/.server/search/types").SearchEngine;

async function person(email: string, name: string) {
  const created = await auth().api.signUpEmail({ body: { email, password: "long-enough-password", name } });
  return { id: created.user.id, name, email };
}

async function team(name: string) {
  const teamId = crypto.randomUUID();
  await db().insert(organization).values({ id: teamId, name, slug: `${name.toLowerCase().replace(/\W+/g, "-")}-${teamId.slice(0, 6)}`, createdAt: new Date() });
  const author = await person(`author-${teamId.slice(0, 6)}@search.example`, `${name} Author`);
  const checker = await person(`checker-${teamId.slice(0, 6)}@search.example`, `${name} Checker`);
  await db().insert(member).values([
    { id: crypto.randomUUID(), organizationId: teamId, userId: author.id, role: "engineer", createdAt: new Date() },
    { id: crypto.randomUUID(), organizationId: teamId, userId: checker.id, role: "checker", createdAt: new Date() },
  ]);
  const as = (u: typeof author, role: "engineer" | "checker"): Member => {
    const t = { teamId, teamName: name, teamSlug: name, role };
    return { user: u, team: t, teams: [t], via: "session" };
  };
  return { teamId, author, checker, asAuthor: as(author, "engineer"), asChecker: as(checker, "checker") };
}

type Team = Awaited<ReturnType<typeof team>>;

async function sheet(t: Team, input: { title: string; projectId?: string | null; tags?: string[]; source: string; verify?: boolean }) {
  const created = await createSheet(t.asAuthor, { title: input.title, projectId: input.projectId ?? null, tags: input.tags ?? [] });
  const saved = await saveRevision(t.asAuthor, created, { source: input.source, baseRevisionId: null, note: "" });
  if (!saved.ok) throw new Error(JSON.stringify(saved));
  if (input.verify) {
    await submitForCheck(t.asAuthor, saved.revisionId, t.checker.id);
    await stampRevision(t.asChecker, saved.revisionId);
  }
  return { ...created, revisionId: saved.revisionId };
}

/** Copies everything queued to Meilisearch, as the outbox worker does. */
async function drainSearchCopies() {
  await db().update(outbox).set({ nextAttemptAt: new Date() }).where(and(eq(outbox.kind, "search-index"), isNull(outbox.sentAt)));
  for (let i = 0; i < 50; i++) {
    const { sent } = await drainOutbox(100);
    const [pending] = await db().select({ id: outbox.id }).from(outbox).where(and(eq(outbox.kind, "search-index"), isNull(outbox.sentAt))).limit(1);
    if (!pending) return;
    if (sent === 0) throw new Error("search copies are stuck in the outbox");
  }
}

let larkA: Team;
let other: Team;
const ids: Record<string, { id: string; number: number }> = {};
let pumpProjectId: string;

beforeAll(async () => {
  larkA = await team("Kestrel Drives");
  other = await team("Brackwater Power");
  const [pump] = await db().insert(project).values({ teamId: larkA.teamId, code: "PUMP-3K", name: "Borehole pump inverter" }).returning();
  const [ups] = await db().insert(project).values({ teamId: larkA.teamId, code: "UPS-48", name: "Backup supply" }).returning();
  pumpProjectId = pump!.id;

  ids.outputFilter = await sheet(larkA, {
    title: "Output filter for the pump inverter",
    projectId: pump!.id,
    tags: ["output", "magnetics"],
    source: `## Purpose\n\nSize the LC stage with enough resonance damping for the motor cable.\n\n<LcFilter id="lc1" l="1 mH" c="10 uF" rLoad="10 ohm" fsw="20 kHz" vout="230 V" />\n`,
    verify: true,
  });
  ids.steppedWave = await sheet(larkA, {
    title: "Backup supply stepped wave",
    projectId: ups!.id,
    tags: ["ups"],
    source: `The battery link feeds a push-pull stage.\n\n<QuasiSquare id="qs1" vdc="48 V" alpha="30 deg" />\n`,
  });
  ids.groundPower = await sheet(larkA, {
    title: "Ground power output stage",
    tags: ["aircraft"],
    source: `A smaller capacitor bank for the airfield unit.\n\n<LcFilter id="lc1" l="0.2 mH" c="20 uF" rLoad="8 ohm" fsw="16 kHz" />\n`,
  });
  ids.lowCorner = await sheet(larkA, {
    title: "Slow corner study",
    tags: [],
    source: `A very large capacitor for comparison.\n\n<LcFilter id="lc1" l="1 mH" c="100 uF" rLoad="10 ohm" fsw="10 kHz" />\n`,
    verify: true,
  });
  // Another team's sheet with the same words and values: never found from the first team.
  ids.otherTeam = await sheet(other, {
    title: "Output filter for the pump inverter",
    tags: ["output"],
    source: `Resonance damping, the same words in another firm.\n\n<LcFilter id="lc1" l="1 mH" c="10 uF" rLoad="10 ohm" fsw="20 kHz" />\n\n<QuasiSquare id="qs1" vdc="48 V" alpha="30 deg" />\n`,
    verify: true,
  });
  await drainSearchCopies();
});

const engines: [string, () => SearchEngine][] = [
  ["PostgreSQL", () => new PostgresSearchEngine()],
  ["PostgreSQL without the RUM extension", () => new PostgresSearchEngine(db(), { rankOrderIndex: false })],
  ["Meilisearch (local stand-in)", () => meilisearchEngine()!],
];

describe.each(engines)("search contract on %s", (_name, engineOf) => {
  const numbers = async (query: string, filters = {}, teamId = larkA.teamId) => (await engineOf().search(teamId, query, filters)).hits.map((h) => h.sheetNumber);

  it("finds sheets by title words, prose, tags and project code", async () => {
    expect(await numbers("stepped wave")).toEqual([ids.steppedWave!.number]);
    expect(await numbers("resonance damping")).toEqual([ids.outputFilter!.number]);
    expect(await numbers("aircraft")).toEqual([ids.groundPower!.number]);
    expect(await numbers("UPS-48")).toEqual([ids.steppedWave!.number]);
  });

  it("finds sheets by calculator id as typed", async () => {
    expect(await numbers("quasi-square")).toEqual([ids.steppedWave!.number]);
    expect((await numbers("lc-filter")).sort()).toEqual([ids.outputFilter!.number, ids.groundPower!.number, ids.lowCorner!.number].sort());
    expect(await engineOf().search(larkA.teamId, "lc-filter")).toMatchObject({ total: 3, totalIsEstimate: false });
  });

  it("finds block values the way engineers type them", async () => {
    expect((await numbers("fsw 20 kHz"))[0]).toBe(ids.outputFilter!.number);
    expect(await numbers("20kHz")).toEqual([ids.outputFilter!.number]);
    expect((await numbers("quasi-square 48 V"))[0]).toBe(ids.steppedWave!.number);
    // A result as the sheet shows it: the filter's corner frequency.
    expect(await numbers("f0 1.59 kHz")).toEqual([ids.outputFilter!.number]);
  });

  it("filters to verified sheets, a project or a calculator", async () => {
    expect((await numbers("lc-filter", { verifiedOnly: true })).sort()).toEqual([ids.outputFilter!.number, ids.lowCorner!.number].sort());
    expect(await numbers("lc-filter", { projectId: pumpProjectId })).toEqual([ids.outputFilter!.number]);
    expect(await numbers("", { calculator: "quasi-square" })).toEqual([ids.steppedWave!.number]);
    expect(await numbers("", { authorId: other.author.id })).toEqual([]);
    expect((await numbers("lc-filter", { authorId: larkA.author.id })).length).toBe(3);
    expect(await numbers("lc-filter", { updatedFrom: new Date(Date.now() + 60_000) })).toEqual([]);
    expect((await numbers("lc-filter", { updatedBefore: new Date(Date.now() + 60_000) })).length).toBe(3);
  });

  it("shows state and revision, and a snippet with the matches marked", async () => {
    const { hits } = await engineOf().search(larkA.teamId, "damping");
    expect(hits).toHaveLength(1);
    expect(hits[0]).toMatchObject({ title: "Output filter for the pump inverter", projectCode: "PUMP-3K", state: "verified", revisionLabel: "A" });
    const marked = hits[0]!.snippet.filter((s) => s.hit).map((s) => s.text.toLowerCase());
    expect(marked).toContain("damping");
    expect(hits[0]!.snippet.map((s) => s.text).join("")).toContain("resonance");
  });

  it("shows a value hit as its block with the values as typed, never the extra spellings it was found by", async () => {
    const { hits } = await engineOf().search(larkA.teamId, "16khz");
    expect(hits.map((h) => h.id)).toEqual([ids.groundPower!.id]);
    const text = hits[0]!.snippet.map((s) => s.text).join("");
    expect(text).toMatch(/^lc1 · .*\(lc-filter\): .*fsw 16 kHz/);
    expect(text).not.toMatch(/16000 hz|\u001f/);
  });

  it("never returns another team's sheets", async () => {
    for (const query of ["output filter pump inverter", "resonance damping", "fsw 20 kHz", "quasi-square 48 V", ""]) {
      const mine = await engineOf().search(larkA.teamId, query);
      expect(mine.hits.map((h) => h.id)).not.toContain(ids.otherTeam!.id);
      const theirs = await engineOf().search(other.teamId, query);
      expect(theirs.hits.map((h) => h.id)).toEqual([ids.otherTeam!.id]);
    }
  });
});

describe.each(engines.slice(0, 2))("values named by their input on %s", (_name, engineOf) => {
  const numbers = async (query: string) => (await engineOf().search(larkA.teamId, query)).hits.map((h) => h.sheetNumber).sort();

  it("reads \"fsw 10 kHz\" as the sheets whose fsw is 10 kHz, not every sheet holding 10, kHz and fsw somewhere", async () => {
    // The output filter has fsw 20 kHz with 10 uF and 10 ohm: all three words, but not that value.
    expect(await numbers("fsw 10 kHz")).toEqual([ids.lowCorner!.number]);
    expect(await numbers("fsw 10000 Hz")).toEqual([ids.lowCorner!.number]);
    expect(await numbers("rLoad 10 ohm")).toEqual([ids.outputFilter!.number, ids.lowCorner!.number].sort());
    expect(await numbers("c 10000 nF")).toEqual([ids.outputFilter!.number]);
    expect(await numbers("lc-filter 20 uF")).toEqual([ids.groundPower!.number]);
  });

  it("answers with the words as typed when no sheet holds the value under that name", async () => {
    // No fsw is 20 V; the words fsw, 20 and V are all in the output filter sheet.
    expect(await numbers("fsw 20 V")).toContain(ids.outputFilter!.number);
  });
});

describe("search rows from an older version", () => {
  it("are rebuilt at start, and until then values are found by the words as typed", async () => {
    const t = await team("Upgraded Drives");
    const made = await sheet(t, { title: "Battery stage before the upgrade", source: `<QuasiSquare id="qs1" vdc="36 V" alpha="30 deg" />\n` });
    // As an older version wrote it: no named values, an older text version.
    await db().execute(sql`update search_document set text_version = 1, block_values = regexp_replace(block_values, '\\m(vdc|alpha|quasisquare)[0-9.]+\\S*', '', 'g') where sheet_id = ${made.id}`);
    const engine = new PostgresSearchEngine();
    expect((await engine.search(t.teamId, "vdc 36 V")).hits.map((h) => h.sheetNumber)).toEqual([made.number]);
    expect(await rebuildOutdatedSearchText(() => {})).toBeGreaterThan(0);
    const [row] = await db().select().from(searchDocument).where(eq(searchDocument.sheetId, made.id));
    expect(row!.textVersion).toBe(SEARCH_TEXT_VERSION);
    expect(row!.blockValues).toContain("vdc36v");
    expect((await engine.search(t.teamId, "vdc 36 V")).hits.map((h) => h.sheetNumber)).toEqual([made.number]);
    // Nothing older is left: a second start rebuilds nothing.
    expect(await rebuildOutdatedSearchText(() => {})).toBe(0);
  });
});

describe("search through the app", () => {
  it("answers from Meilisearch when it is configured", async () => {
    const result = await search(larkA.teamId, "stepped wave");
    expect(result.engine).toBe("meilisearch");
    expect(result.notice).toBeUndefined();
    expect(result.hits.map((h) => h.sheetNumber)).toEqual([ids.steppedWave!.number]);
  });

  it("keeps a renamed sheet findable by its new title", async () => {
    await updateSheetDetails(larkA.asAuthor, ids.groundPower!.id, { title: "Airfield ground power output stage", projectId: null, tags: ["aircraft"] });
    await drainSearchCopies();
    expect((await search(larkA.teamId, "airfield")).hits.map((h) => h.sheetNumber)).toEqual([ids.groundPower!.number]);
  });

  it("falls back to PostgreSQL with a notice while Meilisearch is down, and catches up when it returns", async () => {
    await fake.close();
    const base = await latestRevisionOf(ids.steppedWave!.id);
    const saved = await saveRevision(larkA.asAuthor, { id: ids.steppedWave!.id, latestRevisionId: base }, {
      source: `The battery link feeds a push-pull stage through a zircon-potted transformer.\n\n<QuasiSquare id="qs1" vdc="48 V" alpha="30 deg" />\n`,
      baseRevisionId: base,
      note: "transformer potting",
    });
    expect(saved.ok).toBe(true);

    const during = await search(larkA.teamId, "zircon");
    expect(during.engine).toBe("postgres");
    expect(during.notice).toBe(FALLBACK_NOTICE);
    expect(during.hits.map((h) => [h.sheetNumber, h.revisionLabel])).toEqual([[ids.steppedWave!.number, "B"]]);
    // The copy waits in the outbox.
    await drainOutbox(100);
    const waiting = await db().select().from(outbox).where(and(eq(outbox.kind, "search-index"), isNull(outbox.sentAt)));
    expect(waiting.length).toBeGreaterThan(0);
    expect(waiting[0]!.attempts).toBeGreaterThan(0);

    await fake.listen(meiliPort);
    await drainSearchCopies();
    const after = await search(larkA.teamId, "zircon");
    expect(after.engine).toBe("meilisearch");
    expect(after.notice).toBeUndefined();
    expect(after.hits.map((h) => [h.sheetNumber, h.revisionLabel])).toEqual([[ids.steppedWave!.number, "B"]]);
  });

  it("rebuilds the Meilisearch index from the sheets with the re-index command's function", async () => {
    await meilisearchEngine()!.removeAll();
    expect((await search(larkA.teamId, "resonance")).hits).toEqual([]);
    const outcome = await reindexSearch(db());
    expect(outcome).toMatchObject({ meilisearch: true });
    expect(outcome.documents).toBeGreaterThanOrEqual(5);
    expect((await search(larkA.teamId, "resonance")).hits.map((h) => h.sheetNumber)).toEqual([ids.outputFilter!.number]);
  });
});

describe("taking a sheet out of search", () => {
  it("removes it from PostgreSQL at once and from Meilisearch through the outbox", async () => {
    const { removeFromSearch } = await import("../../app/.server/search");
    await db().transaction((tx) => removeFromSearch(tx, ids.lowCorner!.id));
    expect((await new PostgresSearchEngine().search(larkA.teamId, "slow corner")).hits).toEqual([]);
    expect((await meilisearchEngine()!.search(larkA.teamId, "slow corner")).hits.map((h) => h.id)).toEqual([ids.lowCorner!.id]);
    await drainSearchCopies();
    expect((await meilisearchEngine()!.search(larkA.teamId, "slow corner")).hits).toEqual([]);
  });
});

async function latestRevisionOf(sheetId: string) {
  const { calcSheet } = await import("../../app/.server/db/schema");
  const [row] = await db().select({ id: calcSheet.latestRevisionId }).from(calcSheet).where(eq(calcSheet.id, sheetId));
  return row?.id ?? null;
}

describe("parameter search", () => {
  it("finds lc-filter blocks with f0 between 1 kHz and 3 kHz, and only verified ones when asked", async () => {
    const hits = await findBlocks(larkA.teamId, { calculator: "lc-filter", ranges: [{ field: "f0", min: 1_000, max: 3_000, of: "results" }] });
    expect(hits.map((h) => h.sheetNumber).sort()).toEqual([ids.outputFilter!.number, ids.groundPower!.number].sort());
    const first = hits.find((h) => h.sheetNumber === ids.outputFilter!.number)!;
    expect(first.values.f0).toBeCloseTo(1591.5, 0);
    expect(first).toMatchObject({ blockId: "lc1", state: "verified", revisionLabel: "A", projectCode: "PUMP-3K" });

    const verified = await findBlocks(larkA.teamId, { calculator: "lc-filter", ranges: [{ field: "f0", min: 1_000, max: 3_000, of: "results" }], verifiedOnly: true });
    expect(verified.map((h) => h.sheetNumber)).toEqual([ids.outputFilter!.number]);
  });

  it("ranges on inputs in SI units", async () => {
    const hits = await findBlocks(larkA.teamId, { calculator: "lc-filter", ranges: [{ field: "fsw", min: 15_000, of: "inputs" }] });
    expect(hits.map((h) => h.sheetNumber).sort()).toEqual([ids.outputFilter!.number, ids.groundPower!.number].sort());
    expect(hits.map((h) => h.values.fsw).sort()).toEqual([16_000, 20_000]);
  });

  it("never returns another team's blocks", async () => {
    const theirs = await findBlocks(other.teamId, { calculator: "lc-filter", ranges: [{ field: "f0", min: 1_000, max: 3_000, of: "results" }] });
    expect(theirs.map((h) => h.sheetId)).toEqual([ids.otherTeam!.id]);
  });

  it("refuses unknown calculators and fields with a message", async () => {
    await expect(findBlocks(larkA.teamId, { calculator: "lc-filter", ranges: [{ field: "banana", min: 1, of: "results" }] })).rejects.toThrow(BlockQueryError);
    await expect(findBlocks(larkA.teamId, { calculator: "no-such", ranges: [] })).rejects.toThrow(/no calculator/);
  });
});
