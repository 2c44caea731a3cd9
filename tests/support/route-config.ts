import { readFileSync } from "node:fs";
import path from "node:path";
import type { RouteConfigEntry } from "@react-router/dev/routes";
import routes from "../../app/routes";

export interface AppRoute {
  /** The route id: the `id` given in app/routes.ts, else the file without its extension (React Router's rule). */
  id: string;
  file: string;
  /** The full URL pattern, e.g. `/sheets/:number/edit`; null for a layout. */
  pattern: string | null;
  /** Layouts wrap other routes and have no URL of their own. */
  layout: boolean;
  hasLoader: boolean;
  hasAction: boolean;
  /** Pages render a component; resource routes (JSON, redirects) do not. */
  isPage: boolean;
}

function exports(file: string, name: string): boolean {
  const source = readFileSync(path.resolve("app", file), "utf8");
  return new RegExp(`export\\s+(async\\s+)?(function|const)\\s+${name}\\b|export\\s*\\{[^}]*\\b${name}\\b[^}]*\\}`).test(source);
}

function walk(entries: RouteConfigEntry[], parentPath: string, into: AppRoute[]): AppRoute[] {
  for (const entry of entries) {
    const own = entry.index ? "" : (entry.path ?? null);
    const fullPath = own === null ? parentPath : [parentPath, own].filter(Boolean).join("/");
    into.push({
      id: entry.id ?? entry.file.replace(/\.[jt]sx?$/, ""),
      file: entry.file,
      pattern: own === null && !entry.index ? null : `/${fullPath}`,
      layout: own === null && !entry.index,
      hasLoader: exports(entry.file, "loader"),
      hasAction: exports(entry.file, "action"),
      isPage: /export\s+default\b/.test(readFileSync(path.resolve("app", entry.file), "utf8")),
    });
    if (entry.children) walk(entry.children, fullPath, into);
  }
  return into;
}

/** Every route module in app/routes.ts, as the server resolves them. */
export const appRoutes: AppRoute[] = walk(routes, "", []);
