import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";

// Lives in test/ so the repository's top level stays as DEVELOPERS.md describes; `npm test`
// passes --config. The root is the repository, so test paths below are relative to it.
export default defineConfig({
  root: fileURLToPath(new URL("..", import.meta.url)),
  resolve: {
    alias: {
      "@chirpsieve/core": fileURLToPath(new URL("../packages/core/src/index.ts", import.meta.url)),
    },
  },
  test: {
    include: ["test/**/*.test.ts"],
    testTimeout: 120_000,
    hookTimeout: 120_000,
    pool: "forks",
  },
});
