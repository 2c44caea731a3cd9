#!/usr/bin/env node
// Development and test stand-in for Meilisearch: an HTTP server on 127.0.0.1 answering
// exactly the endpoints Sinewright's adapter uses through the `meilisearch` SDK —
// index settings, documents (add, delete one, delete all), search (filter, highlight,
// crop, ranking score), tasks and health — on top of minisearch. Never used in
// production. `MEILI_FAKE_PORT=7700 MEILI_FAKE_KEY=… node scripts/fake-meilisearch.mjs`.
//
// Documents are kept in memory for the life of the process; closing the listener and
// listening again keeps them, as a restarted Meilisearch keeps its data on disk.
import http from "node:http";
import path from "node:path";
import { fileURLToPath } from "node:url";
import MiniSearch from "minisearch";

/** minisearch's own word splitter, so highlights mark the same words the search matched. */
const SEPARATOR = /[\n\r\p{Z}\p{P}]+/u;

function meiliError(status, code, message, type = "invalid_request") {
  return { status, body: { message, code, type, link: `https://docs.meilisearch.com/errors#${code}` } };
}

class FakeIndex {
  constructor(uid) {
    this.uid = uid;
    this.primaryKey = "id";
    this.searchable = ["*"];
    this.filterable = [];
    this.sortable = [];
    this.documents = new Map();
    this.rebuild();
  }

  fields() {
    if (!this.searchable.includes("*")) return this.searchable;
    const names = new Set();
    for (const doc of this.documents.values()) for (const [k, v] of Object.entries(doc)) if (typeof v === "string") names.add(k);
    return [...names];
  }

  rebuild() {
    this.engine = new MiniSearch({
      idField: this.primaryKey,
      fields: this.fields(),
      extractField: (doc, field) => (Array.isArray(doc[field]) ? doc[field].join(" ") : doc[field]),
    });
    this.engine.addAll([...this.documents.values()]);
  }

  put(docs) {
    for (const doc of docs) {
      const id = String(doc[this.primaryKey]);
      if (this.documents.has(id)) this.engine.discard(id);
      this.documents.set(id, doc);
      this.engine.add(doc);
    }
  }

  delete(id) {
    if (!this.documents.has(id)) return;
    this.documents.delete(id);
    this.engine.discard(id);
  }
}

/** Parses the filter forms the adapter sends: an array of `attr = "text"` or `attr >= 123` (ANDed). */
function compileFilter(filter, filterable) {
  if (filter === undefined || filter === null) return () => true;
  const clauses = (Array.isArray(filter) ? filter : [filter]).flatMap((f) => String(f).split(/\s+AND\s+/));
  const tests = clauses.map((clause) => {
    const match = /^\s*([A-Za-z_][\w.]*)\s*(=|!=|>=|<=|>|<)\s*(?:"((?:[^"\\]|\\.)*)"|(-?\d+(?:\.\d+)?))\s*$/.exec(clause);
    if (!match) throw meiliError(400, "invalid_search_filter", `Was expecting an operation \`=\`, \`!=\`, \`>=\`, \`>\`, \`<=\`, \`<\` at \`${clause}\`.`);
    const [, attribute, op, text, number] = match;
    if (!filterable.includes(attribute)) {
      throw meiliError(400, "invalid_search_filter", `Attribute \`${attribute}\` is not filterable. Available filterable attributes are: \`${filterable.join(", ")}\`.`);
    }
    const wanted = text !== undefined ? text.replace(/\\(.)/g, "$1") : Number(number);
    const compare = (value) => {
      if (op === "=") return value === wanted || String(value) === String(wanted);
      if (op === "!=") return String(value) !== String(wanted);
      const n = Number(value);
      return op === ">=" ? n >= wanted : op === "<=" ? n <= wanted : op === ">" ? n > wanted : n < wanted;
    };
    return (doc) => {
      const value = doc[attribute];
      return Array.isArray(value) ? (op === "!=" ? value.every(compare) : value.some(compare)) : value !== undefined && value !== null && compare(value);
    };
  });
  return (doc) => tests.every((t) => t(doc));
}

/** How many neighbouring pairs of query words stand side by side in one field (the best field). */
function proximity(doc, fields, queryTerms) {
  let best = 0;
  for (const field of fields) {
    const value = Array.isArray(doc[field]) ? doc[field].join(" ") : doc[field];
    if (typeof value !== "string") continue;
    const words = value.toLowerCase().split(SEPARATOR);
    let pairs = 0;
    for (let i = 0; i + 1 < queryTerms.length; i++) {
      for (let w = 0; w + 1 < words.length; w++) {
        if (words[w] === queryTerms[i] && words[w + 1].startsWith(queryTerms[i + 1])) {
          pairs++;
          break;
        }
      }
    }
    best = Math.max(best, pairs);
  }
  return best;
}

/** Wraps matched words in the tags and, when cropping, keeps `cropLength` words around the first match. */
function format(text, matchedTerms, { pre, post, crop, cropLength, cropMarker }) {
  if (typeof text !== "string") return text;
  const pieces = text.split(new RegExp(`(${SEPARATOR.source})`, "u"));
  const words = [];
  for (let i = 0; i < pieces.length; i++) if (i % 2 === 0 && pieces[i]) words.push(i);
  const isHit = (i) => matchedTerms.has(pieces[i].toLowerCase());
  let from = 0;
  let to = pieces.length;
  if (crop && words.length > cropLength) {
    const first = words.findIndex(isHit);
    const start = Math.max(0, Math.min(first < 0 ? 0 : first - Math.floor(cropLength / 2), words.length - cropLength));
    from = words[start];
    to = words[start + cropLength - 1] + 1;
  }
  let out = from > 0 ? cropMarker : "";
  for (let i = from; i < to; i++) out += i % 2 === 0 && pieces[i] && isHit(i) ? `${pre}${pieces[i]}${post}` : pieces[i];
  if (to < pieces.length) out += cropMarker;
  return out;
}

export function createFakeMeilisearch({ apiKey } = {}) {
  const indexes = new Map();
  const tasks = [];

  const enqueue = (indexUid, type, work) => {
    const uid = tasks.length;
    const enqueuedAt = new Date().toISOString();
    let status = "succeeded";
    let error = null;
    try {
      work();
    } catch (e) {
      status = "failed";
      error = e?.body ?? { message: String(e), code: "internal", type: "internal", link: "" };
    }
    const finishedAt = new Date().toISOString();
    tasks.push({ uid, batchUid: uid, indexUid, status, type, canceledBy: null, details: {}, error, duration: "PT0S", enqueuedAt, startedAt: enqueuedAt, finishedAt });
    return { status: 202, body: { taskUid: uid, indexUid, status: "enqueued", type, enqueuedAt } };
  };

  const indexFor = (uid) => {
    let index = indexes.get(uid);
    if (!index) indexes.set(uid, (index = new FakeIndex(uid)));
    return index;
  };

  const existing = (uid) => {
    const index = indexes.get(uid);
    if (!index) throw meiliError(404, "index_not_found", `Index \`${uid}\` not found.`);
    return index;
  };

  function search(index, body) {
    const q = typeof body.q === "string" ? body.q.trim() : "";
    const accept = compileFilter(body.filter, index.filterable);
    const limit = body.limit ?? 20;
    const offset = body.offset ?? 0;
    let ranked;
    if (q) {
      const results = index.engine.search(q, {
        combineWith: body.matchingStrategy === "last" ? "OR" : "AND",
        prefix: (term, i, terms) => i === terms.length - 1,
        // Meilisearch ranks by attribute order: earlier searchable attributes weigh more.
        boost: Object.fromEntries(index.fields().map((f, i, all) => [f, all.length - i])),
        filter: (result) => accept(index.documents.get(String(result.id))),
      });
      const best = results[0]?.score ?? 1;
      const queryTerms = q.toLowerCase().split(SEPARATOR).filter(Boolean);
      ranked = results.map((r) => {
        const doc = index.documents.get(String(r.id));
        return { doc, score: r.score / best, terms: new Set(r.terms), proximity: proximity(doc, index.fields(), queryTerms) };
      });
      // Meilisearch's proximity rule comes before attribute and relevance: query words side by side win.
      ranked.sort((a, b) => b.proximity - a.proximity || b.score - a.score);
    } else {
      ranked = [...index.documents.values()].filter(accept).map((doc) => ({ doc, score: 1, terms: new Set() }));
      for (const rule of [...(body.sort ?? [])].reverse()) {
        const [attribute, direction] = rule.split(":");
        if (!index.sortable.includes(attribute)) throw meiliError(400, "invalid_search_sort", `Attribute \`${attribute}\` is not sortable.`);
        ranked.sort((a, b) => (direction === "desc" ? -1 : 1) * (a.doc[attribute] > b.doc[attribute] ? 1 : a.doc[attribute] < b.doc[attribute] ? -1 : 0));
      }
    }
    const retrieve = body.attributesToRetrieve ?? ["*"];
    const highlight = new Set(body.attributesToHighlight ?? []);
    const cropped = new Set(body.attributesToCrop ?? []);
    const options = {
      pre: body.highlightPreTag ?? "<em>",
      post: body.highlightPostTag ?? "</em>",
      cropLength: body.cropLength ?? 10,
      cropMarker: body.cropMarker ?? "…",
    };
    const hits = ranked.slice(offset, offset + limit).map(({ doc, score, terms }) => {
      const hit = retrieve.includes("*") ? { ...doc } : Object.fromEntries(retrieve.filter((k) => k in doc).map((k) => [k, doc[k]]));
      if (highlight.size || cropped.size) {
        hit._formatted = { ...hit };
        for (const attribute of new Set([...highlight, ...cropped])) {
          hit._formatted[attribute] = format(doc[attribute], highlight.has(attribute) ? terms : new Set(), { ...options, crop: cropped.has(attribute) });
        }
      }
      if (body.showRankingScore) hit._rankingScore = score;
      return hit;
    });
    return { hits, query: q, processingTimeMs: 0, limit, offset, estimatedTotalHits: ranked.length };
  }

  function route(method, pathname, body) {
    const parts = pathname.split("/").filter(Boolean).map(decodeURIComponent);
    if (method === "GET" && parts[0] === "health") return { status: 200, body: { status: "available" } };
    if (parts[0] === "tasks" && parts.length === 2 && method === "GET") {
      const task = tasks[Number(parts[1])];
      return task ? { status: 200, body: task } : meiliError(404, "task_not_found", `Task \`${parts[1]}\` not found.`);
    }
    if (parts[0] !== "indexes") return meiliError(404, "not_found", `No route for ${method} ${pathname}.`);
    if (parts.length === 1 && method === "POST") {
      return enqueue(body.uid, "indexCreation", () => {
        const index = indexFor(body.uid);
        if (body.primaryKey) index.primaryKey = body.primaryKey;
      });
    }
    const uid = parts[1];
    if (parts.length === 2 && method === "GET") {
      const index = existing(uid);
      return { status: 200, body: { uid, primaryKey: index.primaryKey, createdAt: null, updatedAt: null } };
    }
    if (parts[2] === "settings" && parts.length === 3 && method === "PATCH") {
      return enqueue(uid, "settingsUpdate", () => {
        const index = indexFor(uid);
        if (body.searchableAttributes) index.searchable = body.searchableAttributes;
        if (body.filterableAttributes) index.filterable = body.filterableAttributes;
        if (body.sortableAttributes) index.sortable = body.sortableAttributes;
        index.rebuild();
      });
    }
    if (parts[2] === "documents") {
      if (parts.length === 3 && (method === "POST" || method === "PUT")) {
        return enqueue(uid, "documentAdditionOrUpdate", () => {
          const index = indexFor(uid);
          if (!Array.isArray(body)) throw meiliError(400, "malformed_payload", "Documents must be a JSON array.");
          index.put(body);
        });
      }
      if (parts.length === 3 && method === "DELETE") return enqueue(uid, "documentDeletion", () => existing(uid).documents.clear() || existing(uid).rebuild());
      if (parts.length === 4 && method === "DELETE") return enqueue(uid, "documentDeletion", () => existing(uid).delete(parts[3]));
    }
    if (parts[2] === "search" && parts.length === 3 && method === "POST") return { status: 200, body: search(existing(uid), body ?? {}) };
    return meiliError(404, "not_found", `No route for ${method} ${pathname}.`);
  }

  const server = http.createServer((req, res) => {
    const chunks = [];
    req.on("data", (c) => chunks.push(c));
    req.on("end", () => {
      let answer;
      try {
        if (apiKey && req.url !== "/health") {
          const given = /^Bearer (.+)$/.exec(req.headers.authorization ?? "")?.[1];
          if (!given) throw meiliError(401, "missing_authorization_header", "The Authorization header is missing. It must use the bearer authorization method.", "auth");
          if (given !== apiKey) throw meiliError(403, "invalid_api_key", "The provided API key is invalid.", "auth");
        }
        const text = Buffer.concat(chunks).toString("utf8");
        const url = new URL(req.url ?? "/", "http://fake");
        answer = route(req.method ?? "GET", url.pathname, text ? JSON.parse(text) : undefined);
      } catch (error) {
        answer = error?.body ? error : meiliError(400, "bad_request", String(error?.message ?? error));
      }
      res.writeHead(answer.status, { "content-type": "application/json" });
      res.end(JSON.stringify(answer.body));
    });
  });

  return {
    indexes,
    /** Starts answering on 127.0.0.1; resolves with the port. */
    listen(port = 0) {
      return new Promise((resolve, reject) => {
        server.once("error", reject);
        server.listen(port, "127.0.0.1", () => {
          server.off("error", reject);
          resolve(server.address().port);
        });
      });
    },
    /** Stops answering (connections refused) but keeps the documents. */
    close() {
      return new Promise((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
    },
  };
}

if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) {
  const fake = createFakeMeilisearch({ apiKey: process.env.MEILI_FAKE_KEY || undefined });
  const port = await fake.listen(Number(process.env.MEILI_FAKE_PORT ?? 7700));
  console.log(`[fake-meilisearch] listening on http://127.0.0.1:${port}`);
  for (const signal of ["SIGINT", "SIGTERM"]) process.on(signal, () => fake.close().then(() => process.exit(0)));
}
