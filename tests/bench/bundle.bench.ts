/**
 * Bundle sizes: for every page route, the gzip size of all the JavaScript a first load of
 * that page fetches (the route manifest, the client entry, each route module from the root
 * down and everything they import statically), then what it may fetch later by dynamic
 * import, and which engine or chart code the first load holds. Prints figures beside the
 * targets; asserts nothing (tests/e2e/bundle.test.ts asserts what reading pages hold).
 *
 * Targets: a sheet reading page ≤ 150 KB of gzipped JavaScript; the editor ≤ 400 KB.
 * Sizes are gzip at the default level (6, what the server's compression middleware sends), in KB of 1,000 bytes.
 *
 * Run: npm run bench:bundle (builds the app first when the sources are newer than the build).
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import { gzipSync } from "node:zlib";
// @ts-expect-error -- a plain ES module script without types
import { ensureBuild, root } from "../../scripts/local.mjs";
import { engineAndChartCode, firstLoadFiles, lazyFiles, modulesIn, pageRoutes, readClientBuild } from "../support/client-build";

const TARGETS_KB: Record<string, number> = {
  sheet: 150,
  "sheet-revision": 150,
  "routes/sheets.$number.edit": 400,
  "routes/documents.$number.edit": 400,
};

ensureBuild();
const build = readClientBuild(root as string);
const gzipSizes = new Map<string, number>();
const gzipKb = (files: readonly string[]) =>
  files.reduce((sum, file) => {
    if (!gzipSizes.has(file)) gzipSizes.set(file, gzipSync(readFileSync(path.join(build.dir, file))).length);
    return sum + gzipSizes.get(file)!;
  }, 0) / 1000;

const rows = pageRoutes(build).map((route) => {
  const first = firstLoadFiles(build, route.id);
  const lazy = lazyFiles(build, first);
  const target = TARGETS_KB[route.id];
  const firstKb = gzipKb(first);
  return {
    route: route.id,
    "first load (KB gzip)": Number(firstKb.toFixed(1)),
    target: target === undefined ? "" : `≤ ${target}`,
    met: target === undefined ? "" : firstKb <= target ? "yes" : "NO",
    "lazy (KB gzip)": Number(gzipKb(lazy).toFixed(1)),
    chunks: first.length,
    "engine or chart code in first load": engineAndChartCode(modulesIn(build, first)).map((c) => c.name).join(", "),
  };
});

console.log(`JavaScript per page route (gzip), from ${path.relative(process.cwd(), build.dir)}:`);
console.table(rows);
