import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { fileURLToPath } from "node:url";
import { defineConfig } from "vite";
import { calculatorCatalogue, chunkModules } from "./scripts/vite-plugins";

export default defineConfig(({ isSsrBuild }) => ({
  // The server build's entry is the Express app (server/app.ts), which imports the framework's build.
  build: { rollupOptions: isSsrBuild ? { input: "./server/app.ts" } : undefined },
  plugins: [tailwindcss(), reactRouter(), calculatorCatalogue(), chunkModules(fileURLToPath(new URL(".", import.meta.url)))],
  resolve: {
    alias: { "~": fileURLToPath(new URL("./app", import.meta.url)) },
  },
  server: { host: "127.0.0.1" },
}));
