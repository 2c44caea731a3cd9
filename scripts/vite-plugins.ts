/**
 * Vite plugins of ours, shared by vite.config.ts and vitest.config.ts.
 */
import path from "node:path";
import type { Plugin } from "vite";
import { calculators } from "../app/lib/calc/registry";

const CATALOGUE_ID = "virtual:calculator-catalogue";

/**
 * `virtual:calculator-catalogue`: every calculator as plain data (id, title, inputs,
 * outputs, cautions), taken from the registry when the app is built — no compute code, so a
 * component that shows blocks without running them loads no engine
 * (app/components/calc/calculator-catalogue.ts). A new calculator needs nothing beyond its
 * registry entry; the dev server restarts when a file the registry imports changes.
 */
export function calculatorCatalogue(): Plugin {
  return {
    name: "sinewright-calculator-catalogue",
    resolveId: (source) => (source === CATALOGUE_ID ? `\0${CATALOGUE_ID}` : undefined),
    load(id) {
      if (id !== `\0${CATALOGUE_ID}`) return undefined;
      const entries = calculators.map(({ id, title, inputs, outputs, cautions }) => ({ id, title, inputs, outputs, cautions }));
      return `export default ${JSON.stringify(entries)};`;
    },
  };
}

/**
 * Writes build/client/.vite/chunk-modules.json: for each client chunk, the source modules
 * bundled into it and the chunks it imports. The route manifest says which chunks a page
 * loads; this says what is in them, so the bundle test and `npm run bench:bundle` can tell
 * a reading page that ships an engine or a chart library. (.vite is never served.)
 */
export function chunkModules(root: string): Plugin {
  return {
    name: "sinewright-chunk-modules",
    apply: "build",
    generateBundle(_options, bundle) {
      if (this.environment.config.consumer !== "client") return;
      const chunks: Record<string, { imports: string[]; dynamicImports: string[]; modules: string[] }> = {};
      for (const output of Object.values(bundle)) {
        if (output.type !== "chunk") continue;
        chunks[output.fileName] = {
          imports: output.imports,
          dynamicImports: output.dynamicImports,
          // Modules tree-shaking emptied are listed too; leave them out.
          modules: Object.entries(output.modules)
            .filter(([, module]) => module.renderedLength > 0)
            .map(([id]) => (path.isAbsolute(id) ? path.relative(root, id) : id)),
        };
      }
      this.emitFile({ type: "asset", fileName: ".vite/chunk-modules.json", source: JSON.stringify(chunks, null, 1) });
    },
  };
}
