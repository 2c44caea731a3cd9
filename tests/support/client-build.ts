/**
 * What the browser loads for each page, read from the built app: the route manifest React
 * Router writes into build/client/assets (which chunks a route's first load fetches) and
 * build/client/.vite/chunk-modules.json (written by vite.config.ts: which source modules each
 * chunk holds, and what it imports lazily). Used by the bundle test and `npm run bench:bundle`.
 */
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";

interface ManifestRoute {
  id: string;
  parentId?: string;
  path?: string;
  index?: boolean;
  module: string;
  imports?: string[];
  hasDefaultExport?: boolean;
}

interface RouteManifest {
  url: string;
  entry: { module: string; imports: string[] };
  routes: Record<string, ManifestRoute>;
}

interface ChunkInfo {
  imports: string[];
  dynamicImports: string[];
  modules: string[];
}

export interface ClientBuild {
  /** build/client */
  dir: string;
  manifest: RouteManifest;
  /** By file name relative to build/client, e.g. "assets/root-abc.js". */
  chunks: Record<string, ChunkInfo>;
}

/** Packages and modules a page that only reads must never load: chart libraries, the units engine, the MDX pipeline, KaTeX's JS and the calculators' compute code. */
export const ENGINE_AND_CHART_CODE: readonly { name: string; pattern: RegExp }[] = [
  { name: "recharts", pattern: /node_modules\/(recharts|d3-[a-z-]+|victory-vendor)\// },
  { name: "mathjs", pattern: /node_modules\/mathjs\// },
  { name: "@mdx-js", pattern: /node_modules\/@mdx-js\// },
  { name: "unified/remark/rehype", pattern: /node_modules\/(unified|remark-[a-z-]+|rehype-[a-z-]+|micromark[a-z-]*|mdast-util-[a-z-]+)\// },
  { name: "katex", pattern: /node_modules\/katex\// },
  { name: "calculator compute code", pattern: /^app\/lib\/calc\/(calculators\/|registry\.ts|units\.ts|inputs\.ts|spectrum\.ts|bessel\.ts|safe-expression\.ts|evaluate-sheet\.ts)/ },
];

export function readClientBuild(root: string): ClientBuild {
  const dir = path.join(root, "build", "client");
  const assets = path.join(dir, "assets");
  const manifestFile = readdirSync(assets).find((f) => /^manifest-[\w-]+\.js$/.test(f));
  if (!manifestFile) throw new Error(`no route manifest in ${assets}: build the app first (npm run build)`);
  // The file is `window.__reactRouterManifest={…};` around JSON.
  const text = readFileSync(path.join(assets, manifestFile), "utf8");
  const manifest = JSON.parse(text.slice(text.indexOf("{"), text.lastIndexOf("}") + 1)) as RouteManifest;
  const chunks = JSON.parse(readFileSync(path.join(dir, ".vite", "chunk-modules.json"), "utf8")) as Record<string, ChunkInfo>;
  return { dir, manifest, chunks };
}

/** Page routes: the ones with a component (resource routes load no JS). */
export function pageRoutes(build: ClientBuild): ManifestRoute[] {
  return Object.values(build.manifest.routes).filter((r) => r.hasDefaultExport);
}

const fileOf = (url: string) => url.replace(/^\//, "");

/** Every chunk a chunk imports statically, itself included. */
function staticClosure(build: ClientBuild, files: Iterable<string>): Set<string> {
  const seen = new Set<string>();
  const visit = (file: string) => {
    if (seen.has(file)) return;
    seen.add(file);
    for (const next of build.chunks[file]?.imports ?? []) visit(next);
  };
  for (const file of files) visit(file);
  return seen;
}

/** The JS files a first load of the route fetches: the route manifest, the client entry, and each route module from the root down, with their static imports. */
export function firstLoadFiles(build: ClientBuild, routeId: string): string[] {
  const roots = [fileOf(build.manifest.url), fileOf(build.manifest.entry.module), ...build.manifest.entry.imports.map(fileOf)];
  for (let route = build.manifest.routes[routeId]; route; route = route.parentId ? build.manifest.routes[route.parentId] : undefined) {
    roots.push(fileOf(route.module), ...(route.imports ?? []).map(fileOf));
  }
  return [...staticClosure(build, roots)].sort();
}

/** The JS files those can load later by dynamic import (not fetched until the code asks for them). */
export function lazyFiles(build: ClientBuild, firstLoad: readonly string[]): string[] {
  const loaded = new Set(firstLoad);
  const found = new Set<string>();
  const queue = firstLoad.flatMap((f) => build.chunks[f]?.dynamicImports ?? []);
  while (queue.length > 0) {
    const file = queue.pop()!;
    if (loaded.has(file) || found.has(file)) continue;
    found.add(file);
    for (const next of staticClosure(build, [file])) if (!loaded.has(next)) found.add(next);
    for (const next of staticClosure(build, [file])) queue.push(...(build.chunks[next]?.dynamicImports ?? []));
  }
  return [...found].sort();
}

/** The source modules bundled into these files (paths relative to the repository). */
export function modulesIn(build: ClientBuild, files: readonly string[]): string[] {
  return files.flatMap((f) => build.chunks[f]?.modules ?? []);
}

/** Which of the forbidden kinds of code these modules hold, each with one example module. */
export function engineAndChartCode(modules: readonly string[]): { name: string; example: string }[] {
  return ENGINE_AND_CHART_CODE.flatMap(({ name, pattern }) => {
    const example = modules.find((m) => pattern.test(m));
    return example ? [{ name, example }] : [];
  });
}
