// Worker-thread tests run the compiled packages/core/dist/search/searchWorker.js: they build the
// core first, and a failed build fails the test, so the workers never run a stale dist/.
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { expect } from "vitest";
import { searchWorkerUrl } from "../../packages/core/src/search/workerPool.js";

const root = fileURLToPath(new URL("../..", import.meta.url));

/** Builds packages/core with `tsc -b` and checks that the search worker script is there. */
export function buildCoreForWorkers(): void {
  const build = spawnSync("npx", ["tsc", "-b", "packages/core"], { cwd: root, encoding: "utf8" });
  expect(build.error, "could not run tsc").toBeUndefined();
  expect(build.status, `tsc -b packages/core failed:\n${build.stdout}${build.stderr}`).toBe(0);
  expect(existsSync(fileURLToPath(searchWorkerUrl()))).toBe(true);
}
