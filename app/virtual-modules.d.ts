// Modules our Vite plugins generate (scripts/vite-plugins.ts).

/** Every calculator as plain data, from the registry at build time; read it through app/components/calc/calculator-catalogue.ts. */
declare module "virtual:calculator-catalogue" {
  import type { Calculator } from "~/lib/calc/types";
  const entries: Pick<Calculator, "id" | "title" | "inputs" | "outputs" | "cautions">[];
  export default entries;
}
