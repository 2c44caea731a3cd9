import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { fileURLToPath } from "node:url";
import { defineConfig } from "vite";
import { calculatorCatalogue, chunkModules } from "./scripts/vite-plugins";

export default defineConfig({
  plugins: [tailwindcss(), reactRouter(), calculatorCatalogue(), chunkModules(fileURLToPath(new URL(".", import.meta.url)))],
  resolve: {
    alias: { "~": fileURLToPath(new URL("./app", import.meta.url)) },
  },
  server: { host: "127.0.0.1" },
});
